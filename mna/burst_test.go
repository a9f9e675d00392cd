package mna

import (
	"math"
	"testing"

	"zapnet/waveforms"
)

// burstBench is an EFT burst into a unidirectional clamp with a slow
// discharge path (an invented network). A negative pulse charges the
// coupling capacitor through the clamp's forward path; after the pulse the
// capacitor drives the line positive, the clamp breaks down and takes what
// is above its breakdown, and the rest leaks away through 1 kΩ with a time
// constant of 35 µs, several periods of a 100 kHz burst: the clamp's share
// of each pulse grows over the first pulses, then repeats. A positive
// pulse's charge drains through the clamp's forward path at once, so its
// pulses repeat from the start.
func burstBench(t testing.TB, rate float64) (*struck, *waveforms.Stimulus) {
	t.Helper()
	strike := strikeEl("zap", "line", "gnd", "eft")
	must(strike.Values.Set("burst", rate))
	s := compile(t, strike,
		el("clamp", "D1", "line", "gnd", 0, "vbr", 33.0, "rdyn", 0.5, "cj", 100e-12),
		el("resistor", "Rleak", "line", "gnd", 1000.0))
	return s, stimulus(t, "eft", 2000, map[string]float64{"burst": rate}, nil)
}

// A burst solved to its settled pulses and extrapolated brings the same
// clamp energy as every pulse solved, within 1 % [the requirement; the
// bound of SolveBurst's test is 0.2 %], for both polarities, and solves
// fewer pulses; the per-pulse energies add up to the run's ledger. The
// negative burst does accumulate: its last pulse brings the clamp over
// 20 % more than its first [calc: the mechanism above], so the
// extrapolation is tested on pulses that change.
func TestBurstExtrapolation(t *testing.T) {
	s, st := burstBench(t, 100e3)
	d1 := elemIndex(t, s, "D1")
	for _, sign := range []float64{1, -1} {
		set := &Settings{RelTol: 1e-5, MaxStep: 2e-6}
		fast, err := s.SolveBurst(st, sign, set, nil)
		if err != nil {
			t.Fatal(err)
		}
		all, err := s.SolveBurst(st, sign, set, &BurstOptions{Every: true})
		if err != nil {
			t.Fatal(err)
		}
		first, last := all.PulseEnergy[0][d1], all.PulseEnergy[74][d1]
		t.Logf("sign %+g: %d of %d pulses solved (%d steps, every pulse %d); clamp %.6g J extrapolated, %.6g J solved; pulse %.4g J first, %.4g J last",
			sign, fast.Solved, fast.Pulses, fast.Stats.Steps, all.Stats.Steps, fast.Energy[d1], all.Energy[d1], first, last)
		if !fast.Extrapolated || fast.Solved >= all.Solved || all.Solved != 75 || all.Extrapolated {
			t.Errorf("sign %+g: solved %d pulses (extrapolated %v) against %d", sign, fast.Solved, fast.Extrapolated, all.Solved)
		}
		if d := math.Abs(fast.Energy[d1]/all.Energy[d1] - 1); d > 0.01 {
			t.Errorf("sign %+g: extrapolated clamp energy off by %.3g %%", sign, 100*d)
		}
		if sign < 0 && !(last > 1.2*first) {
			t.Errorf("negative burst: pulse energy %.4g J first, %.4g J last: the bench does not accumulate", first, last)
		}
		sum := 0.0
		for _, p := range all.PulseEnergy {
			sum += p[d1]
		}
		if math.Abs(sum/all.Energy[d1]-1) > 1e-12 {
			t.Errorf("pulse energies sum to %g J, burst %g J", sum, all.Energy[d1])
		}
	}
}

// A train's pulses are resolved without a step bound from the caller: the
// first step after each pulse's breakpoint follows one pulse's span
// (Stimulus.Scale), not the whole train's. With the study's tolerance and
// no MaxStep the clamp energy of a 5 kHz burst, and of a ten-pulse eft
// train, agrees within 1 % with a converged solution (RelTol 1e-6, steps
// under 1 µs) [calc: convergence]; before, the 15 ms span's first step of
// 0.2 µs stepped over the 50 ns pulses and the clamp took 0.4 % of it.
func TestTrainResolvedByDefault(t *testing.T) {
	s, burst := burstBench(t, 5e3)
	train := stimulus(t, "eft", 2000, map[string]float64{"count": 10, "rate": 5e3}, nil)
	d1 := elemIndex(t, s, "D1")
	for _, st := range []*waveforms.Stimulus{burst, train} {
		var e [2]float64
		for k, set := range []*Settings{{RelTol: 1e-4}, {RelTol: 1e-6, MaxStep: 1e-6}} {
			s.SetStimulus(st, -1)
			res, err := s.Transient(set)
			if err != nil {
				t.Fatal(err)
			}
			e[k] = res.Energy[d1]
		}
		if d := math.Abs(e[0]/e[1] - 1); d > 0.01 {
			t.Errorf("%s (%d pulses): clamp energy %.5g J by default, %.5g J converged", st.Name, len(st.Breakpoints), e[0], e[1])
		}
	}
}

// BenchmarkBurst measures a 100 kHz burst on the accumulating bench,
// extrapolated from its settled pulses against every pulse solved.
func BenchmarkBurst(b *testing.B) {
	s, st := burstBench(b, 100e3)
	for _, c := range []struct {
		name string
		opt  *BurstOptions
	}{{"extrapolated", nil}, {"every-pulse", &BurstOptions{Every: true}}} {
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				if _, err := s.SolveBurst(st, -1, &Settings{RelTol: 1e-4}, c.opt); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
