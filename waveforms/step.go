package waveforms

import (
	"fmt"
	"math"
)

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
		return nil, fmt.Errorf("step: span (%g s) must be longer than the rise (%g s)", stop, rise)
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
		Stop:        stop,
	}, nil
}
