package mna

import (
	"fmt"
	"math"
	"sync"
	"testing"

	"zapnet/devices"
	"zapnet/netlist"
	"zapnet/waveforms"
)

// testSourceKind is a stimulus-driven source for the engine's own tests,
// independent of the strike model: the Current form injects s·F(t) into its
// first node; the Thevenin form is s·F(t) behind R, in Norton form. It is off
// at the operating point.
const testSourceKind netlist.Kind = "test-source"

type testSource struct {
	name  string
	nodes [2]string
	a, b  int
	st    *waveforms.Stimulus
	sign  float64
}

// testStrikeKind is a strike built for a generator circuit of the test's
// own (testShapes, by the element's word "shape").
const testStrikeKind netlist.Kind = "test-strike"

var testShapes sync.Map // name → *waveforms.Fragment

func init() {
	devices.Register(testSourceKind, func(e *netlist.Element) (devices.Device, error) {
		return &testSource{name: e.Name, nodes: e.Nodes}, nil
	})
	devices.Register(testStrikeKind, func(e *netlist.Element) (devices.Device, error) {
		f, ok := testShapes.Load(e.Str["shape"])
		if !ok {
			return nil, fmt.Errorf("%s: no test shape %q", e.Name, e.Str["shape"])
		}
		return devices.NewStrikeFor(e.Name, e.Nodes, f.(*waveforms.Fragment)), nil
	})
}

func (d *testSource) Name() string { return d.name }
func (d *testSource) Layout() devices.Layout {
	return devices.Layout{Terminals: d.nodes[:]}
}
func (d *testSource) Bind(n devices.Nodes) []devices.StateRows {
	d.a, d.b = n.Terminals[0], n.Terminals[1]
	return nil
}
func (d *testSource) SetStimulus(st *waveforms.Stimulus, sign float64) { d.st, d.sign = st, sign }
func (d *testSource) Eval(c *devices.Context) {
	if d.st == nil {
		return
	}
	f := 0.0
	if !c.DC {
		f = d.sign * d.st.F(c.T)
	}
	switch d.st.Form {
	case waveforms.Current:
		c.Inject(d.a, d.b, f)
	case waveforms.Thevenin:
		c.Conductance(d.a, d.b, 1/d.st.R)
		c.Inject(d.a, d.b, f/d.st.R)
	}
}

// el builds a checked element; kv are alternating parameter names and values.
func el(kind netlist.Kind, name, a, b string, value float64, kv ...any) *netlist.Element {
	e := &netlist.Element{Kind: kind, Name: name, Nodes: [2]string{a, b},
		Num: map[string]float64{"value": value}, Str: map[string]string{}}
	for i := 0; i+1 < len(kv); i += 2 {
		e.Num[kv[i].(string)] = kv[i+1].(float64)
	}
	return e
}

func compile(t testing.TB, els ...*netlist.Element) *System {
	t.Helper()
	s, err := Compile(&netlist.Circuit{Elements: els})
	if err != nil {
		t.Fatalf("Compile: %v", err)
	}
	return s
}

// step is a stimulus of constant value for t > 0.
func step(form waveforms.Form, v, r, stop float64) *waveforms.Stimulus {
	return &waveforms.Stimulus{Name: "test-step", Form: form, R: r, Stop: stop,
		F: func(t float64) float64 {
			if t <= 0 {
				return 0
			}
			return v
		}}
}

// sine is a stimulus a·sin(ωt) for t > 0: smooth after its start.
func sine(form waveforms.Form, a, w, r, stop float64) *waveforms.Stimulus {
	return &waveforms.Stimulus{Name: "test-sine", Form: form, R: r, Stop: stop,
		F: func(t float64) float64 {
			if t <= 0 {
				return 0
			}
			return a * math.Sin(w*t)
		}}
}

// nodeIndex is the result index of a node name.
func nodeIndex(t testing.TB, s *System, name string) int {
	t.Helper()
	for i, n := range s.Nodes() {
		if n == name {
			return i
		}
	}
	t.Fatalf("no node %q in %v", name, s.Nodes())
	return -1
}

func elemIndex(t testing.TB, s *System, name string) int {
	t.Helper()
	for i, n := range s.Elements() {
		if n == name {
			return i
		}
	}
	t.Fatalf("no element %q in %v", name, s.Elements())
	return -1
}

// maxErr is the largest |v(t_k) − want(t_k)| over the recorded points.
func maxErr(time, v []float64, want func(float64) float64) float64 {
	e := 0.0
	for k, t := range time {
		e = math.Max(e, math.Abs(v[k]-want(t)))
	}
	return e
}
