// Package mna is zapnet's circuit engine: modified nodal analysis of a
// compiled circuit, Newton iteration with junction limiting, the DC operating
// point and the transient solution with trapezoidal integration and
// error-controlled steps. It knows no standard and no report.
package mna

import (
	"context"
	"errors"
	"fmt"
	"time"
	"zapnet/devices/spec"
)

// Settings tune a solution. A nil *Settings means every default; a zero
// field means that field's default.
//
// Most callers give Stop and at most Accuracy and Resolve: the other
// tolerances follow from Accuracy, and exist for verification and for
// experts who want one mechanism at a time.
type Settings struct {
	// Context, when set, stops the solution once it is done: checked every
	// few steps (well under a millisecond of work apart), so that an
	// interrupted study stops within a fraction of a second. The error is
	// then ErrInterrupted wrapping the context's, and the Status
	// Interrupted.
	Context context.Context
	// Stop is the simulated span, s. Zero: the stimulus's default span
	// (waveforms.Stimulus.Stop); an error when there is no stimulus.
	Stop float64
	// Accuracy is the relative accuracy wanted on what a report reads:
	// every extreme of a node voltage, element current or probe and every
	// energy of the ledger, against a converged solution of the same
	// equations. An extreme is relative to the largest magnitude reached
	// on its side of zero (at least SideFloor of the largest on either
	// side), an energy of the ledger to the larger of itself and its
	// Gross; a protected pin's currents to PinCurrentFactor times
	// Accuracy. Zero: DefaultAccuracy (0.2 %). A tenfold smaller Accuracy
	// gives about a tenfold smaller error (at about three times the
	// steps), so the difference between a run and one at Accuracy/10 is
	// the first run's error to within about a tenth: its error bar.
	//
	// The step control holds the local error of every unknown, mapped from
	// the truncation error of the charges and fluxes through the circuit's
	// own matrix, below a share of Accuracy times the largest magnitude the
	// unknown has reached on its side of zero (at least a millivolt or a
	// milliampere); extremes are refined between points by the observer
	// (see Point.Corner and waveforms.Tracker.Refine).
	Accuracy float64
	// Resolve is the finest time detail the run must show: no step is
	// longer, s. Zero: no bound but the error control's and Stop/50. It
	// costs steps, and is for features the error control cannot see
	// coming (a narrow event in a quiet stretch), not for accuracy.
	Resolve float64
	// MaxStep is the older name of Resolve: when both are set the smaller
	// applies.
	MaxStep float64
	// FirstStep bounds the first step after t = 0 and after every
	// breakpoint, s. That step is taken with backward Euler and accepted
	// without an error estimate (there is no history yet), so it must
	// resolve the stimulus's rise. Zero: a ten-thousandth of the interval
	// it starts (itself at most the step bound), no more than the step the
	// stimulus's own time scale would give (a ten-thousandth of
	// Stimulus.Scale()/50), so that a window stretched for a slow circuit
	// does not coarsen the first nanosecond, and no less than 3e-7 of that
	// scale (60 fs for an ESD strike; unless the interval itself is
	// shorter), which is also the shortest step the error control asks
	// for: shorter steps make some circuits' matrices numerically singular.
	FirstStep float64
	// MinStep is the step below which the solver gives up with a
	// *SolveError, s. Zero: 1e-16 s.
	MinStep float64
	// RelTol, when positive, replaces the local relative error per step
	// that Accuracy sets (a share of Accuracy): the error control's bound
	// on each unknown relative to its scale. Newton converges to a
	// tenth of it. For verification and experts.
	RelTol float64
	// AbsTol is the absolute tolerance on node voltages, V, and branch
	// currents, A, in Newton's test and the error control. Zero: 1e-6.
	AbsTol float64
	// ChargeTol, when positive, also bounds the truncation error of every
	// charge and flux by itself, ChargeTol plus RelTol times its
	// magnitude, C or Wb: a second, stricter error control for
	// verification. Zero: none.
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

// DefaultAccuracy is the Accuracy of a zero Settings: 0.2 %, the deck's
// default (spec.DefaultAccuracy).
const DefaultAccuracy = spec.DefaultAccuracy

// Point is one accepted solution point.
type Point struct {
	T float64
	V []float64 // node voltages, in System.Nodes order, V
	I []float64 // current into each element's first terminal, System.Elements order, A
	W []float64 // power into each element, Σ v·i over its terminals, System.Elements order, W
	P []float64 // probe values, System.Probes order
	// Corner is true at t = 0 and at every breakpoint of the stimulus: a
	// value may change its slope, or jump, at this point, so no
	// interpolation of the points may span it (waveforms.Tracker.Corner).
	Corner bool
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
	// Gross is ∫ |Σ v·i − p₀| dt of each element, J, p₀ its power at the
	// operating point, summed step by step: the energy the strike moved
	// through the element in either direction. For an element that only
	// takes energy from the strike (a resistor or a clamp at rest) it is
	// the strike's share of Energy; for one that also gives energy back
	// (a capacitor, a pin's input capacitance, a load on a rail that the
	// strike lifts and then pulls below its rest) it is larger, and
	// Energy less p₀·Stop is the small difference of what went in and
	// came back. It is the scale to which that difference is accurate
	// (see Accuracy).
	Gross []float64
	// PeakCurrent is the largest |I| of each element, A, refined between
	// the points as waveforms.Tracker refines it, and TPeakCurrent when it
	// came, s.
	PeakCurrent, TPeakCurrent []float64
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
	// Interrupted: Settings.Context was done before the stop time.
	Interrupted
)

// ErrInterrupted is the error of a solution stopped by its context.
var ErrInterrupted = errors.New("interrupted")

// Stats count the work of a solution.
type Stats struct {
	Steps    int // accepted time steps
	Rejected int // steps rejected by the error control or by Newton failure
	// Newton counts the Newton iterations of the transient, that is its
	// evaluations of the circuit: an update taken without evaluating its
	// point adds none.
	Newton   int
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
