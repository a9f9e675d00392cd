package study

import (
	"math"
	"path/filepath"
	"testing"

	"zapnet/mna"
	"zapnet/netlist"
	"zapnet/waveforms"
)

// burstDeck is a 100 kHz EFT burst into a unidirectional clamp whose line
// leaks to ground through 1 kΩ (an invented network): a negative burst's
// pulses bring the clamp more and more energy as the coupling capacitor's
// charge builds up, then repeat.
const burstDeck = `title "EFT burst into a clamp"
strike zap line gnd waveform=eft level=2k burst=100k polarity=neg
clamp D1 line gnd vbr=33V rdyn=0.5ohm cj=100p emax=10mJ
resistor Rleak line gnd 1k
`

// A burst run reports each clamp's energy over the burst and the minute:
// the ledger's energy of the whole burst, its average over the burst's
// 0.75 ms, 200 bursts in a minute (one every 300 ms [pub: IEC 61000-4-4])
// and that energy over 60 s [calc]; the burst's energy agrees within 1 %
// with every pulse solved, and the extrapolated pulses are said.
func TestBurstRun(t *testing.T) {
	c := parse(t, burstDeck)
	r := mustSolve(t, c, nil, 2000, "neg")
	bu := r.Burst
	if bu == nil || len(bu.Elements) != 1 || bu.Pulses != 75 || bu.PerMinute != 200 {
		t.Fatalf("burst report %+v", bu)
	}
	e := bu.Elements[0]
	var ledger float64
	for _, x := range r.Ledger.Entries {
		if x.Name == "D1" {
			ledger = x.Energy
		}
	}
	if e.Energy != ledger || math.Abs(e.Power-ledger/0.75e-3) > 1e-9*e.Power ||
		math.Abs(e.MinuteEnergy-200*ledger) > 1e-9*e.MinuteEnergy || math.Abs(e.MinutePower-200*ledger/60) > 1e-9*e.MinutePower {
		t.Errorf("D1: %+v against the ledger's %g J", e, ledger)
	}
	if !(e.LargestPulse > 1.2*e.FirstPulse) || !(e.Energy < 75*e.LargestPulse) {
		t.Errorf("D1: pulses %g J first, %g J largest, %g J in all: no accumulation", e.FirstPulse, e.LargestPulse, e.Energy)
	}
	if !bu.Extrapolated || bu.Solved >= 75 {
		t.Errorf("burst solved %d pulses (extrapolated %v)", bu.Solved, bu.Extrapolated)
	}

	b, err := NewBench(c, nil)
	if err != nil {
		t.Fatal(err)
	}
	st, err := waveforms.Lookup("eft").New(2000, &c.Strike().Values)
	if err != nil {
		t.Fatal(err)
	}
	all, err := b.sys.SolveBurst(st, -1, &mna.Settings{}, &mna.BurstOptions{Every: true})
	if err != nil {
		t.Fatal(err)
	}
	d1 := -1
	for k, n := range b.sys.Elements() {
		if n == "D1" {
			d1 = k
		}
	}
	if d := math.Abs(e.Energy/all.Energy[d1] - 1); d > 0.01 {
		t.Errorf("burst energy %g J, every pulse solved %g J (%.2g %%)", e.Energy, all.Energy[d1], 100*d)
	}
}

// The surge deck runs the combination wave through its line-to-earth path
// into a 12 V input (testdata/dc-input-surge.zap, invented): the coupling
// capacitor starts at the line's DC level (the operating point), so the
// clamp's node starts at the supply's divider, 12 V·120/120.5 [calc]; at
// 1 kV the clamp takes a good part of 1 kV / 12 Ω ≈ 83 A [calc: the path
// into a short], less for its own 16.5 V and the supply's share.
func TestSurgeThroughCouplingPath(t *testing.T) {
	c, err := netlist.ParseFile(filepath.Join("..", "..", "testdata", "dc-input-surge.zap"))
	if err != nil {
		t.Fatal(err)
	}
	r := mustSolve(t, c, nil, 1000, "pos")
	if v := node(t, r, "vin").Initial; math.Abs(v-12*120/120.5) > 0.01 {
		t.Errorf("vin starts at %.4g V, want the divider's %.4g V", v, 12*120/120.5)
	}
	for _, e := range r.Elements {
		if e.Name == "D3" && !(e.PeakCurrent > 40 && e.PeakCurrent < 1000/12.0) {
			t.Errorf("clamp peak %.4g A, want between 40 A and 1 kV/12 Ω", e.PeakCurrent)
		}
	}
}
