package study

import (
	"testing"

	"zapnet/netlist"
)

// The work of a study: a line that is not lumped bounds every step by its
// delay, so a run takes at least the window over the delay [calc: 20 µs /
// 10 ps = 2 000 000]; under a surge whose rise is far longer the same line
// is lumped and bounds nothing; without a line a run takes the typical
// count.
func TestEstimateWork(t *testing.T) {
	deck := func(waveform string) string {
		return `strike s in gnd waveform=` + waveform + ` level=2k,4k polarity=both
window stop=20u
clamp D1 in gnd vbr=15 rdyn=0.2
line T1 in out z0=50 delay=10p
capacitor Cp out gnd 100p
resistor Rl out gnd 1k
`
	}
	for _, c := range []struct {
		waveform string
		steps    float64
		bounded  bool
	}{
		{"iec61000-4-2", 2e6, true},
		{"surge-8-20", TypicalSteps, false},
	} {
		cir, err := netlist.Parse("w.zap", []byte(deck(c.waveform)))
		if err != nil {
			t.Fatal(err)
		}
		w, err := EstimateWork(cir, nil)
		if err != nil {
			t.Fatal(err)
		}
		if w.Runs != 4 || w.Steps != c.steps || (w.Bound != "") != c.bounded || w.Total() != 4*c.steps {
			t.Errorf("%s: %+v, want 4 runs of %g steps", c.waveform, w, c.steps)
		}
	}
}
