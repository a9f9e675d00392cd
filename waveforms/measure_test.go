package waveforms

import (
	"math"
	"testing"
)

func grid(t0, t1 float64, n int, f func(float64) float64) (ts, ys []float64) {
	ts = make([]float64, n+1)
	ys = make([]float64, n+1)
	for k := range ts {
		ts[k] = t0 + (t1-t0)*float64(k)/float64(n)
		ys[k] = f(ts[k])
	}
	return ts, ys
}

func near(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s = %.9g, want %.9g within %.3g %%", what, got, want, rel*100)
	}
}

func nearAbs(t *testing.T, what string, got, want, abs float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > abs {
		t.Errorf("%s = %.9g, want %.9g within %.3g", what, got, want, abs)
	}
}

// A triangle is piecewise linear, so every measurement must be exact (to
// rounding) [calc: elementary geometry].
func TestMeasureTriangle(t *testing.T) {
	// 0 at t=0, 10 at t=2, 0 at t=6, −2 at t=7, 0 at t=8.
	ts := []float64{0, 2, 6, 7, 8}
	ys := []float64{0, 10, 0, -2, 0}
	v, at := Peak(ts, ys)
	nearAbs(t, "peak", v, 10, 0)
	nearAbs(t, "peak time", at, 2, 0)
	v, at = Min(ts, ys)
	nearAbs(t, "min", v, -2, 0)
	nearAbs(t, "min time", at, 7, 0)
	v, at = AbsPeak(ts, ys)
	nearAbs(t, "abs peak", v, 10, 0)
	nearAbs(t, "abs peak time", at, 2, 0)
	// 10–90 % of a linear 0→10 ramp over 2 s: 1.6 s.
	r, ok := Rise(ts, ys, 0.1, 0.9)
	if !ok {
		t.Fatal("rise undefined")
	}
	nearAbs(t, "rise", r, 1.6, 1e-15)
	nearAbs(t, "value at 1", ValueAt(ts, ys, 1), 5, 1e-15)
	nearAbs(t, "value at 5", ValueAt(ts, ys, 5), 2.5, 1e-15)
	nearAbs(t, "value before", ValueAt(ts, ys, -1), 0, 0)
	nearAbs(t, "value at sample", ValueAt(ts, ys, 7), -2, 0)
	// Above 5: from t=1 to t=4, 3 s.
	nearAbs(t, "width above 5", WidthAbove(ts, ys, 5), 3, 1e-15)
	// Below −1: from 6.5 to 7.5.
	nearAbs(t, "width below -1", WidthBelow(ts, ys, -1), 1, 1e-15)
	// Area: 10·6/2 − 2·2/2 = 28.
	nearAbs(t, "integral", Integral(ts, ys), 28, 1e-13)
	at, ok = FirstCrossing(ts, ys, 4)
	if !ok {
		t.Fatal("no crossing of 4")
	}
	nearAbs(t, "first crossing of 4", at, 0.8, 1e-15)
	at, ok = FirstCrossing(ts, ys, -1)
	if !ok {
		t.Fatal("no crossing of -1")
	}
	nearAbs(t, "first crossing of -1", at, 6.5, 1e-15)
	if _, ok := FirstCrossing(ts, ys, 11); ok {
		t.Error("crossing of 11 reported on a waveform peaking at 10")
	}
}

// Energy is exact for two linear pieces: v = t, i = 1 − t on [0, 1] gives
// ∫ t(1−t) dt = 1/6 [calc]; on a coarse and a fine grid alike.
func TestEnergyExactForLinearPieces(t *testing.T) {
	for _, n := range []int{1, 3, 100} {
		ts, v := grid(0, 1, n, func(x float64) float64 { return x })
		_, i := grid(0, 1, n, func(x float64) float64 { return 1 - x })
		nearAbs(t, "energy", Energy(ts, v, i), 1.0/6, 1e-15)
	}
	// Quadratic products on piecewise-linear samples of sin and cos:
	// ∫0^π sin·sin dt = π/2 [calc], converging at second order.
	ts, s := grid(0, math.Pi, 2000, math.Sin)
	near(t, "∫ sin² dt", Energy(ts, s, s), math.Pi/2, 1e-6)
}

