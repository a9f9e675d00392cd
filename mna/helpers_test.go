package mna

import (
	"fmt"
	"math"
	"testing"

	"zapnet/devices"
	"zapnet/devices/spec"
	"zapnet/netlist"
	"zapnet/waveforms"
)

// testSourceKind is a stimulus-driven source for the engine's own tests,
// independent of the strike model: the Current form injects s·F(t) into its
// first node; the Thevenin form is s·F(t) behind R, in Norton form. It is off
// at the operating point.
const testSourceKind = "test-source"

type testSource struct {
	name  string
	nodes [2]string
	a, b  int
	st    *waveforms.Stimulus
	sign  float64
}

func init() {
	devices.Register(&devices.Kind{Kind: spec.Kind{
		Name: testSourceKind, Terminals: [2]string{"node", "ref"}, Role: spec.Stimulus, Order: 1000,
		Table: spec.Table{Params: []spec.Param{spec.Default("value", spec.Dimensionless, spec.Any, 0)}},
	}, New: func(name string, nodes [2]string, _ *spec.Values) (devices.Device, error) {
		return &testSource{name: name, nodes: nodes}, nil
	}})
}

// testStrikeKind is a strike built for a generator circuit of the test's
// own: the shape registered in testShapes under the name the element's
// "value" indexes.
const testStrikeKind = "test-strike"

var testShapes []*waveforms.Fragment

func init() {
	devices.Register(&devices.Kind{Kind: spec.Kind{
		Name: testStrikeKind, Terminals: [2]string{"node", "ref"}, Role: spec.Stimulus, Order: 1001,
		Table: spec.Table{Params: []spec.Param{spec.Default("value", spec.Dimensionless, spec.NonNegative, 0)}},
	}, New: func(name string, nodes [2]string, v *spec.Values) (devices.Device, error) {
		k := int(v.Num("value"))
		if k >= len(testShapes) {
			return nil, fmt.Errorf("no test shape %d", k)
		}
		return devices.NewStrikeFor(name, nodes, testShapes[k]), nil
	}})
}

// struck is a compiled system with the stimulus its test runs: the engine's
// tests set a circuit and its strike up together, then solve it.
type struck struct {
	*System
	st   *waveforms.Stimulus
	sign float64
}

// SetStimulus sets the strike of the following solutions.
func (s *struck) SetStimulus(st *waveforms.Stimulus, sign float64) { s.st, s.sign = st, sign }

// Transient solves with the stimulus set.
func (s *struck) Transient(set *Settings) (*Result, error) {
	return s.System.Transient(s.st, s.sign, set)
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

// el builds a checked element of the kind named kind; value is its
// positional value (ignored by kinds without one); kv are alternating
// parameter names and values, a string value for a word parameter. The
// values go through the kind's table as the deck checker's do.
func el(kind, name, a, b string, value float64, kv ...any) *netlist.Element {
	k := devices.Lookup(kind)
	e := &netlist.Element{Kind: k, Name: name, Nodes: [2]string{a, b}, Values: k.Values()}
	if k.Positional() != nil {
		must(e.Values.Set("value", value))
	}
	for i := 0; i+1 < len(kv); i += 2 {
		key := kv[i].(string)
		switch v := kv[i+1].(type) {
		case float64:
			must(e.Values.Set(key, v))
		case string:
			must(e.Values.SetWord(key, v))
		}
	}
	e.Values.FillDefaults()
	return e
}

func must(err error) {
	if err != nil {
		panic(err)
	}
}

// strikeEl is the deck's strike with the waveform name.
func strikeEl(name, a, b, waveform string) *netlist.Element {
	e := el("strike", name, a, b, 0)
	e.Waveform = waveforms.Lookup(waveform)
	e.Values = e.Waveform.Defaults()
	return e
}

// compileDeck parses deck text, named name in its messages, and compiles it.
func compileDeck(t testing.TB, name, deck string) *System {
	t.Helper()
	c, err := netlist.Parse(name, []byte(deck))
	if err != nil {
		t.Fatalf("deck: %v", err)
	}
	s, err := Compile(c)
	if err != nil {
		t.Fatalf("Compile: %v", err)
	}
	return s
}

func compile(t testing.TB, els ...*netlist.Element) *struck {
	t.Helper()
	s, err := Compile(&netlist.Circuit{Elements: els})
	if err != nil {
		t.Fatalf("Compile: %v", err)
	}
	return &struck{System: s, sign: 1}
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
func nodeIndex(t testing.TB, s *struck, name string) int {
	t.Helper()
	for i, n := range s.Nodes() {
		if n == name {
			return i
		}
	}
	t.Fatalf("no node %q in %v", name, s.Nodes())
	return -1
}

func elemIndex(t testing.TB, s *struck, name string) int {
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

// stimulus builds waveform name at level with the numbers num and the
// words str set as on a deck's strike line (through the waveform's
// table), the others at their defaults.
func stimulus(t testing.TB, name string, level float64, num map[string]float64, str map[string]string) *waveforms.Stimulus {
	t.Helper()
	w := waveforms.Lookup(name)
	v := w.Values()
	for k, x := range num {
		if err := v.Set(k, x); err != nil {
			t.Fatal(err)
		}
	}
	for k, x := range str {
		if err := v.SetWord(k, x); err != nil {
			t.Fatal(err)
		}
	}
	v.FillDefaults()
	st, err := w.New(level, &v)
	if err != nil {
		t.Fatal(err)
	}
	return st
}
