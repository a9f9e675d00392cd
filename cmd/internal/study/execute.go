package study

import (
	"context"
	"errors"
	"fmt"
	"strings"

	"zapnet/netlist"
)

// Jobs lists the runs that Execute would solve, in plan order: variant-major,
// then level, then polarity. It solves nothing.
func Jobs(c *netlist.Circuit, opt *Options) ([]Job, error) {
	if opt == nil {
		opt = &Options{}
	}
	plan, err := planOf(c)
	if err != nil {
		return nil, err
	}
	levels, pols, variants := plan.Levels, plan.Polarities, plan.Variants
	if opt.Levels != nil {
		levels = opt.Levels
	}
	if opt.Polarities != nil {
		pols = opt.Polarities
	}
	if opt.Variants != nil {
		variants = opt.Variants
	}
	if len(variants) == 0 {
		variants = []netlist.Variant{nil}
	}
	for _, l := range levels {
		if !(l > 0) {
			return nil, fmt.Errorf("level %g: levels must be positive", l)
		}
	}
	for _, p := range pols {
		if p != "pos" && p != "neg" {
			return nil, fmt.Errorf("polarity %q: use pos or neg", p)
		}
	}
	if len(levels) == 0 || len(pols) == 0 {
		return nil, errors.New("the study has no level or no polarity to run")
	}
	var jobs []Job
	for vi, v := range variants {
		for _, l := range levels {
			for _, p := range pols {
				jobs = append(jobs, Job{Index: len(jobs), VariantIndex: vi, Variant: v, Level: l, Polarity: p})
			}
		}
	}
	return jobs, nil
}

// Execute solves every job of the study and returns the runs in plan order.
// A run whose solve fails has Verdict Error and its Err set; the returned
// error then joins those failures, each naming its run, and the other runs
// are still complete. An error before any solve (no strike, a variant that
// does not apply) returns no runs.
func Execute(c *netlist.Circuit, opt *Options) ([]Run, error) {
	jobs, err := Jobs(c, opt)
	if err != nil {
		return nil, err
	}
	return ExecuteJobs(c, jobs, opt)
}

// ExecuteJobs solves the given jobs (any subset of Jobs, a shard for example)
// across a pool of workers and returns their runs in the order of jobs. Each
// worker compiles a variant once and reuses its Bench for the following jobs
// of the same variant.
func ExecuteJobs(c *netlist.Circuit, jobs []Job, opt *Options) ([]Run, error) {
	// Nothing cancels the background context: every job runs.
	runs, _ := solvePool(context.Background(), c, jobs, opt, nil)
	// One failure told once: runs that fail the same way (every level at
	// the operating point, say) share one message naming them all.
	var order []string
	labels := map[string][]string{}
	first := map[string]error{}
	for i := range runs {
		if err := runs[i].Err; err != nil {
			msg := err.Error()
			if _, seen := labels[msg]; !seen {
				order = append(order, msg)
				first[msg] = err
			}
			labels[msg] = append(labels[msg], runs[i].Label())
		}
	}
	var errs []error
	for _, msg := range order {
		errs = append(errs, fmt.Errorf("%s: %w", strings.Join(labels[msg], "; "), first[msg]))
	}
	return runs, errors.Join(errs...)
}

// failedRun is the Run of a job that could not be solved.
func failedRun(c *netlist.Circuit, j Job, err error) Run {
	r := Run{Job: j, Verdict: Error, Err: err}
	if s := c.Strike(); s != nil {
		r.Waveform = s.Str["waveform"]
		r.LevelUnit = levelUnit(r.Waveform)
	}
	return r
}

// Label names a run for messages: "8 kV pos" or "8 kV pos, C1.value=1u".
func (r *Run) Label() string {
	s := formatSI(r.Level, r.LevelUnit) + " " + r.Polarity
	if len(r.Variant) > 0 {
		s += ", " + VariantString(r.Variant)
	}
	return s
}

// VariantString renders a variant as "C1.value=1u D1.part=fast", or "deck"
// for the deck as written.
func VariantString(v netlist.Variant) string {
	if len(v) == 0 {
		return "deck"
	}
	s := ""
	for i, st := range v {
		if i > 0 {
			s += " "
		}
		s += st.String()
	}
	return s
}
