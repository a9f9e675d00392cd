package study

import (
	"math"
	"testing"

	"zapnet/mna"
	"zapnet/netlist"
)

// The study's default accuracy against a converged solution of the same
// equations [calc: self-convergence; the converged run takes RelTol 1e-7,
// ChargeTol 1e-19 C and a 0.2 ns step bound, where tightening further moves
// these values by less than 0.1 %]. The default window of demo-weak.zap is
// stretched to microseconds by its bead and capacitor, yet the pin's first
// overshoot comes in the strike's first nanosecond: the study's first step
// must resolve it (the engine bounds it by the stimulus's own span), or the
// peak is reported low, on the unsafe side.
func TestDefaultAccuracyOnTheFirstNanosecond(t *testing.T) {
	c := demo(t)
	for _, pol := range []string{"pos", "neg"} {
		got, err := solve(c, nil, 2000, pol, nil)
		if err != nil {
			t.Fatal(err)
		}
		ref, err := solve(c, nil, 2000, pol, &Options{
			Window:   netlist.Window{Resolve: 0.2e-9},
			Settings: &mna.Settings{RelTol: 1e-7, ChargeTol: 1e-19},
		})
		if err != nil {
			t.Fatal(err)
		}
		check := func(what string, g, r float64, tol float64) {
			t.Helper()
			if d := math.Abs(g-r) / math.Abs(r); d > tol {
				t.Errorf("%s %s: %.5g, converged %.5g (%.2f %% off, want within %.1f %%)", pol, what, g, r, 100*d, 100*tol)
			}
		}
		gp, rp := got.Pins()[0], ref.Pins()[0]
		check("pin peak", gp.Peak, rp.Peak, 0.02)
		check("pin low", gp.Min, rp.Min, 0.02)
		gn, rn := got.Nodes[1], ref.Nodes[1]
		if gn.Name != "n1" {
			t.Fatalf("second node %s, want n1 (the clamp node)", gn.Name)
		}
		check("clamp node highest", gn.Max, rn.Max, 0.02)
		check("clamp node lowest", gn.Min, rn.Min, 0.02)
	}
}

// The default accuracy on a deck with a transmission line, against a
// converged solution of the same equations [calc: self-convergence;
// signal-connector.zap at 8 kV pos with R1 = 0.1 Ω solved with window
// accuracy=0.0007 % (515 771 steps), which differs from accuracy=0.002 %
// by less than 3e-5 of each value below]. The line returns every wave
// to the clamp, whose lead inductance differentiates whatever error the
// wave carries: with the slack of the error control this run's pin peak
// current was 0.29 % off and the connector pin's dip 21 mV off. Each value
// is held to the default accuracy of its scale as mna.Settings.Accuracy
// states it: an extreme to the largest magnitude on its side of zero, at
// least mna.SideFloor of the largest on either side (the pin's dip to
// −0.42 V after +99 V, the difference of the clamp's 13 V and the
// connector inductance's −13.4 V, to 0.2 % of 4.94 V).
func TestDefaultAccuracyOnALineDeck(t *testing.T) {
	c, err := netlist.ParseFile("../../testdata/signal-connector.zap")
	if err != nil {
		t.Fatal(err)
	}
	r, err := solve(c, netlist.Variant{{Element: "R1", Param: "value", Num: 0.1, Text: "0.1"}}, 8000, "pos", nil)
	if err != nil {
		t.Fatal(err)
	}
	check := func(what string, got, want, scale float64) {
		t.Helper()
		d := math.Abs(got-want) / scale
		t.Logf("%-22s %.7g, converged %.7g: %.3f %% of %.4g", what, got, want, 100*d, scale)
		if d > mna.DefaultAccuracy {
			t.Errorf("%s: %.6g, converged %.6g: %.3f %% of %.4g off, want within %.1f %%",
				what, got, want, 100*d, scale, 100*mna.DefaultAccuracy)
		}
	}
	for _, cv := range []struct {
		name   string
		hi, lo float64
	}{{"pin1", 98.8687, -0.4185418}, {"c", 37.44431, -2.975134}} {
		name, hl := cv.name, [2]float64{cv.hi, cv.lo}
		n := node(t, r, name)
		floor := mna.SideFloor * math.Max(hl[0], -hl[1])
		check(name+" highest", n.Max, hl[0], math.Max(hl[0], floor))
		check(name+" lowest", n.Min, hl[1], math.Max(-hl[1], floor))
	}
	elem := func(name string) ElementResult {
		for _, e := range r.Elements {
			if e.Name == name {
				return e
			}
		}
		t.Fatalf("no element %s", name)
		return ElementResult{}
	}
	u2, d2 := elem("U2"), elem("D2")
	check("U2 peak current", u2.PeakCurrent, 1.075392, 1.075392)
	check("U2 internal path", r.Pins()[0].IPath, 1.070007, 1.070007)
	check("U2 energy", u2.Energy, 1.887952e-9, 1.887952e-9)
	check("D2 peak current", d2.PeakCurrent, 28.95633, 28.95633)
	check("D2 energy", d2.Energy, 1.379372e-5, 1.379372e-5)
}
