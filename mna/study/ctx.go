package study

import (
	"context"
	"errors"
	"fmt"

	"zapnet/netlist"
)

// Execute solves the given jobs (Jobs lists a plan's; a shard of a sweep
// takes a subset) on a pool of workers, each compiling a variant once and
// reusing its Bench for the following jobs of the same variant. A run whose
// solve fails has Verdict Error and its Err set, and the other runs are
// still complete.
//
// Once ctx is done no worker starts another job, and the runs that finished
// come back in the order of jobs (the unfinished ones left out). done, when
// not nil, is called after each finished run with how many have finished;
// calls never overlap, so a progress display needs no lock of its own.
//
// The error joins the failed solves, each naming its run, and ctx.Err() when
// the sweep was stopped before its end. A stopped sweep is thus still usable:
// the caller reports the runs it got and says that the rest is missing.
func Execute(ctx context.Context, c *netlist.Circuit, jobs []Job, opt *Options, done func(finished int)) ([]Run, error) {
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

// solvePool solves jobs on a pool of workers (ForEach), each compiling a
// variant once and reusing its Bench while the jobs it draws stay in that
// variant (plan order makes that the rule). Once ctx is done no worker
// starts another job; ok[k] says whether jobs[k] ran. done, when not nil,
// is called after each finished run, never two calls at once.
func solvePool(ctx context.Context, c *netlist.Circuit, jobs []Job, opt *Options, done func(finished int)) (runs []Run, ok []bool) {
	opt = opt.WithContext(ctx)
	benches := NewBenches(c, PoolSize(opt.Workers, len(jobs)))
	runs = make([]Run, len(jobs))
	var progress func(done, total int)
	if done != nil {
		progress = func(finished, _ int) { done(finished) }
	}
	cut := make([]bool, len(jobs)) // runs the context stopped midway
	ok = ForEach(ctx, opt.Workers, len(jobs), progress, func(w, k int) {
		j := jobs[k]
		runs[k] = func() (run Run) {
			// A panic is a bug, but the user should get a sentence and
			// the other runs, not a stack trace.
			defer func() {
				if p := recover(); p != nil {
					benches.Drop(w)
					run = failedRun(c, j, fmt.Errorf("internal error (please report it with the deck): %v", p))
				}
			}()
			b, err := benches.Get(w, j.VariantIndex, j.Variant)
			if err != nil {
				return failedRun(c, j, err)
			}
			r, err := b.Solve(j.Level, j.Polarity, opt)
			if Interrupted(err) {
				cut[k] = true
			}
			if err != nil {
				return failedRun(c, j, err)
			}
			r.Index, r.VariantIndex = j.Index, j.VariantIndex
			return *r
		}()
	})
	for k := range ok {
		ok[k] = ok[k] && !cut[k]
	}
	return runs, ok
}
