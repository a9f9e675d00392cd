package waveforms

import (
	"math"
	"testing"
)

// A step's own 10–90 % rise is 0.8·rise (a linear ramp) [calc], and it
// holds at its level after the ramp.
func TestStepShape(t *testing.T) {
	st, err := Step(2, 10e-12, 50, 1e-9)
	if err != nil {
		t.Fatal(err)
	}
	var tm, v []float64
	for k := 0; k <= 2000; k++ {
		x := float64(k) * 1e-9 / 2000
		tm, v = append(tm, x), append(v, st.F(x))
	}
	r, ok := Rise(tm, v, 0.1, 0.9)
	if !ok || math.Abs(r-8e-12) > 1e-18 {
		t.Errorf("rise %g s, want 8 ps", r)
	}
	if st.F(0) != 0 || st.F(5e-12) != 1 || st.F(0.5e-9) != 2 || st.R != 50 || st.Form != Thevenin {
		t.Errorf("step: F(0) %g, F(5 ps) %g, F(0.5 ns) %g, R %g, form %v", st.F(0), st.F(5e-12), st.F(0.5e-9), st.R, st.Form)
	}
	for _, bad := range [][4]float64{{1, 0, 50, 1e-9}, {1, 1e-12, 0, 1e-9}, {1, 1e-9, 50, 1e-9}, {math.NaN(), 1e-12, 50, 1e-9}} {
		if _, err := Step(bad[0], bad[1], bad[2], bad[3]); err == nil {
			t.Errorf("Step%v accepted", bad)
		}
	}
}
