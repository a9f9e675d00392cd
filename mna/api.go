// Package mna is zapnet's circuit engine: modified nodal analysis of a
// compiled circuit, Newton iteration with junction limiting, the DC operating
// point and the transient solution with trapezoidal integration and
// error-controlled steps. It knows no standard and no report.
package mna

import (
	"fmt"
	"time"
)

// Settings tune a solution. A nil *Settings means every default; a zero
// field means that field's default.
type Settings struct {
	// Stop is the simulated span, s. Zero: the stimulus's default span
	// (waveforms.Stimulus.Stop); an error when there is no stimulus.
	Stop float64
	// MaxStep bounds the time step, s. Zero: Stop/50.
	MaxStep float64
	// FirstStep bounds the first step after t = 0 and after every
	// breakpoint, s. That step is taken with backward Euler and accepted
	// without an error estimate (there is no history yet), so it must
	// resolve the stimulus's rise. Zero: a thousandth of the interval it
	// starts (itself at most MaxStep), and no more than the step the
	// stimulus's own span would give (a thousandth of Stimulus.Stop/50), so
	// that a window stretched for a slow circuit does not coarsen the first
	// nanosecond.
	FirstStep float64
	// MinStep is the step below which the solver gives up with a
	// *SolveError, s. Zero: 1e-16 s.
	MinStep float64
	// RelTol is the relative tolerance of Newton and of the step control.
	// Zero: 1e-3.
	//
	// 1e-3 is a cheap default for sweeps and tests, not an accurate one for
	// the first nanosecond of a strike, and no change of the error test
	// alone makes it so. Measured on testdata/demo-weak.zap at 2 kV against
	// a converged solution (RelTol 1e-8, ChargeTol 1e-19 C, MaxStep 0.2 ns):
	// the clamp node's extreme comes out 3 % short (13.53 V for 13.98 V,
	// −13.75 V for −14.15 V negative) and the pin's first overshoot (1.089 V
	// at 184 ps) 6 % short, under the pin's later slow maximum (1.026 V). A
	// tighter ChargeTol (1e-16, 1e-18 C), or dropping the widening of the
	// truncation-error tolerance (trtol), cost 2 to 5 times the steps and
	// leave those peaks where they were; so does RelTol 1e-5 on its own. What
	// moves them most is the first step after t = 0: a fraction of MaxStep
	// (40 ps for a 2 µs window), taken with backward Euler and accepted
	// without an error estimate (there is no history yet), it sets off the
	// gigahertz ringing of the first nanosecond damped and late. With
	// MaxStep 1 ns (a first step of 1 ps) RelTol 1e-4 is within 1 % of the
	// converged peaks and 1e-3 within 3.5 %. Estimating that first step from
	// the slope at the breakpoint is no general cure: where a source switches
	// (a network strike, a step) the slope jumps there and the estimate
	// forces the step to the minimum. A study should set RelTol 1e-4 or
	// tighter and a MaxStep that resolves the stimulus's rise.
	RelTol float64
	// AbsTol is the absolute tolerance on node voltages, V (and on branch
	// currents, A). Zero: 1e-6.
	AbsTol float64
	// ChargeTol is the absolute tolerance on the local truncation error of
	// charges and fluxes, C or Wb. Zero: 1e-14.
	ChargeTol float64
	// Gmin is the conductance from every node to gnd, S, which ties nodes
	// reached only through capacitors. Zero: 1e-12 S.
	Gmin float64
	// MaxIter bounds Newton iterations at one time point. Zero: 50.
	MaxIter int
	// FixedStep, when positive, turns the error control off: every step is
	// FixedStep (shortened only to land on breakpoints and the stop time),
	// still starting with the backward-Euler steps after each breakpoint.
	// It exists for verification (order-of-accuracy tests); zero: adaptive.
	FixedStep float64
	// Record keeps the sampled waveforms in the Result.
	Record bool
	// Observe, when set, is called at t = 0 and at every accepted point. The
	// Point's slices are reused: copy what you keep.
	Observe func(p *Point)
}

// Point is one accepted solution point.
type Point struct {
	T float64
	V []float64 // node voltages, in System.Nodes order, V
	I []float64 // current into each element's first terminal, System.Elements order, A
	W []float64 // power into each element, Σ v·i over its terminals, System.Elements order, W
	P []float64 // probe values, System.Probes order
}

// Result is a transient solution.
type Result struct {
	// Sampled waveforms, filled only with Settings.Record: Time[k] and
	// V[node][k], I[element][k], P[probe][k].
	Time []float64
	V    [][]float64
	I    [][]float64
	P    [][]float64

	// Energy is ∫ Σ v·i dt into each element over the run, J, in
	// System.Elements order; the strike's entry is negative (it delivers).
	Energy []float64
	// PeakCurrent is the largest |I| of each element, A.
	PeakCurrent []float64
	// Balance is the sum of Energy, J. Every entry is integrated from the same
	// terminal currents, so it measures what the solution leaves unbalanced
	// (the KCL residual Newton accepted, and the current into Gmin), not the
	// integration error of the charges.
	Balance float64
	// Stop is the span actually simulated, s.
	Stop   float64
	Stats  Stats
	Status Status
}

// Status says how a solution ended.
type Status int

const (
	// Failed: the solution stopped on an error (returned beside the
	// result), short of the stop time.
	Failed Status = iota
	// Completed: the solution reached the stop time.
	Completed
)

// Stats count the work of a solution.
type Stats struct {
	Steps    int // accepted time steps
	Rejected int // steps rejected by the error control or by Newton failure
	Newton   int // Newton iterations over the transient
	DCNewton int // Newton iterations of the operating point
	// Factorisations counts the LU factorisations of the transient: a
	// Newton iteration that converges, or that takes a chord step with the
	// previous factors, needs none.
	Factorisations int
	Wall           time.Duration
}

// SolveError is numerical trouble, told as something a user can act on.
type SolveError struct {
	Time     float64 // s; negative for the operating point
	Where    string  // the node, branch or element most involved
	Residual float64 // the last largest residual
	Reason   string  // what went wrong
	Hint     string  // what to try
}

func (e *SolveError) Error() string {
	when := "at the operating point"
	if e.Time >= 0 {
		when = fmt.Sprintf("at t = %.4g s", e.Time)
	}
	msg := fmt.Sprintf("solver: %s %s near %s (largest residual %.3g)", e.Reason, when, e.Where, e.Residual)
	if e.Hint != "" {
		msg += "; " + e.Hint
	}
	return msg
}
