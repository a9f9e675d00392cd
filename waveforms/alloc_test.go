package waveforms

import (
	"math"
	"testing"
)

// The engine calls F at every step and the study feeds a Tracker per node
// at every accepted point: neither may allocate (STYLE.md: no allocation in
// the hot loop).
func TestHotPathsDoNotAllocate(t *testing.T) {
	var tr Tracker
	x := 0.0
	if n := testing.AllocsPerRun(100, func() {
		x += 1e-12
		tr.Add(x, math.Sin(x*1e9))
	}); n != 0 {
		t.Errorf("Tracker.Add allocates %g times", n)
	}
	// With Refine a peak every few samples takes the interpolation path.
	rt, k := Tracker{Refine: true}, 0.0
	if n := testing.AllocsPerRun(100, func() {
		k++
		rt.Add(k, math.Sin(k))
	}); n != 0 {
		t.Errorf("Tracker.Add with Refine allocates %g times", n)
	}
	for _, n := range Names() {
		info := Lookup(n)
		str := map[string]string{"file": "testdata/pulse.csv"}
		s, err := mk(n, info.Level, map[string]float64{"count": 3}, str)
		if err != nil {
			t.Fatal(err)
		}
		if s.F == nil {
			continue
		}
		y := 0.0
		if a := testing.AllocsPerRun(100, func() { y += s.F(3e-9) }); a != 0 {
			t.Errorf("%s: F allocates %g times", n, a)
		}
	}
}

// Ringing of an underdamped HBM loop: consecutive extremes of
// e^(−αt)·sin(ωt) are π/ω apart, so the first swing below zero is
// e^(−απ/ω) of the peak [calc].
func TestHBMRinging(t *testing.T) {
	l := 1e-3 // far above R²C/4 = 56 µH: underdamped, rings by 46 %
	s, err := mk("hbm", 1000, map[string]float64{"l": l}, nil)
	if err != nil {
		t.Fatal(err)
	}
	cs, _ := Checks(s, 0)
	alpha := hbmR / (2 * l)
	w := math.Sqrt(1/(l*hbmC) - alpha*alpha)
	near(t, "ringing %", cs[3].Computed, 100*math.Exp(-alpha*math.Pi/w), 1e-4)
	if cs[3].Within {
		t.Errorf("ringing %.1f %% reported within 15 %%", cs[3].Computed)
	}
}

func BenchmarkTrackerAdd(b *testing.B) {
	var tr Tracker
	for k := 0; k < b.N; k++ {
		tr.Add(float64(k)*1e-12, float64(k%100))
	}
}

func BenchmarkIECF(b *testing.B) {
	s, _ := mk("iec61000-4-2", 8000, nil, nil)
	y := 0.0
	for k := 0; k < b.N; k++ {
		y += s.F(float64(k%1000) * 1e-10)
	}
	_ = y
}
