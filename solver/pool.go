package solver

// pool runs one task on n persistent goroutines and waits for all of them:
// a barrier-separated phase of the step. Starting goroutines per phase costs
// as much as the work itself on small grids, so the goroutines live as long
// as the solver. Tasks must be bound once (method values stored in the
// solver) so that run allocates nothing.
type pool struct {
	n     int
	task  func(part int)
	start []chan struct{}
	done  chan struct{}
}

func newPool(n int) *pool {
	if n < 1 {
		n = 1
	}
	p := &pool{n: n, done: make(chan struct{}, n)}
	p.start = make([]chan struct{}, n)
	for i := 1; i < n; i++ {
		p.start[i] = make(chan struct{}, 1)
		go p.work(i)
	}
	return p
}

func (p *pool) work(part int) {
	for range p.start[part] {
		p.task(part)
		p.done <- struct{}{}
	}
}

// run calls task(part) for part = 0..n−1 concurrently and returns when all
// have finished. Part 0 runs on the calling goroutine.
func (p *pool) run(task func(part int)) {
	if p.n == 1 {
		task(0)
		return
	}
	p.task = task
	for i := 1; i < p.n; i++ {
		p.start[i] <- struct{}{}
	}
	task(0)
	for i := 1; i < p.n; i++ {
		<-p.done
	}
}

func (p *pool) close() {
	for i := 1; i < p.n; i++ {
		close(p.start[i])
	}
	p.n = 1
}

// span splits [0, n) into parts contiguous blocks and returns block i.
func span(n, parts, i int) (lo, hi int) {
	q, r := n/parts, n%parts
	lo = i*q + min(i, r)
	hi = lo + q
	if i < r {
		hi++
	}
	return lo, hi
}

// weightedSpans splits [0, len(w)) into parts contiguous blocks of about
// equal total weight (w[k] ≥ 0 is the cost of item k) and returns their
// bounds. Every block but a trailing one holds at least one item when
// there are as many items as parts.
func weightedSpans(w []float64, parts int) [][2]int {
	total := 0.0
	for _, v := range w {
		total += v
	}
	out := make([][2]int, parts)
	lo, cum := 0, 0.0
	for i := range out {
		hi := lo
		if i == parts-1 {
			hi = len(w)
		} else {
			target := total * float64(i+1) / float64(parts)
			for hi < len(w)-(parts-1-i) && (hi == lo || cum+w[hi]/2 <= target) {
				cum += w[hi]
				hi++
			}
		}
		out[i] = [2]int{lo, hi}
		lo = hi
	}
	return out
}
