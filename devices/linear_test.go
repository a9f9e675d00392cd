package devices

import (
	"math"
	"strings"
	"testing"
)

func linearElement(kind string, value float64, kv ...float64) testElement {
	e := nlElement(kind, "X1", "a", "b", map[string]float64{"value": value}, nil)
	keys := map[string][]string{
		"capacitor": {"esr", "esl"},
		"inductor":  {"r"},
		"supply":    {"r"},
	}[kind]
	for i, v := range kv {
		e.num[keys[i]] = v
	}
	return e
}

// The series chains of MODELS.md add an unknown only for a parasitic that is
// present, and their Jacobians (static and charge parts) agree with finite
// differences [the definition of the derivative].
func TestLinearLayoutsAndJacobians(t *testing.T) {
	for _, c := range []struct {
		name               string
		e                  testElement
		internal, branches int
		states             int
	}{
		{"resistor", linearElement("resistor", 47), 0, 0, 0},
		{"capacitor", linearElement("capacitor", 1e-9), 0, 0, 1},
		{"capacitor esr", linearElement("capacitor", 1e-9, 0.02), 1, 0, 1},
		{"capacitor esl", linearElement("capacitor", 1e-9, 0, 0.5e-9), 1, 1, 2},
		{"capacitor esr esl", linearElement("capacitor", 1e-9, 0.02, 0.5e-9), 2, 1, 2},
		{"inductor", linearElement("inductor", 1e-6), 0, 1, 1},
		{"inductor r", linearElement("inductor", 1e-6, 0.3), 1, 1, 1},
		{"supply", linearElement("supply", 3.3), 0, 1, 0},
		{"supply r", linearElement("supply", 3.3, 50), 0, 0, 0},
	} {
		d, err := build(c.e)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		l := d.Layout()
		if len(l.Terminals) != 2 || l.Terminals[0] != "a" || l.Terminals[1] != "b" {
			t.Errorf("%s: terminals %v, want [a b]", c.name, l.Terminals)
		}
		if len(l.Internal) != c.internal || len(l.Branches) != c.branches {
			t.Errorf("%s: %d internal nodes and %d branches, want %d and %d", c.name, len(l.Internal), len(l.Branches), c.internal, c.branches)
		}
		for _, terms := range [][]int{{0, 1}, {0, Ground}} {
			r := newNLRig(t, d, terms...)
			if len(r.rows) != c.states {
				t.Errorf("%s: %d states, want %d", c.name, len(r.rows), c.states)
			}
			r.c.SourceScale = 1
			x := make([]float64, r.n)
			for i := range x {
				x[i] = 0.3 + 0.7*float64(i)
			}
			r.checkJacobian(t, x, c.name)
		}
	}
}

// [calc] Static currents: a resistor carries (va − vb)/R; a supply with
// r > 0 carries (va − vb − s·V)/r from a to b, s the source scale; an ideal
// supply's branch equation is va − vb − s·V; a capacitor's charge is C·(vl − vb)
// and an inductor's flux L·i.
func TestLinearStaticValues(t *testing.T) {
	eval := func(e testElement, x []float64, scale float64) *nlRig {
		d, err := build(e)
		if err != nil {
			t.Fatal(err)
		}
		r := newNLRig(t, d, 0, 1)
		r.c.SourceScale = scale
		r.eval(x, 0)
		return r
	}
	near := func(what string, got, want float64) {
		if math.Abs(got-want) > 1e-12*math.Max(1, math.Abs(want)) {
			t.Errorf("%s = %.12g, want %.12g", what, got, want)
		}
	}
	r := eval(linearElement("resistor", 50), []float64{5, 2}, 1)
	near("resistor F[a]", r.c.F[0], 3.0/50)
	near("resistor F[b]", r.c.F[1], -3.0/50)

	r = eval(linearElement("supply", 3.3, 50), []float64{5, 1}, 0.5)
	near("supply r F[a]", r.c.F[0], (5-1-0.5*3.3)/50)

	r = eval(linearElement("supply", 3.3), []float64{5, 1, 0.25}, 1)
	near("supply branch row", r.c.F[2], 5-1-3.3)
	near("supply F[a]", r.c.F[0], 0.25)
	near("supply F[b]", r.c.F[1], -0.25)

	r = eval(linearElement("capacitor", 2e-9), []float64{5, 1}, 1)
	near("capacitor charge", r.c.Q[0], 2e-9*4)

	r = eval(linearElement("inductor", 3e-6), []float64{5, 1, 0.5}, 1)
	near("inductor flux", r.c.Q[0], 3e-6*0.5)
	near("inductor branch row", r.c.F[2], 4)
}

// Values the models cannot use are errors that name the element.
func TestLinearBadValues(t *testing.T) {
	for _, e := range []testElement{
		linearElement("resistor", 0),
		linearElement("resistor", -5),
		linearElement("capacitor", 0),
		linearElement("capacitor", 1e-9, -1),
		linearElement("capacitor", 1e-9, 0, -1e-9),
		linearElement("inductor", math.Inf(1)),
		linearElement("inductor", 1e-9, -2),
		linearElement("supply", math.NaN()),
		linearElement("supply", 5, -1),
	} {
		if _, err := build(e); err == nil || !strings.Contains(err.Error(), "X1") {
			t.Errorf("%s %v: got %v, want an error naming X1", e.kind, e.num, err)
		}
	}
}
