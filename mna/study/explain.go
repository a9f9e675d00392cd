package study

import (
	"errors"
	"fmt"

	"zapnet/devices/spec"
	"zapnet/mna"
	"zapnet/netlist"
)

// explain turns a solve failure into a sentence a user can act on: what went
// wrong, where, when, and what to try. Errors that are not the engine's
// numerical trouble pass through unchanged.
func explain(err error, c *netlist.Circuit, w netlist.Window) error {
	var se *mna.SolveError
	if !errors.As(err, &se) {
		return err
	}
	when := "at the operating point (before the strike)"
	if se.Time >= 0 {
		when = "at t = " + spec.FormatSI(se.Time, "s")
	}
	where := se.Where
	if where == "" {
		where = "an unknown place"
	}
	reason := se.Reason
	if reason == "" {
		reason = "the solution did not converge"
	}
	hint := se.Hint
	if hint == "" {
		hint = defaultHint(se, w)
	}
	return &SolveFailure{Cause: se, Msg: fmt.Sprintf("the solver stopped %s near %s: %s; %s", when, where, reason, hint)}
}

// defaultHint suggests the usual remedies when the engine gave none.
func defaultHint(se *mna.SolveError, w netlist.Window) string {
	if se.Time < 0 {
		return "check that every node has a DC path to gnd and that no supplies or inductors form a loop"
	}
	step := "a finer time detail (window resolve=)"
	if w.Resolve > 0 {
		step = "a finer time detail (window resolve=" + spec.DeckNumber(w.Resolve/10, "s") + ")"
	}
	return "try " + step + ", or add the series resistance an ideal element lacks (a clamp's rdyn, a capacitor's esr)"
}

// SolveFailure is numerical trouble told as a sentence; Cause keeps the
// engine's details for callers that want them.
type SolveFailure struct {
	Cause *mna.SolveError
	Msg   string
}

func (e *SolveFailure) Error() string { return e.Msg }

// Unwrap gives errors.As access to the engine's error.
func (e *SolveFailure) Unwrap() error { return e.Cause }
