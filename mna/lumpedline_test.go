package mna

import (
	"fmt"
	"math"
	"testing"
)

// shortLineDeck is a surge into a clamp behind a short trace, a line of
// delay td, to a pin's capacitance and a load.
func shortLineDeck(td float64) string {
	return fmt.Sprintf(`strike s in gnd waveform=surge-8-20 level=50
clamp D1 in gnd vbr=15 rdyn=0.2
line T1 in out z0=50 delay=%g
capacitor Cp out gnd 100p
resistor Rl out gnd 1k
`, td)
}

// peaks solves the deck's strike with the stimulus's rise set to rise
// (0: unknown, so the line keeps its characteristic form) and returns
// the extremes of out and the clamp's energy, with the steps taken.
func peaks(t *testing.T, td, rise float64) (hi, energy float64, steps int, lumped bool) {
	t.Helper()
	s := compileDeck(t, "short.zap", shortLineDeck(td))
	st := stimulus(t, "surge-8-20", 50, nil, nil)
	st.Rise = rise
	res, err := s.Transient(st, 1, &Settings{Stop: 40e-6, Record: true})
	if err != nil {
		t.Fatal(err)
	}
	ss := &struck{System: s}
	for _, v := range res.V[nodeIndex(t, ss, "out")] {
		hi = math.Max(hi, v)
	}
	type lumper interface{ Lumped() bool }
	return hi, res.Energy[elemIndex(t, ss, "D1")], res.Stats.Steps, s.Device("T1").(lumper).Lumped()
}

// A line far shorter than the stimulus's rise is solved as its lumped π
// section with steps much longer than its delay, and agrees with the
// characteristic solution, whose steps its delay bounds, within 0.1 %
// [calc: the π section's error is of the order of (T/rise)², here 1e-8].
func TestShortLineLumped(t *testing.T) {
	const td = 2e-9 // short enough that the exact form is affordable here
	hiL, eL, stepsL, lumped := peaks(t, td, 5.12e-6)
	hiX, eX, stepsX, exact := peaks(t, td, 0)
	if !lumped || exact {
		t.Fatalf("lumped %v with the surge's rise, %v without a rise", lumped, exact)
	}
	if d := math.Abs(hiL-hiX) / hiX; d > 1e-3 {
		t.Errorf("peak at the far end %.6g V lumped, %.6g V exact: %.2g apart", hiL, hiX, d)
	}
	if d := math.Abs(eL-eX) / eX; d > 1e-3 {
		t.Errorf("clamp energy %.6g J lumped, %.6g J exact: %.2g apart", eL, eX, d)
	}
	if stepsL*10 > stepsX {
		t.Errorf("%d steps lumped against %d exact: the delay still bounds the step", stepsL, stepsX)
	}
	t.Logf("lumped %d steps, exact %d; peak %.6g / %.6g V; energy %.6g / %.6g J", stepsL, stepsX, hiL, hiX, eL, eX)
}

// BenchmarkSurgeIntoPicosecondLine is an 8/20 µs surge into a 1 ps line,
// which bounded the step to a picosecond (20 million steps) before short
// lines were lumped.
func BenchmarkSurgeIntoPicosecondLine(b *testing.B) {
	s := compileDeck(b, "short.zap", shortLineDeck(1e-12))
	st := stimulus(b, "surge-8-20", 50, nil, nil)
	set := &Settings{Stop: 40e-6}
	var steps int
	cpu0 := cpuTime()
	for b.Loop() {
		res, err := s.Transient(st, 1, set)
		if err != nil {
			b.Fatal(err)
		}
		steps = res.Stats.Steps
	}
	b.ReportMetric(float64(steps), "steps")
	b.ReportMetric(float64(cpuTime()-cpu0)/float64(b.N), "cpu-ns/op")
}
