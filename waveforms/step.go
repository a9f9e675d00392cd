package waveforms

import (
	"fmt"
	"math"

	"zapnet/devices/spec"
)

func init() {
	Register(&Waveform{Name: "step", Unit: spec.Volt, Level: 1,
		Summary: "a signal edge: a linear ramp to the level, then held, from a source resistance r",
		Table: spec.Table{Params: []spec.Param{
			spec.Default("rise", spec.Second, spec.Positive, StepRise),
			spec.Default("r", spec.Ohm, spec.Positive, 50),
		}},
		build: func(level float64, v *spec.Values) (*Stimulus, error) {
			rise := v.Num("rise")
			return Step(level, rise, v.Num("r"), stepSpan(rise))
		},
		Order: 90, Load: math.Inf(1),
		checks: checksStep,
	})
}

// checksStep: into the load (open by default), the settled value is the
// divider level·load/(r + load) (level/r into a short) and the 10–90 % rise
// of a linear ramp is 0.8·rise [calc: both from the definition].
func checksStep(s *Stimulus, load float64, m meter) []Check {
	rise := s.Breakpoints[1]
	q, unit, want := "settled voltage", "V", s.Level
	if !math.IsInf(load, 1) {
		want = s.Level * load / (s.R + load)
	}
	if load == 0 {
		q, unit, want = "settled current", "A", s.Level/s.R
	}
	sh := m(s, load, s.Stop, load != 0)
	end := sh.y[len(sh.y)-1]
	got := sh.riseCross(0.9*end) - sh.riseCross(0.1*end)
	ref := "the step's definition: a linear ramp over rise, then held"
	return []Check{
		rel(q, unit, end, want, 1e-6, "[calc]", ref),
		rel("rise 10-90 %", "s", got, 0.8*rise, 1e-3, "[calc]", ref),
	}
}

// stepSpan is a step's default span: long beside its ramp and beside the
// nanosecond settling of a protected data line.
func stepSpan(rise float64) float64 { return 10e-9 + 100*rise }

// StepRise is the default ramp of a step, s: short beside the added rise
// of any protection network worth measuring (0.3 pF on 50 Ω adds 16.5 ps),
// so that what the edge check measures is the network's own rise.
const StepRise = 1e-12

// Step is a signal edge for the edge check of the signal side: an
// open-circuit voltage that ramps linearly from 0 to level over rise
// (0 → 100 %, so its own 10–90 % rise is 0.8·rise) and then holds, behind
// the resistance r (a port's impedance). Once the ramp is over the response
// of a linear network is its step response shifted by rise/2 in time, so
// the 10–90 % rise of a single-pole response (a shunt C: ln 9·τ) comes out
// exact when its 10 % crossing falls after the ramp; a slower ramp adds to
// it roughly as the root of the sum of squares [practice]. stop is the span.
func Step(level, rise, r, stop float64) (*Stimulus, error) {
	switch {
	case !(rise > 0) || math.IsInf(rise, 0):
		return nil, fmt.Errorf("step: rise must be positive and finite, have %g s", rise)
	case !(r > 0) || math.IsInf(r, 0):
		return nil, fmt.Errorf("step: source resistance must be positive and finite, have %g Ω", r)
	case !(stop > rise) || math.IsInf(stop, 0):
		return nil, fmt.Errorf("step: span %s must be longer than the rise %s", spec.FormatSI(stop, "s"), spec.FormatSI(rise, "s"))
	case math.IsNaN(level) || math.IsInf(level, 0):
		return nil, fmt.Errorf("step: level must be finite, have %g V", level)
	}
	f := func(t float64) float64 {
		switch {
		case t <= 0:
			return 0
		case t < rise:
			return level * t / rise
		}
		return level
	}
	return &Stimulus{
		Name: "step", Level: level, Unit: "V", Form: Thevenin, F: f, R: r,
		Breakpoints: []float64{0, rise},
		Rise:        rise,
		Stop:        stop,
	}, nil
}
