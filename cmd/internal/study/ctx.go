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
	runs, ok := solvePool(ctx, c, jobs, opt, done)
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

// solvePool solves jobs across a pool of workers, each compiling a variant
// once and reusing its Bench while the jobs it draws stay in that variant
// (plan order makes that the rule). Once ctx is done no worker starts
// another job; ok[k] says whether jobs[k] ran. done, when not nil, is
// called after each finished run, never two calls at once.
func solvePool(ctx context.Context, c *netlist.Circuit, jobs []Job, opt *Options, done func(finished int)) (runs []Run, ok []bool) {
	if opt == nil {
		opt = &Options{}
	}
	workers := opt.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = min(workers, len(jobs))
	runs = make([]Run, len(jobs))
	ok = make([]bool, len(jobs))
	next := make(chan int)
	var mu sync.Mutex
	finished := 0
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			var bench *Bench
			benchVariant := -1
			for k := range next {
				j := jobs[k]
				runs[k] = func() (run Run) {
					// A panic is a bug, but the user should get a
					// sentence and the other runs, not a stack trace.
					defer func() {
						if p := recover(); p != nil {
							bench, benchVariant = nil, -1
							run = failedRun(c, j, fmt.Errorf("internal error (please report it with the deck): %v", p))
						}
					}()
					if bench == nil || benchVariant != j.VariantIndex {
						b, err := NewBench(c, j.Variant)
						if err != nil {
							bench, benchVariant = nil, -1
							return failedRun(c, j, err)
						}
						bench, benchVariant = b, j.VariantIndex
					}
					r, err := bench.Solve(j.Level, j.Polarity, opt)
					if err != nil {
						return failedRun(c, j, err)
					}
					r.Job = j
					return *r
				}()
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
	return runs, ok
}
