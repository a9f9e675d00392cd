package devices

import (
	"fmt"

	"zapnet/devices/spec"
	"zapnet/waveforms"
)

// Strike is the discharge between node and ref. Its stimulus and sign s
// (+1 pos, −1 neg) are set per run with SetStimulus; the layout is fixed at
// Bind so that one compiled system runs every level. It owns the unknowns of
// its waveform's generator circuit (waveforms.GeneratorShape: for most
// waveforms the charged network's internal node x and branch current i);
// forms that do not use them tie each node to gnd through 1 S and force
// each branch current to 0, which keeps the matrix regular and costs
// nothing.
//
//	Current:  s·F(t) A injected into node, drawn from ref, in the transient;
//	          nothing at the operating point (F(t) = 0 for t ≤ 0).
//	Thevenin: 1/R between node and ref at all times (the generator stays
//	          connected) and the Norton current s·F(t)/R in the transient.
//	Network:  a capacitor C from x to ref (state 0) and a series R–L branch
//	          from x to node carrying i, with branch equation
//	          v(x) − v(node) − R·i − dλ/dt = 0, λ = L·i (state 1).
//	          At the operating point the switch is open: i = 0 and x is held
//	          at s·V0 by 1 S from a source of s·V0 A, so the capacitor's charge
//	          s·C·V0 enters the transient as its initial state.
//	Generator (and Network, which is the same circuit): the stimulus's
//	          circuit fragment, stamped by genNet (genfrag.go).
//
// A nil stimulus switches the strike off: the device stamps only the trivial
// rows of x and i.
type Strike struct {
	name  string
	nodes [2]string
	st    *waveforms.Stimulus
	sign  float64

	node, ref int
	gen       *genNet
	// frag is the circuit in force: the stimulus's Gen, or for a Network
	// stimulus given by its C, R, L and V0 alone, that network; nil for
	// the other forms.
	frag *waveforms.Fragment

	// The stimulus's value at time fT, kept because Newton evaluates the
	// strike several times at one time point and the annex waveforms cost
	// a logarithm and several exponentials each; fOK is false until a value
	// is stored and after SetStimulus or Reset.
	fT, fV float64
	fOK    bool
}

// strikeMinR keeps a Thevenin or Network generator with a non-positive R (a
// stimulus the waveforms package should have refused) from dividing by zero.
const strikeMinR = 1e-6

// StrikeKind is the strike's description. Its parameters are those of its
// waveform (package waveforms describes them), so its own table is empty.
var StrikeKind = &Kind{Kind: spec.Kind{
	Name: "strike", Summary: "the discharge or surge, injected into a node",
	Terminals: [2]string{"node", "ref"}, Role: spec.Stimulus, Order: 100, DC: spec.Blocks,
}, New: newStrike}

func init() { Register(StrikeKind) }

// newStrike builds a strike; its stimulus comes with each run. The
// generator circuit it makes room for is the one its waveform builds with
// the strike's values v (of the waveform's table).
func newStrike(name string, nodes [2]string, v *spec.Values) (Device, error) {
	return NewStrikeFor(name, nodes, waveforms.GeneratorShape(v)), nil
}

// Name implements Device.
func (d *Strike) Name() string { return d.name }

// Layout implements Device.
func (d *Strike) Layout() Layout {
	in, br := d.gen.layout()
	return Layout{
		Terminals: []string{d.nodes[0], d.nodes[1]},
		Internal:  in,
		Branches:  br,
	}
}

// Bind implements Device.
func (d *Strike) Bind(n Nodes) []StateRows {
	d.node, d.ref = n.Terminals[0], n.Terminals[1]
	return d.gen.bind(d.node, d.ref, n)
}

// SetStimulus implements Striker. The stimulus is kept, not copied: it must
// not change during a run. A generator circuit of another shape than the
// one the strike was built for is a programming error: the engine asks
// Fits first.
func (d *Strike) SetStimulus(s *waveforms.Stimulus, sign float64) {
	f := circuitOf(s)
	if f != nil && !d.gen.shape.SameShape(f) {
		panic(d.Fits(s).Error())
	}
	d.st, d.sign = s, sign
	d.fOK = false
	d.frag = f
}

// circuitOf is the generator circuit of s: its Gen, or for a Network
// stimulus given by its C, R, L and V0 alone, that network; nil for the
// other forms.
func circuitOf(s *waveforms.Stimulus) *waveforms.Fragment {
	switch {
	case s == nil:
		return nil
	case s.Gen != nil:
		return s.Gen
	case s.Form == waveforms.Network:
		return waveforms.NetworkFragment(s.V0, s.C, s.R, s.L)
	}
	return nil
}

// Fits reports whether the strike can run s: a stimulus with a generator
// circuit must have the shape the strike was built for.
func (d *Strike) Fits(s *waveforms.Stimulus) error {
	f := circuitOf(s)
	if f == nil || d.gen.shape.SameShape(f) {
		return nil
	}
	return fmt.Errorf("strike %s was built for another generator circuit than %s's: build it with the values of waveform %s", d.name, s.Name, s.Name)
}

// Reset implements Resetter: a new run may come with a stimulus changed in
// place, so the stored value is dropped.
func (d *Strike) Reset() { d.fOK = false }

// f is the stimulus's F at t, computed once per time point.
func (d *Strike) f(t float64) float64 {
	if !d.fOK || t != d.fT {
		d.fT, d.fV, d.fOK = t, d.st.F(t), true
	}
	return d.fV
}

// Stimulus is the stimulus in force and its sign.
func (d *Strike) Stimulus() (*waveforms.Stimulus, float64) { return d.st, d.sign }

func (d *Strike) r() float64 {
	if d.st.R < strikeMinR {
		return strikeMinR
	}
	return d.st.R
}

// Eval implements Device.
func (d *Strike) Eval(c *Context) {
	s := d.st
	if d.frag == nil {
		d.gen.idle(c)
	}
	if s == nil {
		return
	}
	switch s.Form {
	case waveforms.Current:
		if !c.DC && s.F != nil {
			c.Inject(d.node, d.ref, d.sign*d.f(c.T))
		}
	case waveforms.Thevenin:
		r := d.r()
		c.Conductance(d.node, d.ref, 1/r)
		if !c.DC && s.F != nil {
			c.Inject(d.node, d.ref, d.sign*d.f(c.T)/r)
		}
	case waveforms.Network, waveforms.Generator:
		d.gen.eval(c, d.frag, d.sign)
	}
}
