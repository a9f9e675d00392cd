package devices

import (
	"math"
	"testing"

	"zapnet/waveforms"
)

// nlCase is one configured nonlinear model bound in a rig at a working
// point, for the allocation test and the benchmarks.
type nlCase struct {
	name string
	rig  func(tb testing.TB) *nlRig
}

func nlCases() []nlCase {
	plain := func(e testElement, terms ...int) func(tb testing.TB) *nlRig {
		return func(tb testing.TB) *nlRig {
			r := newNLRig(tb, nlMust(tb, e), terms...)
			r.c.Gmin, r.c.Alpha, r.c.T = 1e-12, 1e9, 1e-9
			copy(r.c.X, nlRandom(r.n, 0.5, 9))
			return r
		}
	}
	strike := func(st *waveforms.Stimulus) func(tb testing.TB) *nlRig {
		return func(tb testing.TB) *nlRig {
			d := nlMust(tb, nlElement("strike", "zap", "n", "gnd", nil, nil)).(*Strike)
			d.SetStimulus(st, -1)
			r := newNLRig(tb, d, 0, Ground)
			r.c.Alpha, r.c.T = 1e9, 1e-9
			return r
		}
	}
	line := func(tb testing.TB) *nlRig {
		d := nlMust(tb, nlElement("line", "TL1", "in", "out", map[string]float64{"z0": 50, "delay": 1e-9}, nil)).(*Line)
		r := newNLRig(tb, d, 0, 1)
		for k := range 300 {
			d.Accept(float64(k)*1e-11, []float64{math.Sin(float64(k)), 0.5, 0})
		}
		r.c.T = 3.1e-9
		return r
	}
	ramp := func(tm float64) float64 { return 1e9 * tm }
	return []nlCase{
		{"clamp", plain(nlElement("clamp", "D1", "a", "gnd", map[string]float64{"vbr": 6.8}, nil), 0, Ground)},
		{"clamp-full", plain(nlElement("clamp", "D1", "a", "gnd", map[string]float64{"vbr": 6.8, "rdyn": 0.3, "ls": 0.5e-9, "cj": 10e-12, "m": 0.4}, map[string]string{"polarity": "bi"}), 0, Ground)},
		{"diode", plain(nlElement("diode", "D2", "a", "gnd", map[string]float64{"vbr": 5, "rs": 1, "cj": 1e-12}, nil), 0, Ground)},
		{"pin", plain(nlElement("pin", "U1", "p", "gnd", map[string]float64{"cin": 5e-12}, map[string]string{"rail": "vdd"}), 0, Ground, 1)},
		{"pin-vbr", plain(nlElement("pin", "U1", "p", "gnd", map[string]float64{"cin": 5e-12, "vbr": 5.5, "rdyn": 1}, nil), 0, Ground)},
		{"bead", plain(nlElement("bead", "FB1", "a", "b", beadNum, nil), 0, 1)},
		{"bead-isat", plain(nlElement("bead", "FB1", "a", "b", map[string]float64{"rdc": 0.1, "rac": 500, "l": 1e-6, "c": 1e-12, "isat": 0.2}, nil), 0, 1)},
		{"line", line},
		{"strike-current", strike(&waveforms.Stimulus{Form: waveforms.Current, F: ramp})},
		{"strike-thevenin", strike(&waveforms.Stimulus{Form: waveforms.Thevenin, F: ramp, R: 50})},
		{"strike-network", strike(&waveforms.Stimulus{Form: waveforms.Network, C: 150e-12, V0: 8000, R: 330, L: 1e-6})},
	}
}

func TestEvalAllocatesNothing(t *testing.T) {
	// ARCHITECTURE.md: a model never allocates in its stamp path.
	for _, tc := range nlCases() {
		r := tc.rig(t)
		c := &r.c
		for _, dc := range []bool{true, false} {
			c.DC = dc
			if n := testing.AllocsPerRun(100, func() { r.d.Eval(c) }); n != 0 {
				t.Errorf("%s (dc=%v): Eval allocates %g times per call", tc.name, dc, n)
			}
		}
	}
}

func BenchmarkEval(b *testing.B) {
	for _, tc := range nlCases() {
		b.Run(tc.name, func(b *testing.B) {
			r := tc.rig(b)
			c := &r.c
			b.ReportAllocs()
			for b.Loop() {
				r.d.Eval(c)
			}
		})
	}
}