// Sampled smooth functions against their analytic measurements [calc].
func TestMeasureSine(t *testing.T) {
	ts, ys := grid(0, 2*math.Pi, 200000, math.Sin)
	v, at := Peak(ts, ys)
	near(t, "sine peak", v, 1, 1e-9)
	near(t, "sine peak time", at, math.Pi/2, 1e-4)
	v, at = Min(ts, ys)
	near(t, "sine min", v, -1, 1e-9)
	near(t, "sine min time", at, 3*math.Pi/2, 1e-4)
	// sin > 0.5 on (π/6, 5π/6): 2π/3.
	near(t, "sine width above 0.5", WidthAbove(ts, ys, 0.5), 2*math.Pi/3, 1e-8)
	near(t, "sine width below -0.5", WidthBelow(ts, ys, -0.5), 2*math.Pi/3, 1e-8)
	// 10–90 %: asin(0.9) − asin(0.1).
	r, _ := Rise(ts, ys, 0.1, 0.9)
	near(t, "sine rise", r, math.Asin(0.9)-math.Asin(0.1), 1e-8)
	nearAbs(t, "sine integral over a period", Integral(ts, ys), 0, 1e-9)
}

func TestMeasureExponential(t *testing.T) {
	tau := 3.0
	ts, ys := grid(0, 40, 400000, func(x float64) float64 { return math.Exp(-x / tau) })
	// ∫0^40 e^(−t/τ) = τ(1 − e^(−40/τ)); above 1/e until τ [calc].
	near(t, "exp integral", Integral(ts, ys), tau*(1-math.Exp(-40/tau)), 1e-9)
	near(t, "exp width above 1/e", WidthAbove(ts, ys, math.Exp(-1)), tau, 1e-9)
	at, _ := FirstCrossing(ts, ys, 0.5)
	near(t, "exp half time", at, tau*math.Ln2, 1e-9)
	near(t, "exp value at 2", ValueAt(ts, ys, 2), math.Exp(-2/tau), 1e-9)
	if _, ok := Rise(ts, ys, 0.1, 0.9); ok {
		t.Error("a waveform that starts at its peak has no rise")
	}
}

// The streaming meters add the same terms in the same order as the slice
// functions, so the results must be identical, not merely close.
func TestStreamingEqualsSlices(t *testing.T) {
	s, err := mk("iec61000-4-2", 8000, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	// An uneven grid with a repeated time (a jump) and a negative lobe.
	var ts, ys, vs []float64
	x := 0.0
	for k := 0; k < 5000; k++ {
		ts = append(ts, x)
		y := s.F(x) - 3*math.Sin(x*1e8)
		ys = append(ys, y)
		vs = append(vs, 2+math.Cos(x*3e7))
		x += 1e-12 * float64(1+k%7) * 10
		if k == 2000 {
			ts = append(ts, ts[len(ts)-1])
			ys = append(ys, -5)
			vs = append(vs, 1)
		}
	}
	tr := Tracker{Above: 4.5, Below: -1.25}
	for k := range ts {
		tr.Add(ts[k], ys[k])
	}
	eq := func(what string, a, b float64) {
		t.Helper()
		if a != b {
			t.Errorf("%s: streaming %.17g, slice %.17g", what, a, b)
		}
	}
	v1, t1 := tr.Max()
	v2, t2 := Peak(ts, ys)
	eq("max", v1, v2)
	eq("t max", t1, t2)
	v1, t1 = tr.Min()
	v2, t2 = Min(ts, ys)
	eq("min", v1, v2)
	eq("t min", t1, t2)
	v1, t1 = tr.AbsPeak()
	v2, t2 = AbsPeak(ts, ys)
	eq("abs", v1, v2)
	eq("t abs", t1, t2)
	eq("width above", tr.WidthAbove(), WidthAbove(ts, ys, 4.5))
	eq("width below", tr.WidthBelow(), WidthBelow(ts, ys, -1.25))
	tr.Reset()
	if v, _ := tr.Max(); !math.IsNaN(v) || tr.Above != 4.5 {
		t.Error("Reset must forget samples and keep thresholds")
	}
}

func TestMeasureEmptyAndMismatch(t *testing.T) {
	if v, _ := Peak(nil, nil); !math.IsNaN(v) {
		t.Error("peak of nothing must be NaN")
	}
	defer func() {
		if recover() == nil {
			t.Error("mismatched lengths must panic (a programmer error)")
		}
	}()
	Integral([]float64{0, 1}, []float64{0})
}
