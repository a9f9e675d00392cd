package devices

import (
	"fmt"

	"zapnet/netlist"
)

// resistor is i = v/R between its nodes (MODELS.md, linear parts).
type resistor struct {
	name  string
	nodes [2]string
	a, b  int
	g     float64
}

func init() { Register(netlist.Resistor, newResistor) }

func newResistor(e *netlist.Element) (Device, error) {
	r := e.Get("value")
	if !(r > 0) || r > maxLinearValue {
		return nil, fmt.Errorf("%s: %s: resistance must be positive and finite, have %g ohm", e.Pos, e.Name, r)
	}
	return &resistor{name: e.Name, nodes: e.Nodes, g: 1 / r}, nil
}

func (d *resistor) Name() string { return d.name }

func (d *resistor) Layout() Layout { return Layout{Terminals: d.nodes[:]} }

func (d *resistor) Bind(n Nodes) []StateRows {
	d.a, d.b = n.Terminals[0], n.Terminals[1]
	return nil
}

func (d *resistor) Eval(c *Context) { c.Conductance(d.a, d.b, d.g) }

// maxLinearValue rejects infinities (and absurd values that would make the
// matrix meaningless) in the linear parts; the parser checks plausibility,
// this only keeps the arithmetic finite.
const maxLinearValue = 1e30

// linearParasitic reads an optional series parasitic (esr, esl, r): absent or
// zero means none; negative or non-finite is an error.
func linearParasitic(e *netlist.Element, key, unit string) (float64, error) {
	v := e.Get(key)
	if v < 0 || v > maxLinearValue || v != v {
		return 0, fmt.Errorf("%s: %s: %s must be zero or positive, have %g %s", e.Pos, e.Name, key, v, unit)
	}
	return v, nil
}

// stampBranch stamps an inductive branch whose current i (unknown br) flows
// from node p to node m, with flux λ = l·i as local state k:
// KCL +i leaving p, −i leaving m; branch row v(p) − v(m) − dλ/dt = 0.
func stampBranch(c *Context, k, p, m, br int, l float64) {
	branchKCL(c, p, m, br)
	c.Charge(k, l*c.V(br))
	c.ChargeDeriv(k, br, l)
}
