package solver

import (
	"testing"
	"time"
)

func TestWeightedSpans(t *testing.T) {
	for _, tc := range []struct {
		name  string
		w     []float64
		parts int
		want  [][2]int
	}{
		{"uniform", []float64{1, 1, 1, 1}, 2, [][2]int{{0, 2}, {2, 4}}},
		{"one part", []float64{3, 1, 2}, 1, [][2]int{{0, 3}}},
		{"heavy bottom", []float64{2, 2, 2, 1, 1, 1, 1, 1, 1}, 2, [][2]int{{0, 3}, {3, 9}}},
		{"as many parts as items", []float64{5, 1, 1}, 3, [][2]int{{0, 1}, {1, 2}, {2, 3}}},
		{"three parts", []float64{1, 1, 1, 1, 1, 1}, 3, [][2]int{{0, 2}, {2, 4}, {4, 6}}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got := weightedSpans(tc.w, tc.parts)
			if len(got) != len(tc.want) {
				t.Fatalf("got %v, want %v", got, tc.want)
			}
			for i := range got {
				if got[i] != tc.want[i] {
					t.Fatalf("got %v, want %v", got, tc.want)
				}
			}
		})
	}
}

// TestWeightedSpansCover checks on many weightings that the blocks tile the
// range in order and that no block's weight exceeds the even share by more
// than the heaviest item.
func TestWeightedSpansCover(t *testing.T) {
	for n := 1; n < 40; n++ {
		for parts := 1; parts <= min(n, 4); parts++ {
			w := make([]float64, n)
			total, heaviest := 0.0, 0.0
			for k := range w {
				w[k] = 1 + float64((k*7)%5)
				total += w[k]
				heaviest = max(heaviest, w[k])
			}
			sp := weightedSpans(w, parts)
			lo := 0
			for i, b := range sp {
				if b[0] != lo || b[1] <= b[0] {
					t.Fatalf("n=%d parts=%d: block %d is %v after %d", n, parts, i, b, lo)
				}
				sum := 0.0
				for _, v := range w[b[0]:b[1]] {
					sum += v
				}
				if sum > total/float64(parts)+heaviest {
					t.Errorf("n=%d parts=%d: block %d weighs %g, share %g", n, parts, i, sum, total/float64(parts))
				}
				lo = b[1]
			}
			if lo != n {
				t.Fatalf("n=%d parts=%d: blocks end at %d", n, parts, lo)
			}
		}
	}
}

// TestCrewPhases runs many phases whose parts take from nothing to half a
// millisecond, so that either side of the barrier waits on the other, and
// checks that every part runs exactly once per phase and that run returns
// only after all parts of its phase have finished.
func TestCrewPhases(t *testing.T) {
	for _, n := range []int{1, 2, 3} {
		p := newCrew(n)
		counts := make([]int, n)
		phase := 0
		task := func(part int) {
			// Part 0 is slow in some phases, a worker in others.
			if (phase+part)%7 == 0 {
				time.Sleep(500 * time.Microsecond)
			}
			counts[part]++
		}
		for phase = range 200 {
			p.run(task)
			for part, c := range counts {
				if c != phase+1 {
					t.Fatalf("n=%d phase %d: part %d ran %d times", n, phase, part, c)
				}
			}
		}
		p.close()
	}
}
