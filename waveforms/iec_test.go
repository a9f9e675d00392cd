package waveforms

import (
	"math"
	"strings"
	"testing"
)

func sampleF(s *Stimulus, stop float64, n int) (ts, ys []float64) {
	return grid(0, stop, n, s.F)
}

// The annex formula's own numbers at 4 kV, computed from it [calc:
// CHECKS.md], to 0.1 %.
func TestIECAnnexAt4kV(t *testing.T) {
	near(t, "k1", iecK(iecTau1, iecTau2), 0.345511, 1e-5)
	near(t, "k2", iecK(iecTau3, iecTau4), 0.431547, 1e-5)
	s, err := mk("iec61000-4-2", 4000, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if s.Form != Current || s.Unit != "V" || s.Level != 4000 || s.Name != "iec61000-4-2" {
		t.Fatalf("stimulus header %+v", s)
	}
	ts, ys := sampleF(s, 200e-9, 400000) // 0.5 ps grid
	pv, pt := Peak(ts, ys)
	near(t, "first peak", pv, 14.921, 1e-3)
	near(t, "first peak time", pt, 1.460e-9, 1e-3)
	r, ok := Rise(ts, ys, 0.1, 0.9)
	if !ok {
		t.Fatal("no rise")
	}
	near(t, "rise 10-90", r, 0.811e-9, 1e-3)
	near(t, "i(30 ns)", s.F(30e-9), 8.035, 1e-3)
	near(t, "i(60 ns)", s.F(60e-9), 4.035, 1e-3)
	// Total charge over 2 µs (the tail is then e^−54 of its start).
	tq, yq := sampleF(s, 2e-6, 400000)
	near(t, "charge", Integral(tq, yq), 584.8e-9, 1e-3)
	// Steepest rise from the sampled slope.
	maxd := 0.0
	for k := 1; k < len(ts); k++ {
		maxd = math.Max(maxd, (ys[k]-ys[k-1])/(ts[k]-ts[k-1]))
	}
	near(t, "max di/dt", maxd, 18.7e9, 3e-3) // "≈ 18.7 A/ns": 3 figures
	// And the span: below 1 % of the peak at the end [practice: span rule].
	if s.F(s.Stop) > 0.01*pv {
		t.Errorf("i(Stop) = %g A, not below 1 %% of the peak", s.F(s.Stop))
	}
	if len(s.Breakpoints) == 0 || s.Breakpoints[0] != 0 {
		t.Errorf("breakpoints %v must start at 0", s.Breakpoints)
	}
	if s.F(0) != 0 || s.F(-1e-9) != 0 {
		t.Error("F must be 0 for t <= 0")
	}
}

// The published calibration table at every contact level, with the
// Ed. 2.0 tolerances [pub table; tolerances mem: CHECKS.md]. The 30 and
// 60 ns points count from the first 10 % crossing.
func TestIECTableEveryLevel(t *testing.T) {
	for _, c := range []struct{ kv, peak, i30, i60 float64 }{
		{2, 7.5, 4, 2}, // [pub]
		{4, 15, 8, 4},  // [pub]
		{6, 22.5, 12, 6},
		{8, 30, 16, 8},
	} {
		s, err := mk("iec61000-4-2", c.kv*1000, nil, nil)
		if err != nil {
			t.Fatal(err)
		}
		ts, ys := sampleF(s, 200e-9, 20000) // 10 ps grid
		pv, _ := Peak(ts, ys)
		t10, _ := FirstCrossing(ts, ys, 0.1*pv)
		within := func(what string, got, want, tol float64) {
			if math.Abs(got-want) > tol*want {
				t.Errorf("%g kV %s = %.4g A, published %.4g A ±%g %%", c.kv, what, got, want, tol*100)
			}
		}
		within("first peak", pv, c.peak, 0.15)
		within("i(30 ns)", s.F(t10+30e-9), c.i30, 0.30)
		within("i(60 ns)", s.F(t10+60e-9), c.i60, 0.30)
		r, _ := Rise(ts, ys, 0.1, 0.9)
		if math.Abs(r-0.8e-9) > 0.25*0.8e-9 {
			t.Errorf("%g kV rise %.3g s outside 0.8 ns ±25 %%", c.kv, r)
		}
		// Checks reports the same four points, all within.
		cs, err := Checks(s, DefaultLoad)
		if err != nil || len(cs) != 4 {
			t.Fatalf("checks: %v, %v", cs, err)
		}
		for k, want := range []float64{pv, r, s.F(t10 + 30e-9), s.F(t10 + 60e-9)} {
			near(t, cs[k].Quantity, cs[k].Computed, want, 1e-3)
			if !cs[k].Within || cs[k].Source == "" {
				t.Errorf("%g kV %s: %+v", c.kv, cs[k].Quantity, cs[k])
			}
		}
		// Linear in the level [pub: the table's amplitudes scale].
		near(t, "linearity", s.F(5e-9), c.kv/4*mustF(t, 4000, 5e-9), 1e-12)
	}
}

func mustF(t *testing.T, level, at float64) float64 {
	s, err := mk("iec61000-4-2", level, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	return s.F(at)
}

func TestNewErrors(t *testing.T) {
	if _, err := mk("iec-4-2", 4000, nil, nil); err == nil {
		t.Error("unknown name accepted")
	} else {
		for _, n := range Names() {
			if !strings.Contains(err.Error(), n) {
				t.Errorf("error %q does not list %s", err, n)
			}
		}
	}
	for _, lv := range []float64{0, -4000, math.NaN(), math.Inf(1)} {
		if _, err := mk("iec61000-4-2", lv, nil, nil); err == nil {
			t.Errorf("level %g accepted", lv)
		}
	}
}
