package mna

import (
	"fmt"
	"testing"

	"zapnet/netlist"
)

// lines builds n protected lines of a connector (an invented design), each
// the same module: the connector pin's inductance, a bidirectional clamp
// to the line's ground return, a bead, a decoupling capacitor and the
// protected pin, both to the return; each return reaches the board's
// ground node gret through its own ground pin (an inductor), and gret
// reaches gnd through the shell's inductance. Line 0 is struck at 8 kV;
// the others end in 50 Ω at the cable. In a fan every line's ground pin
// goes to gret, the shared node of the connector; in a chain line k's goes
// to line k−1's return instead (a ladder of the same elements and the same
// unknowns).
func lines(t testing.TB, n int, fan bool) *struck {
	t.Helper()
	els := []*netlist.Element{strikeEl("zap", "in0", "gnd", "iec61000-4-2"),
		el("inductor", "Lshell", "gret", "gnd", 1e-9)}
	for k := 0; k < n; k++ {
		in, a, b, r := fmt.Sprintf("in%d", k), fmt.Sprintf("a%d", k), fmt.Sprintf("b%d", k), fmt.Sprintf("r%d", k)
		to := "gret"
		if !fan && k > 0 {
			to = fmt.Sprintf("r%d", k-1)
		}
		if k > 0 {
			els = append(els, el("resistor", fmt.Sprintf("Rc%d", k), in, "gnd", 50))
		}
		els = append(els,
			el("inductor", fmt.Sprintf("Lp%d", k), in, a, 1.5e-9),
			el("clamp", fmt.Sprintf("D%d", k), a, r, 0,
				"vbr", 6.8, "rdyn", 0.35, "cj", 8e-12, "ls", 0.4e-9, "polarity", "bi"),
			el("bead", fmt.Sprintf("FB%d", k), a, b, 0, "rdc", 0.15, "rac", 520.0, "l", 1.1e-6, "c", 1.3e-12),
			el("capacitor", fmt.Sprintf("C%d", k), b, r, 100e-9, "esr", 20e-3, "esl", 0.5e-9),
			el("pin", fmt.Sprintf("U%d", k), b, r, 0, "cin", 6e-12),
			el("inductor", fmt.Sprintf("Lg%d", k), r, to, 0.8e-9))
	}
	s := compile(t, els...)
	s.SetStimulus(stimulus(t, "iec61000-4-2", 8000, nil, nil), 1)
	return s
}

// BenchmarkLines measures the cost of a step and of a Newton iteration of
// a connector's lines branching from one node (fan) against the same
// lines chained (chain), for 8, 32 and 128 lines: with the ordering the
// fan should cost no more per step than the chain of the same size.
func BenchmarkLines(b *testing.B) {
	for _, n := range []int{8, 32, 128} {
		for _, fan := range []bool{true, false} {
			name := "chain"
			if fan {
				name = "fan"
			}
			b.Run(fmt.Sprintf("%s/N=%d", name, n), func(b *testing.B) {
				s := lines(b, n, fan)
				set := &Settings{Stop: 100e-9, Observe: func(*Point) {}}
				steps, newton := 0, 0
				b.ReportAllocs()
				cpu0 := cpuTime()
				for b.Loop() {
					res, err := s.Transient(set)
					if err != nil {
						b.Fatal(err)
					}
					steps += res.Stats.Steps
					newton += res.Stats.Newton
				}
				cpu := float64(cpuTime() - cpu0)
				b.ReportMetric(cpu/float64(steps), "cpu-ns/step")
				b.ReportMetric(cpu/float64(newton), "cpu-ns/newton")
				b.ReportMetric(float64(s.n), "unknowns")
				b.ReportMetric(float64(len(s.lu.fCol)), "factor-nnz")
			})
		}
	}
}

// The factors of lines branching from one node are as sparse as those of
// the same lines chained, and both grow linearly with the number of lines:
// the ordering eliminates each line before the node they share [calc:
// eliminating a leaf of a tree creates no fill].
func TestLinesFactorLinearly(t *testing.T) {
	nnz := map[bool][]int{}
	sizes := []int{8, 32, 128}
	for _, fan := range []bool{true, false} {
		for _, n := range sizes {
			s := lines(t, n, fan)
			if _, err := s.Transient(&Settings{Stop: 0.2e-9}); err != nil {
				t.Fatal(err)
			}
			nnz[fan] = append(nnz[fan], len(s.lu.fCol))
		}
	}
	for k, n := range sizes {
		f, c := nnz[true][k], nnz[false][k]
		t.Logf("%d lines: factors hold %d entries as a fan, %d as a chain", n, f, c)
		if float64(f) > 1.05*float64(c) {
			t.Errorf("%d lines: the fan's factors hold %d entries, the chain's %d", n, f, c)
		}
		if k > 0 {
			if g := float64(f) / float64(nnz[true][k-1]); g > 1.05*float64(n)/float64(sizes[k-1]) {
				t.Errorf("%d lines: the fan's factors grew %.2f× from %d lines", n, g, sizes[k-1])
			}
		}
	}
}
