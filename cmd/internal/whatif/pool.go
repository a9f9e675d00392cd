package whatif

import (
	"context"
	"runtime"
	"sync"
)

// Progress is told how many items of a sweep have finished, of how many.
// Calls never overlap.
type Progress func(done, total int)

// forEach calls work(w, i) for every i in 0..n−1 on a pool of workers; w
// (0 ≤ w < workers) names the worker so that work can keep per-worker state
// such as a compiled circuit. Once ctx is done no new item starts. It
// returns which items finished.
func forEach(ctx context.Context, workers, n int, progress Progress, work func(w, i int)) []bool {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = max(1, min(workers, n))
	finished := make([]bool, n)
	next := make(chan int)
	var mu sync.Mutex
	count := 0
	var wg sync.WaitGroup
	for w := range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				work(w, i)
				mu.Lock()
				finished[i] = true
				count++
				if progress != nil {
					progress(count, n)
				}
				mu.Unlock()
			}
		}()
	}
feed:
	for i := range n {
		if ctx.Err() != nil {
			break
		}
		select {
		case next <- i:
		case <-ctx.Done():
			break feed
		}
	}
	close(next)
	wg.Wait()
	return finished
}

// workerCount is the pool size for opt.Workers.
func workerCount(n int) int {
	if n <= 0 {
		return runtime.GOMAXPROCS(0)
	}
	return n
}
