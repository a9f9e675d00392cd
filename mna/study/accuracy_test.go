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
