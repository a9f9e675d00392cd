package study

import (
	"errors"
	"fmt"

	"zapnet/devices/spec"

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

// newRun is the Run of job j before it is solved.
func newRun(j Job) Run {
	return Run{Index: j.Index, VariantIndex: j.VariantIndex, Variant: j.Variant, Level: j.Level, Polarity: j.Polarity,
		Failures: []string{}, Limits: []Limit{}, Notes: []string{}}
}

// failedRun is the Run of a job that could not be solved.
func failedRun(c *netlist.Circuit, j Job, err error) Run {
	r := newRun(j)
	r.Verdict, r.Err, r.Error = Error, err, err.Error()
	if s := c.Strike(); s != nil {
		r.Waveform, r.LevelUnit = s.Waveform.Name, s.Waveform.Unit
	}
	return r
}

// Label names a run for messages: "8 kV pos" or "8 kV pos, C1.value=1u".
func (r *Run) Label() string {
	s := spec.FormatSI(r.Level, r.LevelUnit) + " " + r.Polarity
	if len(r.Variant) > 0 {
		s += ", " + r.Variant.String()
	}
	return s
}
