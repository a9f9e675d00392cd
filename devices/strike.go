package devices

import (
	"zapnet/devices/spec"
	"zapnet/waveforms"
)

// Strike is the discharge between node and ref. Its stimulus and sign s
// (+1 pos, −1 neg) are set per run with SetStimulus; the layout is fixed at
// Bind so that one compiled system runs every stimulus. It always owns an
// internal node x and a branch current i (the generator's discharge path);
// forms that do not use them tie x to gnd through 1 S and force i = 0, which
// keeps the matrix regular and costs nothing.
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
//
// A nil stimulus switches the strike off: the device stamps only the trivial
// rows of x and i.
type Strike struct {
	name  string
	nodes [2]string
	st    *waveforms.Stimulus
	sign  float64

	node, ref, x, br int

	// The stimulus's value at time fT, kept because Newton evaluates the
	// strike several times at one time point and the annex waveforms cost
	// a logarithm and several exponentials each; fOK is false until a value
	// is stored and after SetStimulus or Reset.
	fT, fV float64
	fOK    bool
}

// Indices of the strike's states.
const (
	strikeCap  = 0
	strikeFlux = 1
)

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

// newStrike builds a strike; its stimulus comes with each run.
func newStrike(name string, nodes [2]string, _ *spec.Values) (Device, error) {
	return &Strike{name: name, nodes: nodes}, nil
}

// Name implements Device.
func (d *Strike) Name() string { return d.name }

// Layout implements Device.
func (d *Strike) Layout() Layout {
	return Layout{
		Terminals: []string{d.nodes[0], d.nodes[1]},
		Internal:  []string{"x"},
		Branches:  []string{"i"},
	}
}

// Bind implements Device.
func (d *Strike) Bind(n Nodes) []StateRows {
	d.node, d.ref = n.Terminals[0], n.Terminals[1]
	d.x, d.br = n.Internal[0], n.Branches[0]
	return []StateRows{
		strikeCap:  {Plus: d.x, Minus: d.ref},
		strikeFlux: {Plus: Ground, Minus: d.br},
	}
}

// SetStimulus implements Striker. The stimulus is kept, not copied: it must
// not change during a run.
func (d *Strike) SetStimulus(s *waveforms.Stimulus, sign float64) {
	d.st, d.sign = s, sign
	d.fOK = false
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
	if s == nil || s.Form != waveforms.Network {
		// Unused generator network: x tied to gnd, i = 0, no charge.
		c.Conductance(d.x, Ground, 1)
		c.AddF(d.br, c.V(d.br))
		c.AddJ(d.br, d.br, 1)
		c.Charge(strikeCap, 0)
		c.Charge(strikeFlux, 0)
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
	case waveforms.Network:
		u := c.V(d.x) - c.V(d.ref)
		c.Capacitance(strikeCap, d.x, d.ref, s.C*u, s.C)
		i := c.V(d.br)
		if c.DC {
			c.Conductance(d.x, d.ref, 1)
			c.Inject(d.x, d.ref, d.sign*s.V0)
			c.AddF(d.br, i)
			c.AddJ(d.br, d.br, 1)
			c.Charge(strikeFlux, 0)
			return
		}
		branchKCL(c, d.x, d.node, d.br)
		r := d.r()
		c.AddF(d.br, -r*i)
		c.AddJ(d.br, d.br, -r)
		c.Charge(strikeFlux, s.L*i)
		if s.L > 0 {
			c.ChargeDeriv(strikeFlux, d.br, s.L)
		}
	}
}
