package waveforms

import (
	"fmt"
	"math"
	"zapnet/devices/spec"
)

// Check is one published check point of a waveform compared with what the
// stimulus delivers into the load.
type Check struct {
	Quantity string  // what is measured, e.g. "first peak", "current at 30 ns"
	Unit     string  // unit of Computed, Published, Lo and Hi: "A", "V", "s" or "%"
	Computed float64 // measured on the stimulus into the load
	// Published is the nominal published value; NaN when only a window is
	// published (HBM rise 2–10 ns).
	Published float64
	Lo, Hi    float64 // the accepted window, inclusive
	Tol       string  // the tolerance as published: "±15 %", "2–10 ns", "< 15 %"
	Within    bool    // Lo <= Computed <= Hi
	// Source marks where the published value comes from: "[pub]",
	// "[mem]", "[calc]" or "[practice]" (CHECKS.md).
	Source string
	// Ref names the document or the reasoning behind the value.
	Ref string
}

func (c *Check) judge() {
	c.Within = c.Computed >= c.Lo && c.Computed <= c.Hi
}

// rel is a check with a relative tolerance.
func rel(q, unit string, computed, published, tol float64, src, ref string) Check {
	lo, hi := published*(1-tol), published*(1+tol)
	if lo > hi {
		lo, hi = hi, lo
	}
	c := Check{Quantity: q, Unit: unit, Computed: computed, Published: published, Lo: lo, Hi: hi,
		Tol: "±" + spec.FormatFraction(tol), Source: src, Ref: ref}
	c.judge()
	return c
}

// window is a check with only an accepted window.
func window(q, unit string, computed, lo, hi float64, tol, src, ref string) Check {
	c := Check{Quantity: q, Unit: unit, Computed: computed, Published: math.NaN(), Lo: lo, Hi: hi,
		Tol: tol, Source: src, Ref: ref}
	c.judge()
	return c
}

// Checks compares the stimulus s with every published check point of
// CHECKS.md for its waveform at its level, measured into load ohms (+Inf for
// an open circuit; DefaultLoad or any negative value for the load the
// standard prescribes, see PrescribedLoad). Currents into a resistive load
// are computed in closed form (Into), not with the circuit engine. A
// waveform without published points (pwl, an ISO 10605 network of other
// values) gives no checks and no error.
func Checks(s *Stimulus, load float64) ([]Check, error) {
	if s != nil && s.Form == Generator {
		return nil, fmt.Errorf("checks: %s is a generator circuit with no closed form: solve it into the load with the engine (SolvedChecks)", s.Name)
	}
	w, load, err := checked(s, load)
	if w == nil || err != nil {
		return nil, err
	}
	return w.checks(s, load, measured), nil
}

// checked returns the waveform of s when it has checks (nil when it has
// none) and the load they are made into, s's own when load is zero.
func checked(s *Stimulus, load float64) (*Waveform, float64, error) {
	if s == nil {
		return nil, 0, fmt.Errorf("checks: no stimulus")
	}
	load = s.load(load)
	if math.IsNaN(load) || load < 0 {
		return nil, 0, fmt.Errorf("checks: load must be >= 0 ohms or +Inf, got %g", load)
	}
	w := Lookup(s.Name)
	switch {
	case w == nil:
		return nil, 0, fmt.Errorf("checks: unknown waveform %q", s.Name)
	case w.checks == nil:
		return nil, load, nil
	}
	return w, load, nil
}

// checkTol is the sampling accuracy of check measurements: crossings and
// values are then good to far better than the 0.1 % the tests ask.
const checkTol = 1e-8

// shape is one sampled channel with its analytic function, for measuring.
// A channel solved by the engine has only its samples: g interpolates them
// and sampled is set.
type shape struct {
	g       func(float64) float64
	t, y    []float64
	sampled bool
}

// meter gives a check the current (or, with voltage, the voltage) of a
// stimulus into load over [0, stop]: in closed form (measured) or solved by
// the engine (SolvedChecks).
type meter func(s *Stimulus, load, stop float64, voltage bool) shape

// measured samples the current (or, with voltage, the voltage) of s into
// load over [0, stop].
func measured(s *Stimulus, load, stop float64, voltage bool) shape {
	t, i, v := sampleSpan(s, load, checkTol, stop)
	if voltage {
		return shape{g: func(x float64) float64 { _, b := s.Into(load, x); return b }, t: t, y: v}
	}
	return shape{g: func(x float64) float64 { a, _ := s.Into(load, x); return a }, t: t, y: i}
}

