package study

import (
	"fmt"
	"math"

	"zapnet/devices/spec"
)

// Name is the limit's short name: "U1 vmax", "n1 max".
func (l Limit) Name() string { return l.Element + " " + l.Param }

// String renders the limit with its margin: "U1 vmax: 0.7 V (12.7 %)".
func (l Limit) String() string {
	return fmt.Sprintf("%s: %s (%s)", l.Name(), spec.FormatSI(l.Margin, l.Unit), formatPercent(l.Percent))
}

// Failed reports whether the measurement is on the wrong side of the limit.
func (l Limit) Failed() bool { return l.Margin < 0 }

// NewLimit compares a measured extreme with a rating. upper says the
// measurement must stay at or below value (vmax, ipp), else at or above it
// (vmin, a watch min); says names the measurement in a failure sentence.
// The margin is positive on the safe side, in the rating's unit and in
// percent of |value|.
func NewLimit(element, param string, unit spec.Unit, value, measured, at float64, upper bool, says string) Limit {
	l := Limit{Element: element, Param: param, Unit: unit, Value: value, Measured: measured, At: at, Upper: upper, Says: says}
	if upper {
		l.Margin = value - measured
	} else {
		l.Margin = measured - value
	}
	if value != 0 {
		l.Percent = 100 * l.Margin / math.Abs(value)
	} else {
		// A zero limit has no scale: a percentage of nothing is infinite
		// on either side, which still sorts and fails correctly.
		l.Percent = math.Copysign(math.Inf(1), l.Margin)
	}
	return l
}

// NewWindowLimit compares a measured extreme with one side of a voltage
// window (a pin's vmax or vmin, a watch's max or min) whose measured
// quantity sat at v0 at the operating point. Its percentage is of the
// headroom from v0 to the limit: 100 % when the strike did not move the
// quantity toward the limit, 0 % at the limit, negative beyond it. A
// percentage of |value| would make a small limit (a −0.6 V vmin) look far
// more or less critical than it is, and the worst margin is chosen by
// percentage.
func NewWindowLimit(element, param string, unit spec.Unit, value, measured, at, v0 float64, upper bool, says string) Limit {
	l := NewLimit(element, param, unit, value, measured, at, upper, says)
	head := value - v0
	if !upper {
		head = v0 - value
	}
	switch {
	case head > 0:
		l.Percent = 100 * l.Margin / head
	case l.Margin >= 0:
		l.Percent = 0 // the operating point sits on the limit
	default:
		l.Percent = -100 // beyond the limit at rest already
	}
	l.Headroom, l.Rest, l.Window = head, v0, true
	return l
}

// Worst returns the limit with the smallest percentage margin, or nil.
// Ties keep the earlier limit, so the result follows deck order.
func Worst(limits []Limit) *Limit {
	var w *Limit
	for i := range limits {
		if w == nil || limits[i].Percent < w.Percent {
			w = &limits[i]
		}
	}
	if w == nil {
		return nil
	}
	c := *w
	return &c
}

// Judge sets the run's verdict, failures and worst margin from its limits.
func Judge(r *Run) {
	r.Failures = r.Failures[:0]
	for _, l := range r.Limits {
		if l.Failed() {
			r.Failures = append(r.Failures, l.Failure())
		}
	}
	r.Worst = Worst(r.Limits)
	r.Verdict = Pass
	if len(r.Failures) > 0 {
		r.Verdict = Fail
	}
}

// Failure says in a sentence how the limit was exceeded:
// "U1: residual peak 7.9 V above vmax 5.5 V". A window limit the circuit
// breaks at rest says so: no protection helps that, the operating point
// or the rating is wrong.
func (l Limit) Failure() string {
	side := "below"
	if l.Upper {
		side = "above"
	}
	if l.Window && l.Headroom < 0 {
		return fmt.Sprintf("%s: %s at rest, before any strike, already %s %s %s (the operating point breaks the rating)",
			l.Element, spec.FormatSI(l.Rest, l.Unit), side, l.Param, spec.FormatSI(l.Value, l.Unit))
	}
	return fmt.Sprintf("%s: %s %s %s %s %s", l.Element, l.Says, spec.FormatSI(l.Measured, l.Unit), side, l.Param, spec.FormatSI(l.Value, l.Unit))
}

// formatPercent renders a percentage with one decimal.
func formatPercent(p float64) string {
	if math.IsInf(p, 0) {
		return "∞ %"
	}
	return fmt.Sprintf("%.1f %%", p)
}
