package mna

import (
	"math"
	"testing"

	"zapnet/waveforms"
)

// A load on a powered rail that a stimulus lifts and lowers in turn nets a
// small difference of what it takes above its rest and what it saves below
// it; Result.Gross is the energy moved either way, the scale that
// difference is accurate to. A supply V0 behind Rs feeds a load RL, and a
// current a·sin(ωt) enters their node: the node is V0·RL/(Rs+RL) plus
// Δ = A·sin(ωt), A = a·Rs·RL/(Rs+RL), and the load's power over its rest is
// (2·v0·Δ + Δ²)/RL. Over whole periods the net is A²·T/(2·RL) a period and
// the gross 4·v0·A·T/(π·RL) (|Δ| averages 2A/π, and Δ·|Δ| averages zero)
// [calc: the integrals of sin and sin² over a period].
func TestGrossOfALoadOnARail(t *testing.T) {
	const V0, Rs, RL, a = 5.0, 0.5, 50.0, 0.2
	const w = 2 * math.Pi * 1e8
	const periods = 4
	T := 2 * math.Pi / w
	s := compile(t,
		el("supply", "Vs", "n", "gnd", V0, "r", Rs),
		el("resistor", "RL", "n", "gnd", RL),
		el(testSourceKind, "src", "n", "gnd", 0))
	s.SetStimulus(sine(waveforms.Current, a, w, 0, periods*T), 1)
	res, err := s.Transient(&Settings{Resolve: T / 200})
	if err != nil {
		t.Fatal(err)
	}
	rth := Rs * RL / (Rs + RL)
	v0, A := V0*RL/(Rs+RL), a*rth
	k := elemIndex(t, s, "RL")
	net := res.Energy[k] - v0*v0/RL*res.Stop
	wantNet := periods * A * A * T / (2 * RL)
	wantGross := periods * 4 * v0 * A * T / (math.Pi * RL)
	t.Logf("net %.6g J (want %.6g), gross %.6g J (want %.6g)", net, wantNet, res.Gross[k], wantGross)
	if d := math.Abs(res.Gross[k]-wantGross) / wantGross; d > 1e-3 {
		t.Errorf("gross %.6g J, want %.6g J: %.2g %% off", res.Gross[k], wantGross, 100*d)
	}
	// The net is a hundredth of the gross here; the engine holds it to
	// its accuracy of the gross.
	if d := math.Abs(net-wantNet) / wantGross; d > DefaultAccuracy {
		t.Errorf("net %.6g J, want %.6g J: %.2g %% of the gross off", net, wantNet, 100*d)
	}
	// A resistor at rest only takes energy: its gross is its energy.
	s = compile(t,
		el("resistor", "RL", "n", "gnd", RL),
		el(testSourceKind, "src", "n", "gnd", 0))
	s.SetStimulus(sine(waveforms.Current, a, w, 0, periods*T), 1)
	res, err = s.Transient(&Settings{Resolve: T / 200})
	if err != nil {
		t.Fatal(err)
	}
	k = elemIndex(t, s, "RL")
	if d := math.Abs(res.Gross[k]-res.Energy[k]) / res.Energy[k]; d > 1e-12 {
		t.Errorf("resistor at rest: gross %.9g J, energy %.9g J", res.Gross[k], res.Energy[k])
	}
}