// peak returns the largest value, refined between the neighbouring samples
// by golden-section search on the analytic function, or for a sampled
// channel by the parabola through the largest sample and its neighbours.
func (sh shape) peak() (v, at float64) {
	v, at = Peak(sh.t, sh.y)
	k := 0
	for k < len(sh.t) && sh.t[k] != at {
		k++
	}
	if k == 0 || k == len(sh.t)-1 {
		return v, at
	}
	if sh.sampled {
		return parabolaPeak(sh.t[k-1:k+2], sh.y[k-1:k+2])
	}
	a, b := sh.t[k-1], sh.t[k+1]
	const r = 0.6180339887498949
	x1, x2 := b-r*(b-a), a+r*(b-a)
	f1, f2 := sh.g(x1), sh.g(x2)
	for n := 0; n < 100 && b-a > 1e-15*math.Abs(b); n++ {
		if f1 > f2 {
			b, x2, f2 = x2, x1, f1
			x1 = b - r*(b-a)
			f1 = sh.g(x1)
		} else {
			a, x1, f1 = x1, x2, f2
			x2 = a + r*(b-a)
			f2 = sh.g(x2)
		}
	}
	m := (a + b) / 2
	if fm := sh.g(m); fm > v {
		return fm, m
	}
	return v, at
}

// riseCross returns the first instant the waveform reaches level on the
// way up: t[0] when it starts there or above (a network without inductance
// jumps at t = 0).
func (sh shape) riseCross(level float64) float64 {
	if sh.y[0] >= level {
		return sh.t[0]
	}
	at, ok := FirstCrossing(sh.t, sh.y, level)
	if !ok {
		return math.NaN()
	}
	return at
}

// fallCross returns the first crossing of level after the instant from.
func (sh shape) fallCross(level, from float64) float64 {
	k := 0
	for k < len(sh.t) && sh.t[k] < from {
		k++
	}
	at, ok := FirstCrossing(sh.t[k:], sh.y[k:], level)
	if !ok {
		return math.NaN()
	}
	return at
}

// iecTable holds the published calibration levels, V [pub].
var iecTable = map[float64]bool{2000: true, 4000: true, 6000: true, 8000: true}

// isoPoints are the ISO 10605 check points per network, A/kV at times
// counted from the first 10 % crossing [mem, moderate confidence: CHECKS.md].
var isoPoints = []struct {
	c, r   float64
	t1, a1 float64
	t2, a2 float64
}{
	{150e-12, 330, 30e-9, 2, 60e-9, 1},
	{330e-12, 330, 65e-9, 2, 130e-9, 1},
	{150e-12, 2000, 180e-9, 0.275, 360e-9, 0.15},
	{330e-12, 2000, 400e-9, 0.275, 800e-9, 0.15},
}

// frontTail measures an IEC 61000-4-5 front and time to half value: the
// front is k·(t_hi − t_lo) between the lo and hi fractions of the peak; the
// virtual origin is where the line through those two points meets zero, and
// the time to half value runs from it to the 50 % point of the tail
// [mem: IEC 61000-4-5 definitions].
func frontTail(sh shape, lo, hi, k float64) (pv, front, half float64) {
	pv, pt := sh.peak()
	tl, th := sh.riseCross(lo*pv), sh.riseCross(hi*pv)
	origin := tl - lo*(th-tl)/(hi-lo)
	return pv, k * (th - tl), sh.fallCross(0.5*pv, pt) - origin
}

// siFormat writes v with an SI prefix and four significant digits
// (spec.FormatSI), "-" for a value that is not a number.
func siFormat(v float64, unit string) string {
	switch {
	case math.IsNaN(v):
		return "-"
	case math.IsInf(v, 1):
		return "inf " + unit
	case math.IsInf(v, -1):
		return "-inf " + unit
	}
	return spec.FormatSI(v, spec.Unit(unit))
}

// FormatValue writes v in unit with an SI prefix and four significant
// digits ("14.92 A", "811 ps"); percentages are written as "3.2 %".
func FormatValue(v float64, unit string) string {
	if unit == "%" {
		if math.IsNaN(v) {
			return "-"
		}
		return fmt.Sprintf("%.3g %%", v)
	}
	return siFormat(v, unit)
}
