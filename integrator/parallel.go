package integrator

import (
	"runtime"
	"sync"
)

// workPool splits loops over independent bodies across goroutines. Each
// body's result is computed by the same code in the same order whatever
// the split, so results are bit-identical for any worker count.
type workPool struct {
	// workers caps the goroutines; 0 means GOMAXPROCS.
	workers int
}

// count returns how many workers a loop of n items gets when each should
// have at least chunk items.
func (p *workPool) count(n, chunk int) int {
	w := p.workers
	if w <= 0 {
		w = runtime.GOMAXPROCS(0)
	}
	if m := n / chunk; m < w {
		w = m
	}
	if w < 1 {
		w = 1
	}
	return w
}

// run calls fn on k contiguous ranges covering [0, n) in parallel, k from
// count. Callers check count first and run serial loops inline, so the
// closure (and its allocation) only exists on the parallel path.
func (p *workPool) run(n, chunk int, fn func(lo, hi int)) {
	k := p.count(n, chunk)
	if k <= 1 {
		fn(0, n)
		return
	}
	var wg sync.WaitGroup
	wg.Add(k - 1)
	for i := 1; i < k; i++ {
		go func(lo, hi int) {
			defer wg.Done()
			fn(lo, hi)
		}(i*n/k, (i+1)*n/k)
	}
	fn(0, n/k)
	wg.Wait()
}
