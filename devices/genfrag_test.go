package devices

import (
	"fmt"
	"math"
	"testing"

	"zapnet/waveforms"
)

// generatorStrike builds a strike for waveform name (num, str as on the
// deck, through the waveform's table) between n and gnd, set to the
// stimulus at level, bound in a rig.
func generatorStrike(tb testing.TB, name string, level float64, num map[string]float64, str map[string]string, sign float64) (*Strike, *nlRig) {
	tb.Helper()
	st := generatorStimulus(tb, name, level, num, str)
	dev, err := newStrike("zap", [2]string{"n", "gnd"}, &st.Values)
	if err != nil {
		tb.Fatal(err)
	}
	d := dev.(*Strike)
	d.SetStimulus(st, sign)
	return d, newNLRig(tb, d, 0, Ground)
}

// generatorStimulus builds waveform name at level with the deck's values.
func generatorStimulus(tb testing.TB, name string, level float64, num map[string]float64, str map[string]string) *waveforms.Stimulus {
	tb.Helper()
	w := waveforms.Lookup(name)
	v := w.Values()
	for k, x := range num {
		if err := v.Set(k, x); err != nil {
			tb.Fatal(err)
		}
	}
	for k, x := range str {
		if err := v.SetWord(k, x); err != nil {
			tb.Fatal(err)
		}
	}
	v.FillDefaults()
	st, err := w.New(level, &v)
	if err != nil {
		tb.Fatal(err)
	}
	return st
}

var generatorCases = []struct {
	name  string
	level float64
	num   map[string]float64
	str   map[string]string
}{
	{"iec61000-4-2-network", 8000, nil, nil},
	{"iec61000-4-2-air", 8000, map[string]float64{"approach": 0.5}, nil},
	{"surge-cwg", 1000, nil, nil},
	{"surge-cwg", 1000, nil, map[string]string{"path": "io"}},
	{"surge-cwg", 1000, nil, map[string]string{"path": "line-line"}},
	{"eft", 2000, map[string]float64{"burst": 100e3}, nil},
}

// The strike's unknowns are its waveform's generator circuit: one per
// internal node, one per inductor and switch, one per spark.
func TestGeneratorLayout(t *testing.T) {
	for _, c := range generatorCases {
		d, _ := generatorStrike(t, c.name, c.level, c.num, c.str, 1)
		st := generatorStimulus(t, c.name, c.level, c.num, c.str)
		l := d.Layout()
		nb := 0
		for _, p := range st.Gen.Parts {
			switch p.Kind {
			case waveforms.PartInductor, waveforms.PartSwitch:
				nb++
				if p.Spark != nil {
					nb++
				}
			}
		}
		if len(l.Internal) != len(st.Gen.Nodes) || len(l.Branches) != nb {
			t.Errorf("%s %v: layout %v, want %d nodes and %d branches", c.name, c.str, l, len(st.Gen.Nodes), nb)
		}
	}
	// A strike without a generator waveform keeps the network's x and i.
	d := nlMust(t, nlElement("strike", "zap", "n", "gnd", nil, nil))
	if l := d.Layout(); len(l.Internal) != 1 || l.Internal[0] != "x" || len(l.Branches) != 1 || l.Branches[0] != "i" {
		t.Errorf("ideal-current strike layout %v, want x and i", l)
	}
}

// [definition of the Jacobian] Every generator circuit's stamps agree with
// central differences, at the operating point and in the transient, for
// both polarities; the spark's scaled conductance is put above 1, where
// a converged solution lives.
func TestGeneratorJacobian(t *testing.T) {
	for _, c := range generatorCases {
		for _, sign := range []float64{1, -1} {
			for _, dc := range []bool{true, false} {
				d, r := generatorStrike(t, c.name, c.level, c.num, c.str, sign)
				r.c.DC, r.c.T = dc, 2e-9
				x := nlRandom(r.n, 50, 11)
				for k := range d.frag.Parts {
					if sp := d.gen.sp[k]; sp >= 0 {
						x[sp] = 3.7
					}
				}
				r.checkJacobian(t, x, fmt.Sprintf("%s %v sign %g dc=%v", c.name, c.str, sign, dc))
			}
		}
	}
}

