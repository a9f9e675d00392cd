package study

import (
	"fmt"
	"math"

	"zapnet/devices"
	"zapnet/devices/spec"
	"zapnet/netlist"
)

// Work is an estimate of what a study costs, in time steps: what check
// tells before a long run is started.
type Work struct {
	Runs int
	// Steps is the most steps one run is bounded to take from below (the
	// window over the shortest step an element, a line by its delay, or
	// the window's resolve allows), or TypicalSteps when nothing bounds
	// the step.
	Steps float64
	// Bound says what sets Steps ("T1's step bound of 10 ps over a 20 µs
	// window"); empty when nothing does.
	Bound string
}

// TypicalSteps is the steps of a run that no delay or resolve bounds: the
// error control takes one to three thousand on the demo decks [practice:
// the reference networks take 800 to 1200].
const TypicalSteps = 2000

// LongStudy is the total of steps above which check warns: at a few
// microseconds a step on a laptop core, about a minute of work [practice].
const LongStudy = 2e7

// Total is the study's steps, runs × steps.
func (w Work) Total() float64 { return float64(w.Runs) * w.Steps }

// EstimateWork estimates the work of the study opt selects of c: for each
// level of the strike, the window the run will simulate over the shortest
// step an element bounds it to for that stimulus (devices.StepLimiter,
// told the stimulus's rise: a line not lumped) or the window's resolve
// imposes; the largest over the levels.
func EstimateWork(c *netlist.Circuit, opt *Options) (Work, error) {
	pl, err := PlanOf(c, opt)
	if err != nil {
		return Work{}, err
	}
	w := Work{Runs: pl.Runs(), Steps: TypicalSteps}
	s := c.Strike()
	// The elements that bound the step (a line by its delay), as built.
	type limiter struct {
		name string
		dev  devices.StepLimiter
	}
	var limiters []limiter
	for _, e := range c.Elements {
		d, err := e.Kind.New(e.Name, e.Nodes, &e.Values)
		if err != nil {
			return Work{}, fmt.Errorf("%s: %v", e.Pos, err)
		}
		if l, ok := d.(devices.StepLimiter); ok {
			limiters = append(limiters, limiter{e.Name, l})
		}
	}
	win := windowOf(c, opt)
	for _, level := range pl.Levels {
		st, err := s.Waveform.New(level, &s.Values)
		if err != nil {
			return Work{}, fmt.Errorf("%s: strike %s: %v", s.Pos, s.Name, err)
		}
		span := win.Stop
		if span <= 0 {
			span = DefaultStop(c, st.Stop)
		}
		bound := func(step float64, why string) {
			if n := span / step; step > 0 && n > w.Steps {
				w.Steps, w.Bound = n, fmt.Sprintf("%s over a %s window", why, spec.FormatSI(span, spec.Second))
			}
		}
		bound(win.Resolve, "the window's resolve of "+spec.FormatSI(win.Resolve, spec.Second))
		for _, l := range limiters {
			if r, ok := l.dev.(devices.RiseTaker); ok {
				r.SetRise(st.Rise)
			}
			if m := l.dev.MaxStep(); m > 0 {
				bound(m, fmt.Sprintf("%s's step bound of %s", l.name, spec.FormatSI(m, spec.Second)))
			}
		}
	}
	w.Steps = math.Ceil(w.Steps * (1 - 1e-12))
	return w, nil
}
