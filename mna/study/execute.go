package study

import (
	"errors"

	"zapnet/devices/spec"

	"zapnet/netlist"
)

// Jobs lists the runs that Execute would solve, in plan order: variant-major,
// then level, then polarity. It solves nothing.
func Jobs(c *netlist.Circuit, opt *Options) ([]Job, error) {
	pl, err := PlanOf(c, opt)
	if err != nil {
		return nil, err
	}
	if len(pl.Levels) == 0 || len(pl.Polarities) == 0 {
		return nil, errors.New("the study has no level or no polarity to run")
	}
	var jobs []Job
	for vi, v := range pl.Variants {
		for _, l := range pl.Levels {
			for _, p := range pl.Polarities {
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
