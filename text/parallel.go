package text

import (
	"runtime"
	"sync"
	"sync/atomic"
)

// parallelFor calls f(worker, i) for every i in [0, n) on up to GOMAXPROCS goroutines;
// worker is in [0, workers()) and identifies the goroutine, so f can keep per-worker buffers.
// Results must be written to per-i slots: the order of calls is not fixed, and callers merge
// in index order so that output never depends on GOMAXPROCS.
func parallelFor(n int, f func(worker, i int)) {
	w := workers()
	if w > n {
		w = n
	}
	if w <= 1 {
		for i := 0; i < n; i++ {
			f(0, i)
		}
		return
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	for k := 0; k < w; k++ {
		wg.Add(1)
		go func(k int) {
			defer wg.Done()
			for {
				i := int(next.Add(1) - 1)
				if i >= n {
					return
				}
				f(k, i)
			}
		}(k)
	}
	wg.Wait()
}

func workers() int { return runtime.GOMAXPROCS(0) }

// onOwnLines holds one worker's state on cache lines of its own. Workers update their state
// on every token; states side by side in one array share a cache line at each boundary,
// and each write to it then waits for the line to come back from the other core (false
// sharing). The padding is a cache line (64 bytes on amd64 and arm64) on each side.
type onOwnLines[T any] struct {
	_ [64]byte
	v T
	_ [64]byte
}