// ARCHITECTURE.md: a model never allocates in its stamp path.
func TestGeneratorEvalAllocatesNothing(t *testing.T) {
	for _, c := range generatorCases {
		_, r := generatorStrike(t, c.name, c.level, c.num, c.str, -1)
		copy(r.c.X, nlRandom(r.n, 10, 5))
		for _, dc := range []bool{true, false} {
			r.c.DC, r.c.Alpha, r.c.T = dc, 1e9, 1e-9
			if n := testing.AllocsPerRun(100, func() { r.d.Eval(&r.c) }); n != 0 {
				t.Errorf("%s (dc=%v): Eval allocates %g times per call", c.name, dc, n)
			}
		}
	}
}

// At the operating point every held node sits at s·V0 and the generator
// sends nothing into the node: the contact generator charged to 8 kV leaves
// an unloaded 20 Ω load at 0 V [the definition of the operating point: the
// relay is open].
func TestGeneratorOperatingPoint(t *testing.T) {
	for _, sign := range []float64{1, -1} {
		d, r := generatorStrike(t, "iec61000-4-2-network", 8000, nil, nil, sign)
		r.extra = func(c *Context) { c.Conductance(0, Ground, 1/20.0) }
		r.c.DC = true
		x := make([]float64, r.n)
		if _, err := r.newton(x, 20); err != nil {
			t.Fatal(err)
		}
		for k, n := range d.frag.Nodes {
			want := 0.0
			if n.Held {
				want = sign * n.V0
			}
			if got := x[d.gen.nodes[k]]; !nlClose(got, want, 1e-12, 1e-9) {
				t.Errorf("sign %g: node %s at %g V, want %g V", sign, n.Name, got, want)
			}
		}
		if x[0] != 0 {
			t.Errorf("sign %g: the struck node at %g V before the relay closes", sign, x[0])
		}
	}
}

// A source behind its resistor through a coupling capacitor into a load: a
// step of E from t = 0 gives i(t) = E/(R+RL)·e^(−t/((R+RL)·C)) [RC circuit,
// analytic]; the fragment's own source and capacitor, stamped generically,
// follow it with the engine's integration rule (two backward-Euler steps,
// then trapezoidal; the error is of the first steps, order h/τ).
func TestGeneratorSourceThroughCapacitor(t *testing.T) {
	const e, rs, cc, rl = 100.0, 50.0, 33e-9, 10.0
	frag := &waveforms.Fragment{
		Nodes: []waveforms.Node{{Name: "g"}},
		Parts: []waveforms.Part{
			{Kind: waveforms.PartSource, Name: "gen", A: 0, B: waveforms.Ref, Value: rs,
				F: func(tm float64) float64 { return map[bool]float64{true: e}[tm > 0] }},
			{Kind: waveforms.PartCapacitor, Name: "ccpl", A: 0, B: waveforms.Out, Value: cc},
		},
	}
	if err := frag.Check(); err != nil {
		t.Fatal(err)
	}
	d := &Strike{name: "zap", nodes: [2]string{"n", "gnd"}, gen: newGenNet(frag)}
	d.SetStimulus(&waveforms.Stimulus{Form: waveforms.Generator, Gen: frag}, 1)
	r := newNLRig(t, d, 0, Ground)
	r.extra = func(c *Context) { c.Conductance(0, Ground, 1/rl) }
	tau := (rs + rl) * cc
	h := tau / 1000
	worst := 0.0
	r.transient(t, h, 4000, func(tm float64, x []float64) {
		want := e / (rs + rl) * math.Exp(-tm/tau)
		worst = math.Max(worst, math.Abs(x[0]/rl-want)/(e/(rs+rl)))
	})
	if worst > 2e-3 {
		t.Errorf("worst relative current error %g", worst)
	}
}

// A stimulus whose circuit has another shape than the strike was built for
// is refused, by Fits and by SetStimulus.
func TestGeneratorShapeMismatch(t *testing.T) {
	d, _ := generatorStrike(t, "iec61000-4-2-network", 4000, nil, nil, 1)
	st := generatorStimulus(t, "surge-cwg", 1000, nil, nil)
	if d.Fits(st) == nil {
		t.Fatal("a combination-wave generator fits a strike built for the contact generator")
	}
	defer func() {
		if recover() == nil {
			t.Error("SetStimulus took a circuit of another shape")
		}
	}()
	d.SetStimulus(st, 1)
}
