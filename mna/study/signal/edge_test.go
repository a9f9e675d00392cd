package signal

import (
	"fmt"
	"math"
	"testing"
)

// [calc, CHECKS.md second round] A shunt C between matched Z0 ports: a
// step from the first reaches the second with a 10–90 % rise of
// ln 9·Z0·C/2 ≈ 1.1·Z0·C (0.3 pF on 50 Ω: 16.5 ps; 3 pF: 165 ps). The edge
// check must agree within 2 % of 1.1·Z0·C, and within 0.1 % of the exact
// ln 9·τ; the delay from the step's 50 % to the port's is ln 2·τ [calc].
func TestEdgeShuntCapacitor(t *testing.T) {
	for _, c := range []float64{0.3e-12, 3e-12} {
		deck := fmt.Sprintf(`strike esd in gnd waveform=iec61000-4-2 level=8k
capacitor C1 in gnd %g
port P1 in gnd
port P2 in gnd z0=50
`, c)
		cir := parse(t, deck)
		req, err := FromCircuit(cir)
		if err != nil {
			t.Fatal(err)
		}
		edges, err := Edges(cir, req, nil)
		if err != nil {
			t.Fatal(err)
		}
		if len(edges) != 1 {
			t.Fatalf("edges %+v", edges)
		}
		e := edges[0]
		tau := 50 * c / 2
		if e.From != "P1" || e.To != "P2" || e.Note != "" {
			t.Errorf("edge %+v", e)
		}
		t.Logf("%g F: rise %.6g s (ln 9·τ %.6g s, 1.1·Z0·C %.4g s), delay %.4g s", c, e.Rise, math.Log(9)*tau, 1.1*50*c, e.Delay)
		if d := math.Abs(e.Rise/(1.1*50*c) - 1); d > 0.02 {
			t.Errorf("%g F: rise %.4g s, 1.1·Z0·C %.4g s (%.2f %%)", c, e.Rise, 1.1*50*c, 100*d)
		}
		if d := math.Abs(e.Rise/(math.Log(9)*tau) - 1); d > 1e-3 {
			t.Errorf("%g F: rise %.6g s, ln 9·τ %.6g s", c, e.Rise, math.Log(9)*tau)
		}
		if d := math.Abs(e.Delay/(math.Ln2*tau) - 1); d > 1e-2 {
			t.Errorf("%g F: delay %.4g s, ln 2·τ %.4g s", c, e.Delay, math.Ln2*tau)
		}
	}
}

// A slow ramp through the same network [calc]: for a ramp of duration r
// into a single pole τ the response is (t − τ(1 − e^(−t/τ)))/r while the
// ramp lasts and 1 − (τ/r)(e^(r/τ) − 1)e^(−t/τ) after; its crossings are
// found here by bisection on those expressions. A rise= limit on the
// watched node below the result is exceeded.
func TestEdgeSlowRampAndLimit(t *testing.T) {
	const c, ramp = 3e-12, 200e-12
	tau := 50 * c / 2
	cir := parse(t, `strike esd in gnd waveform=iec61000-4-2 level=8k
capacitor C1 in gnd 3p
port P1 in gnd
port P2 in gnd
watch in rise=200p
`)
	req, err := FromCircuit(cir)
	if err != nil {
		t.Fatal(err)
	}
	edges, err := Edges(cir, req, &Options{StepRise: ramp, StepLevel: 2})
	if err != nil {
		t.Fatal(err)
	}
	y := func(x float64) float64 {
		if x <= ramp {
			return (x - tau*(1-math.Exp(-x/tau))) / ramp
		}
		return 1 - tau/ramp*(math.Exp(ramp/tau)-1)*math.Exp(-x/tau)
	}
	cross := func(level float64) float64 {
		lo, hi := 0.0, 100*tau+ramp
		for hi-lo > 1e-18 {
			if m := (lo + hi) / 2; y(m) < level {
				lo = m
			} else {
				hi = m
			}
		}
		return hi
	}
	want := cross(0.9) - cross(0.1)
	// The watch sits at P2's node: one edge, judged against the watch's
	// limit.
	if len(edges) != 1 {
		t.Fatalf("edges %+v", edges)
	}
	for _, e := range edges {
		if d := math.Abs(e.Rise/want - 1); d > 2e-3 {
			t.Errorf("%s → %s: rise %.6g s, closed form %.6g s", e.From, e.To, e.Rise, want)
		}
	}
	if w := edges[0]; w.To != "P2" || w.Limit != 200e-12 || !w.Exceeds {
		t.Errorf("limit: %+v", w)
	}
}
