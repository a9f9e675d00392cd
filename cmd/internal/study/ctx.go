package study

import (
	"context"
	"errors"
	"fmt"
	"runtime"
	"sync"

	"zapnet/netlist"
)

// ExecuteJobsContext is ExecuteJobs that can be stopped: once ctx is done no
// worker starts another job, and the runs that finished come back in the
// order of jobs (the unfinished ones left out). done, when not nil, is called
// after each finished run with how many have finished; calls never overlap,
// so a progress display needs no lock of its own.
//
// The error joins the failed solves, as ExecuteJobs does, and ctx.Err() when
// the sweep was stopped before its end. A stopped sweep is thus still usable:
// the caller reports the runs it got and says that the rest is missing.
func ExecuteJobsContext(ctx context.Context, c *netlist.Circuit, jobs []Job, opt *Options, done func(finished int)) ([]Run, error) {
	if opt == nil {
		opt = &Options{}
	}
	workers := opt.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = max(1, min(workers, len(jobs)))
	runs := make([]Run, len(jobs))
	ok := make([]bool, len(jobs))
	next := make(chan int)
	var mu sync.Mutex
	finished := 0
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			// One compiled variant per worker, reused while the jobs it
			// draws stay in that variant (plan order makes that the rule).
			var bench *Bench
			benchVariant := -1
			for k := range next {
				j := jobs[k]
				if bench == nil || benchVariant != j.VariantIndex {
					b, err := NewBench(c, j.Variant)
					if err != nil {
						runs[k] = failedRun(c, j, err)
						bench, benchVariant = nil, -1
					} else {
						bench, benchVariant = b, j.VariantIndex
					}
				}
				if bench != nil {
					r, err := bench.Solve(j.Level, j.Polarity, opt)
					if err != nil {
						runs[k] = failedRun(c, j, err)
					} else {
						r.Job = j
						runs[k] = *r
					}
				}
				mu.Lock()
				ok[k] = true
				finished++
				if done != nil {
					done(finished)
				}
				mu.Unlock()
			}
		}()
	}
feed:
	for k := range jobs {
		select {
		case next <- k:
		case <-ctx.Done():
			break feed
		}
	}
	close(next)
	wg.Wait()
	var out []Run
	var errs []error
	for k := range runs {
		if !ok[k] {
			continue
		}
		out = append(out, runs[k])
		if runs[k].Err != nil {
			errs = append(errs, fmt.Errorf("%s: %w", runs[k].Label(), runs[k].Err))
		}
	}
	if len(out) < len(jobs) {
		errs = append(errs, ctx.Err())
	}
	return out, errors.Join(errs...)
}
