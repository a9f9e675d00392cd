package waveforms

import (
	"math"
	"testing"
)

// The 8/20 µs formula's own numbers [calc: CHECKS.md]: peak ≈ Ip at
// 11.73 µs, front 1.25·(10–90 %) ≈ 8.0 µs; and the time to half value from
// the virtual origin ≈ 20 µs [calc here: 19.94 µs; IEC 61000-4-5 convention
// mem].
func TestSurge8_20(t *testing.T) {
	for _, ip := range []float64{250, 500, 1000, 3000} {
		s, err := mk("surge-8-20", ip, nil, nil)
		if err != nil {
			t.Fatal(err)
		}
		if s.Form != Current || s.Unit != "A" {
			t.Fatalf("form %v unit %q", s.Form, s.Unit)
		}
		sh := measured(s, 0, s.Stop, false)
		pv, at := sh.peak()
		near(t, "peak/Ip", pv/ip, 1, 1e-3)
		near(t, "peak time", at, 11.73e-6, 1e-3)
		_, front, half := frontTail(sh, 0.1, 0.9, 1.25)
		near(t, "front", front, 8.0e-6, 0.005) // "≈ 8.0": two figures
		near(t, "time to half", half, 20e-6, 0.005)
		expectAllWithin(t, s, 0)
		if s.F(s.Stop) > 0.01*pv {
			t.Errorf("i(Stop) = %g, not below 1 %% of the peak", s.F(s.Stop))
		}
	}
}

// The 1.2/50 µs formula [calc: CHECKS.md]: front 1.67·(30–90 %) ≈ 1.20 µs,
// time to half ≈ 50.0 µs, peak ≈ Vp; the open-circuit voltage passes its
// checks, the short-circuit current's peak is Vp/2 Ω and its front is not
// 8 µs (the documented simplification).
func TestSurge1_2_50(t *testing.T) {
	s, err := mk("surge-1.2-50", 2000, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if s.Form != Thevenin || s.R != 2 || s.Note == "" {
		t.Fatalf("stimulus %+v", s)
	}
	sh := measured(s, math.Inf(1), s.Stop, true)
	pv, front, half := frontTail(sh, 0.3, 0.9, 1.67)
	near(t, "peak/Vp", pv/2000, 1, 1e-3)
	near(t, "front", front, 1.20e-6, 0.005)
	near(t, "time to half", half, 50.0e-6, 1e-3)
	cs, err := Checks(s, DefaultLoad)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range cs {
		wantWithin := c.Quantity != "short-circuit front (8/20)"
		if c.Within != wantWithin {
			t.Errorf("%s: within = %v, want %v (computed %s)", c.Quantity, c.Within, wantWithin, FormatValue(c.Computed, c.Unit))
		}
	}
	near(t, "short-circuit peak", cs[3].Computed, 1000, 1e-3)
	// A 2 Ω load halves the voltage, shape unchanged [calc].
	i, v := s.Into(2, 3e-6)
	near(t, "divider v", v, s.F(3e-6)/2, 1e-15)
	near(t, "divider i", i, s.F(3e-6)/4, 1e-15)
	if _, err := mk("surge-1.2-50", 2000, map[string]float64{"r": 0}, nil); err == nil {
		t.Error("r = 0 accepted")
	}
	s, _ = mk("surge-1.2-50", 2000, map[string]float64{"r": 12}, nil)
	if s.R != 12 {
		t.Errorf("r = %g, want 12", s.R)
	}
}
