package study

import (
	"context"
	"runtime"
	"sync"
	"zapnet/netlist"
)

// ForEach calls work(w, i) for every i in 0..n−1 on a pool of
// PoolSize(workers, n) workers; w names the worker so that work can keep
// per-worker state such as a compiled circuit.
// Once ctx is done no new item starts. progress, when not nil, is told after
// each finished item how many have finished, of n; calls never overlap. It
// returns which items finished. The solves of a study and of the what-if
// sweeps share this one pool.
func ForEach(ctx context.Context, workers, n int, progress func(done, total int), work func(w, i int)) []bool {
	finished := make([]bool, n)
	Each(ctx, workers, n, progress, func(w, i int) {
		work(w, i)
		finished[i] = true // each item is one worker's: no lock needed
	})
	return finished
}

// Each is ForEach for sweeps too long to keep a mark per item (a spread
// of millions of circuits): it returns only how many items finished. When
// ctx is done, those are the items that started.
func Each(ctx context.Context, workers, n int, progress func(done, total int), work func(w, i int)) int {
	workers = PoolSize(workers, n)
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
	return count
}

// PoolSize is how many workers ForEach and Each run for n items when asked
// for workers (≤ 0: every core): at least one, at most n. Per-worker state
// (Benches) needs this many slots.
func PoolSize(workers, n int) int {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	return max(1, min(workers, n))
}

// Benches keeps, for each worker of a pool, the variant it compiled last:
// a worker that draws job after job of one variant compiles it once. Each
// worker uses only its own slot, so no lock is needed.
type Benches struct {
	c   *netlist.Circuit
	b   []*Bench
	idx []int
}

// NewBenches makes the slots of workers workers (ForEach's w) for circuit c.
func NewBenches(c *netlist.Circuit, workers int) *Benches {
	return &Benches{c: c, b: make([]*Bench, workers), idx: make([]int, workers)}
}

// Get returns worker w's bench of variant number index, v, compiling it
// when the worker used another variant last.
func (bs *Benches) Get(w, index int, v netlist.Variant) (*Bench, error) {
	if bs.b[w] == nil || bs.idx[w] != index {
		b, err := NewBench(bs.c, v)
		if err != nil {
			bs.b[w] = nil
			return nil, err
		}
		bs.b[w], bs.idx[w] = b, index
	}
	return bs.b[w], nil
}

// Drop forgets worker w's bench (after a panic left it in doubt).
func (bs *Benches) Drop(w int) { bs.b[w] = nil }
