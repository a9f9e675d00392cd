package mna

import "testing"

// The small-signal sweep of reference network A (two lines, a clamp with
// ls and rdyn, a pin, a pull-up; 16 unknowns) over 10 kHz–6 GHz at 20
// points a decade with both ports terminated: one complex factorisation
// and solve a frequency.
func BenchmarkACSweep(b *testing.B) {
	a := referenceAC(b, "ac-a.zap", nil)
	freq := LogFrequencies(10e3, 6e9, 20)
	loads := []Port{{Name: "P1", Pair: Pair{Node: "conn"}, Z0: 50}, {Name: "P2", Pair: Pair{Node: "p"}, Z0: 50}}
	outs := []Pair{{Node: "a"}, {Node: "p"}}
	h := make([]complex128, len(outs))
	b.ReportAllocs()
	for b.Loop() {
		for _, f := range freq {
			if _, err := a.Response(f, Pair{Node: "conn"}, loads, outs, h); err != nil {
				b.Fatal(err)
			}
		}
	}
}

// Linearising network A: the operating point and the two evaluations of
// every device.
func BenchmarkLinearize(b *testing.B) {
	for b.Loop() {
		referenceAC(b, "ac-a.zap", nil)
	}
}
