package waveforms

import (
	"math"
	"testing"
)

// A damped ringing sampled at uneven steps of about a fortieth of its
// period: the samples' extremes read low by up to 1 − cos(ω·h/2) (about
// 0.3 %), the refined ones must come within 3e-5 of the true extremes
// [calc: the extremes of e^(−t/τ)·cos(ωt) are where tan(ωt) = −1/(ωτ),
// found here by bisection on the derivative; the cubic's error bound is
// (ω·h)⁴/4! times a small factor].
func TestTrackerRefinesRinging(t *testing.T) {
	const w, tau = 2 * math.Pi / 440e-12, 900e-12
	f := func(t float64) float64 { return math.Exp(-t/tau) * math.Cos(w*t) }
	df := func(t float64) float64 { return -math.Exp(-t/tau) * (math.Cos(w*t)/tau + w*math.Sin(w*t)) }
	// The first minimum: the root of f' within the first period's middle.
	lo, hi := 0.25*440e-12, 0.75*440e-12
	for k := 0; k < 200; k++ {
		mid := 0.5 * (lo + hi)
		if df(mid) < 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	tmin := 0.5 * (lo + hi)
	wantMin := f(tmin)
	for _, phase := range []float64{0, 0.17, 0.33, 0.5, 0.71, 0.93} {
		var plain, fine Tracker
		fine.Refine = true
		tt := 0.0
		for k := 0; tt < 3e-9; k++ {
			plain.Add(tt, f(tt))
			fine.Add(tt, f(tt))
			// Steps of 11 ps ± 30 %, the phase shifting the samples.
			h := 11e-12 * (1 + 0.3*math.Sin(float64(k)*1.7+phase*6))
			if k == 0 {
				h *= phase + 0.05
			}
			tt += h
		}
		pv, _ := plain.Min()
		fv, ft := fine.Min()
		t.Logf("phase %g: sample error %.3g, refined error %.3g", phase, pv-wantMin, fv-wantMin)
		if math.Abs(fv-wantMin) > 3e-5 || math.Abs(ft-tmin) > 0.5e-12 {
			t.Errorf("phase %g: refined minimum %.7g at %.4g s, want %.7g at %.4g s", phase, fv, ft, wantMin, tmin)
		}
		if pv < fv || pv < wantMin {
			t.Errorf("phase %g: sample minimum %.7g below the refined %.7g or the true %.7g", phase, pv, fv, wantMin)
		}
		// The maximum is the first sample, 1 at t = 0; the largest magnitude
		// is that too.
		if v, at := fine.Max(); v != 1 || at != 0 {
			t.Errorf("phase %g: maximum %g at %g, want 1 at 0", phase, v, at)
		}
		if v, _ := fine.AbsPeak(); v != 1 {
			t.Errorf("phase %g: largest magnitude %g, want 1", phase, v)
		}
	}
}

// At a corner the samples are exact and no interpolation may pass them: a
// triangle peaking on a sample marked as a corner keeps its peak, and a
// jump (two samples at one time) is a corner too [calc: elementary
// geometry]. Without the mark the cubic overshoots the corner, which is why
// the mark exists.
func TestTrackerCorner(t *testing.T) {
	tri := func(t float64) float64 { return 1 - math.Abs(t-1) }
	feed := func(mark bool) *Tracker {
		r := &Tracker{Refine: true}
		for k := 0; k <= 20; k++ {
			tt := float64(k) * 0.1
			r.Add(tt, tri(tt))
			if mark && k == 10 {
				r.Corner()
			}
		}
		return r
	}
	if v, at := feed(true).Max(); v != 1 || math.Abs(at-1) > 1e-15 {
		t.Errorf("marked corner: maximum %g at %g, want 1 at 1", v, at)
	}
	if v, _ := feed(false).Max(); !(v > 1) {
		t.Errorf("unmarked corner: maximum %g, expected the cubic to overshoot 1", v)
	}
	// A step up by 1 at t = 1 followed by a slow fall: the samples straddle
	// the jump, which Add sees as a repeated time.
	r := &Tracker{Refine: true}
	for k := 0; k <= 20; k++ {
		tt := float64(k) * 0.1
		y := 0.05 * tt
		if k == 10 {
			r.Add(tt, y)
		}
		if k >= 10 {
			y = 1 + 0.05 - 0.1*(tt-1)
		}
		r.Add(tt, y)
	}
	if v, at := r.Max(); v != 1.05 || at != 1 {
		t.Errorf("jump: maximum %g at %g, want 1.05 at 1", v, at)
	}
}

// Refining leaves the other measurements alone: the widths are those of
// the samples, bit for bit.
func TestTrackerRefineKeepsTheRest(t *testing.T) {
	ts, ys := grid(0, 1e-9, 97, func(t float64) float64 { return math.Sin(2 * math.Pi * t / 0.3e-9) })
	a, b := Tracker{Above: 0.5, Below: -0.5}, Tracker{Above: 0.5, Below: -0.5, Refine: true}
	for k := range ts {
		a.Add(ts[k], ys[k])
		b.Add(ts[k], ys[k])
	}
	if a.WidthAbove() != b.WidthAbove() || a.WidthBelow() != b.WidthBelow() {
		t.Errorf("refining changed the widths")
	}
	b.Reset()
	if v, _ := b.Max(); !b.Refine || b.Above != 0.5 || v == v {
		t.Errorf("Reset lost the settings or kept samples")
	}
}
