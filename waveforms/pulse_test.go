package waveforms

import (
	"math"
	"testing"
)

// TLP: a 50 Ω source whose short-circuit current is the level, edges
// `rise` long, width at half maximum `width` [practice: the convention
// documented on newTLP]; the 70–90 % average into a short is the level.
func TestTLP(t *testing.T) {
	s, err := mk("tlp", 16, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if s.Form != Thevenin || s.R != 50 || s.Unit != "A" {
		t.Fatalf("stimulus %+v", s)
	}
	want := []float64{0, 1e-9, 100e-9, 101e-9}
	for k, b := range want {
		if math.Abs(s.Breakpoints[k]-b) > 1e-22 {
			t.Errorf("breakpoint %d = %g, want %g", k, s.Breakpoints[k], b)
		}
	}
	nearAbs(t, "open-circuit top", s.F(50e-9), 800, 0)
	nearAbs(t, "half rise", s.F(0.5e-9), 400, 1e-12)
	nearAbs(t, "after", s.F(102e-9), 0, 0)
	i, _ := s.Into(0, 80e-9)
	nearAbs(t, "short-circuit current", i, 16, 1e-12)
	expectAllWithin(t, s, 0)
	cs, _ := Checks(s, 0)
	near(t, "rise 10-90 = 0.8·rise", cs[2].Computed, 0.8e-9, 1e-9)
	// Into 5 Ω the flat top is 800/55 A [calc].
	cs, _ = Checks(s, 5)
	near(t, "avg into 5 Ω", cs[0].Computed, 800.0/55, 1e-9)
	s, err = mk("tlp", 8, map[string]float64{"width": 50e-9, "rise": 10e-9}, nil)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "stop", s.Stop, 85e-9, 1e-12)
	for _, bad := range []map[string]float64{{"rise": 100e-9}, {"width": 0}, {"rise": -1e-9}} {
		if _, err := mk("tlp", 8, bad, nil); err == nil {
			t.Errorf("%v accepted", bad)
		}
	}
}

// EFT: the fitted double exponential has a 10–90 % rise of 5 ns and a
// width at half maximum of 50 ns [calc: fitted to IEC 61000-4-4's 5/50 ns],
// its open-circuit peak is the level, and into 50 Ω it is half.
func TestEFTPulse(t *testing.T) {
	s, err := mk("eft", 4000, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	sh := measured(s, math.Inf(1), s.Stop, true)
	pv, _ := sh.peak()
	near(t, "open-circuit peak", pv, 4000, 1e-5)
	near(t, "rise", sh.riseCross(0.9*pv)-sh.riseCross(0.1*pv), 5e-9, 1e-3)
	near(t, "width", WidthAbove(sh.t, sh.y, pv/2), 50e-9, 1e-3)
	cs, _ := Checks(s, DefaultLoad)
	near(t, "peak into 50 Ω", cs[0].Computed, 2000, 1e-5)
	expectAllWithin(t, s, 50)
	expectAllWithin(t, s, 1000)
	expectAllWithin(t, s, 0)
	if s.F(s.Stop) > 0.01*pv {
		t.Errorf("v(Stop) = %g, not below 1 %% of the peak", s.F(s.Stop))
	}
}

// A burst repeats the same pulse at the rate: each pulse starts on a
// breakpoint and peaks as the first does [calc].
func TestEFTBurst(t *testing.T) {
	one, _ := mk("eft", 1000, nil, nil)
	s, err := mk("eft", 1000, map[string]float64{"count": 75, "rate": 100e3}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Breakpoints) != 75 {
		t.Fatalf("%d breakpoints", len(s.Breakpoints))
	}
	near(t, "last start", s.Breakpoints[74], 740e-6, 1e-12)
	near(t, "span", s.Stop, 740e-6+eftTail, 1e-12)
	for _, k := range []int{1, 37, 74} {
		for _, dt := range []float64{1e-9, 8e-9, 40e-9} {
			near(t, "pulse shape", s.F(s.Breakpoints[k]+dt), one.F(dt), 1e-6)
		}
		if v := s.F(s.Breakpoints[k] - 1e-6); math.Abs(v) > 1e-9 {
			t.Errorf("between pulses v = %g", v)
		}
	}
	if v := s.F(s.Stop + 1e-6); v > 1 {
		t.Errorf("after the burst v = %g", v)
	}
	for _, bad := range []map[string]float64{{"count": 1.5}, {"count": 0}, {"count": 2, "rate": 5e6}, {"rate": -1}} {
		if _, err := mk("eft", 1000, bad, nil); err == nil {
			t.Errorf("%v accepted", bad)
		}
	}
}
