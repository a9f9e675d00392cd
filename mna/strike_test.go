package mna

import (
	"math"
	"testing"

	"zapnet/waveforms"
)

// hbmIntoShort runs a human-body-model strike of level volts into a 1 Ω
// load (a short for a 1.5 kΩ network) and returns the load current.
func hbmIntoShort(t *testing.T, level float64, num map[string]float64) (*struck, *Result) {
	t.Helper()
	st := stimulus(t, "hbm", level, num, nil)
	s := compile(t,
		el("strike", "zap", "p", "gnd", 0),
		el("resistor", "Rload", "p", "gnd", 1.0))
	s.SetStimulus(st, 1)
	res, err := s.Transient(&Settings{Stop: 1e-6, MaxStep: 2e-9, Record: true})
	if err != nil {
		t.Fatal(err)
	}
	return s, res
}

// [calc] The ideal HBM network (100 pF at V through 1.5 kΩ, no inductance)
// into a load R: i(t) = V/(1500+R)·e^{−t/τ}, τ = (1500+R)·100 pF; the load
// takes ½·C·V²·R/(1500+R) of the stored energy, and the strike's ledger
// entry is minus what it delivered to the node.
func TestNetworkStrikeIdealRC(t *testing.T) {
	const V, C, R, Rl = 2000.0, 100e-12, 1500.0, 1.0
	s, res := hbmIntoShort(t, V, map[string]float64{"l": 0})
	tau := (R + Rl) * C
	load := elemIndex(t, s, "Rload")
	want := func(t float64) float64 {
		if t <= 0 {
			return 0
		}
		return V / (R + Rl) * math.Exp(-t/tau)
	}
	// Skip t = 0 (the switch closes) and compare after it.
	e := 0.0
	for k, tk := range res.Time {
		if tk > 0 {
			e = math.Max(e, math.Abs(res.I[load][k]-want(tk)))
		}
	}
	if e > 5e-3*V/(R+Rl) {
		t.Errorf("load current: max error %.3g A against %.3g A peak", e, V/(R+Rl))
	}
	eLoad := 0.5 * C * V * V * Rl / (R + Rl) * (1 - math.Exp(-2*1e-6/tau))
	if d := math.Abs(res.Energy[load]/eLoad - 1); d > 1e-2 {
		t.Errorf("load energy %.4g J, want %.4g J", res.Energy[load], eLoad)
	}
	if d := math.Abs(res.Balance / eLoad); d > 1e-3 {
		t.Errorf("balance %.3g J against %.3g J in the load", res.Balance, eLoad)
	}
}

// [pub: CHECKS.md, JS-001 into a short] With its series inductance the HBM
// current peaks at 0.67 A/kV ±10 %, rises (10–90 %) in 2–10 ns and decays
// (to 36.8 % of the peak) in 130–170 ns.
func TestNetworkStrikeHBMWaveform(t *testing.T) {
	const V = 2000.0
	s, res := hbmIntoShort(t, V, nil)
	i := res.I[elemIndex(t, s, "Rload")]
	peak, kp := 0.0, 0
	for k, v := range i {
		if v > peak {
			peak, kp = v, k
		}
	}
	if d := math.Abs(peak/(0.67*V/1000) - 1); d > 0.10 {
		t.Errorf("peak %.4g A, want 0.67 A/kV × %g kV ±10 %%", peak, V/1000)
	}
	cross := func(level float64, from, dir int) float64 {
		for k := from; k > 0 && k < len(i); k += dir {
			if (i[k]-level)*(i[k-dir]-level) <= 0 {
				return interpTime(res.Time[k-dir], res.Time[k], i[k-dir], i[k], level)
			}
		}
		return math.NaN()
	}
	rise := cross(0.9*peak, 1, 1) - cross(0.1*peak, 1, 1)
	if !(rise >= 2e-9 && rise <= 10e-9) {
		t.Errorf("rise time %.3g s, want 2–10 ns", rise)
	}
	decay := cross(peak/math.E, kp+1, 1) - res.Time[kp]
	t.Logf("peak %.4f A, rise %.3g s, decay %.4g s", peak, rise, decay)
	if !(decay >= 130e-9 && decay <= 170e-9) {
		t.Errorf("decay time %.3g s, want 130–170 ns", decay)
	}
}

// interpTime is where the line through (t0, v0) and (t1, v1) reaches level.
func interpTime(t0, t1, v0, v1, level float64) float64 {
	if v1 == v0 {
		return t1
	}
	return t0 + (t1-t0)*(level-v0)/(v1-v0)
}

// Every standard stimulus, at two levels and both polarities, solves on the
// reference network over its default span, and the energy ledger balances
// (the entries sum to the Newton residual, not to the integration error,
// since every entry uses the same terminal currents) to 1e-6 of what the
// strike delivered [calc: Tellegen's theorem, Σ v·i = 0 at every instant].
func TestEveryStimulusSolves(t *testing.T) {
	levels := map[string][]float64{"surge-8-20": {250, 1000}, "tlp": {4, 16}}
	for _, name := range waveforms.Names() {
		if name == "pwl" { // needs a file; its engine path is the Current form
			continue
		}
		s := referenceNetworkFor(t, name)
		zap := elemIndex(t, s, "zap")
		lv, ok := levels[name]
		if !ok {
			lv = []float64{2000, 8000}
		}
		for _, level := range lv {
			st, err := waveforms.Lookup(name).New(level, nil)
			if err != nil {
				t.Fatal(err)
			}
			for _, sign := range []float64{1, -1} {
				s.SetStimulus(st, sign)
				res, err := s.Transient(nil)
				if err != nil {
					t.Errorf("%s %g %+g: %v", name, level, sign, err)
					continue
				}
				if res.Stop != st.Stop {
					t.Errorf("%s: span %g s, want the stimulus's %g s", name, res.Stop, st.Stop)
				}
				if b := math.Abs(res.Balance / res.Energy[zap]); !(b < 1e-6) {
					t.Errorf("%s %g %+g: balance %.3g of the strike's energy", name, level, sign, b)
				}
			}
		}
	}
}
