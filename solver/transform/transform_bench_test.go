package transform

import (
	"fmt"
	"math/rand/v2"
	"sync"
	"testing"
)

// benchShapes are the solver's field sizes (N, rows).
var benchShapes = []struct{ n, rows int }{
	{256, 65},
	{512, 129},
	{1024, 257},
}

// BenchmarkForwardInverse times Forward then Inverse of a whole field on one
// goroutine and reports the time per row pair (one forward and one inverse
// transform of one row) as ns/row.
func BenchmarkForwardInverse(b *testing.B) {
	for _, be := range backends() {
		for _, s := range benchShapes {
			b.Run(fmt.Sprintf("%v/n=%d/rows=%d", be, s.n, s.rows), func(b *testing.B) {
				p := newPlan(b, be, s.n, s.rows, 1)
				fillRandom(rand.New(rand.NewPCG(1, 1)), p.Real())
				b.ResetTimer()
				for range b.N {
					p.Forward()
					p.Inverse()
				}
				b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(s.rows), "ns/row")
			})
		}
	}
}

// BenchmarkPartsConcurrent is BenchmarkForwardInverse with the rows split into
// 4 parts, each transformed by its own goroutine, as the solver does.
func BenchmarkPartsConcurrent(b *testing.B) {
	const parts = 4
	for _, be := range backends() {
		for _, s := range benchShapes {
			b.Run(fmt.Sprintf("%v/n=%d/rows=%d", be, s.n, s.rows), func(b *testing.B) {
				p := newPlan(b, be, s.n, s.rows, parts)
				fillRandom(rand.New(rand.NewPCG(1, 1)), p.Real())
				b.ResetTimer()
				for range b.N {
					var wg sync.WaitGroup
					for i := range parts {
						wg.Go(func() {
							p.ForwardPart(i)
							p.InversePart(i)
						})
					}
					wg.Wait()
				}
				b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(s.rows), "ns/row")
			})
		}
	}
}
