package mna

import (
	"fmt"
	"math"
	"testing"

	"zapnet/waveforms"
)

// [calc, CHECKS.md second round] A shunt capacitor C between matched Z0
// ports, driven by a step from the first port: the node sees Z0/2, so it
// rises as 1 − e^(−t/τ) with τ = Z0·C/2, and its 10–90 % rise time is
// ln 9·τ ≈ 1.1·Z0·C (0.3 pF on 50 Ω: 16.5 ps; 3 pF: 165 ps). The edge is a
// transmission-line pulse (a trapezoid from 50 Ω, here with a 1 ps ramp and
// a flat top long after the node settles) and the second port a 50 Ω
// resistor. A finite ramp shifts both crossings by the same time once the
// 10 % crossing comes after the ramp's end, as it does for both values, so
// ln 9·τ stays exact; the transient engine must reproduce it within 2 % of
// 1.1·Z0·C and within 0.1 % of ln 9·τ (measured: 2.5e-5).
func TestEdgeRiseThroughShuntCapacitor(t *testing.T) {
	for _, c := range []float64{0.3e-12, 3e-12} {
		tau := 50 * c / 2
		deck := fmt.Sprintf("strike s in gnd waveform=tlp level=0.02 rise=1p width=%g\ncapacitor C1 in gnd %g\nresistor R2 in gnd 50\n", 60*tau, c)
		s := compileDeck(t, "edge.zap", deck)
		st := stimulus(t, "tlp", 0.02, map[string]float64{"rise": 1e-12, "width": 60 * tau}, nil)
		res, err := s.Transient(st, 1, &Settings{Stop: 30 * tau, MaxStep: tau / 50, RelTol: 1e-6, Record: true})
		if err != nil {
			t.Fatal(err)
		}
		v := res.V[nodeIndex(t, &struck{System: s}, "in")]
		// 10 % and 90 % of the settled value (0.02 A·50 Ω behind 50 Ω into
		// 50 Ω: 0.5 V), the node starting at 0.
		final := v[len(v)-1]
		t10, ok1 := waveforms.FirstCrossing(res.Time, v, 0.1*final)
		t90, ok2 := waveforms.FirstCrossing(res.Time, v, 0.9*final)
		if !ok1 || !ok2 || math.Abs(final-0.5) > 1e-6 {
			t.Fatalf("no rise: final %g V", final)
		}
		rise := t90 - t10
		if e := math.Abs(rise/(1.1*50*c) - 1); e > 0.02 {
			t.Errorf("%g F: 10–90 %% rise %.4g s, 1.1·Z0·C = %.4g s (%.2f %%)", c, rise, 1.1*50*c, 100*e)
		}
		t.Logf("%g F: rise %.6g s, ln 9·τ %.6g s", c, rise, math.Log(9)*tau)
		if e := math.Abs(rise/(math.Log(9)*tau) - 1); e > 1e-3 {
			t.Errorf("%g F: 10–90 %% rise %.6g s, ln 9·τ = %.6g s (%.3f %%)", c, rise, math.Log(9)*tau, 100*e)
		}
	}
}
