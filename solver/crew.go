package solver

// crew is the solver's persistent workers: it runs one task on n goroutines
// and waits for all of them, a barrier-separated phase of the step. Starting
// goroutines per phase costs as much as the work itself on small grids, so
// the goroutines live as long as the solver. Tasks must be bound once (method
// values stored in the solver) so that run allocates nothing.
type crew struct {
	n     int
	task  func(part int)
	start []chan struct{}
	done  chan struct{}
}

func newCrew(n int) *crew {
	if n < 1 {
		n = 1
	}
	c := &crew{n: n, done: make(chan struct{}, n)}
	c.start = make([]chan struct{}, n)
	for i := 1; i < n; i++ {
		c.start[i] = make(chan struct{}, 1)
		go c.work(i)
	}
	return c
}

func (c *crew) work(part int) {
	for range c.start[part] {
		c.task(part)
		c.done <- struct{}{}
	}
}

// run calls task(part) for part = 0..n−1 concurrently and returns when all
// have finished. Part 0 runs on the calling goroutine.
func (c *crew) run(task func(part int)) {
	if c.n == 1 {
		task(0)
		return
	}
	c.task = task
	for i := 1; i < c.n; i++ {
		c.start[i] <- struct{}{}
	}
	task(0)
	for i := 1; i < c.n; i++ {
		<-c.done
	}
}

func (c *crew) close() {
	for i := 1; i < c.n; i++ {
		close(c.start[i])
	}
	c.n = 1
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
