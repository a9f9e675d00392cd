package devices

import (
	"fmt"

	"zapnet/netlist"
)

// inductor is the chain a –r– m –L– b (MODELS.md, linear parts) with its
// branch current as an unknown and the flux L·i as its one state. Without r,
// m is a.
type inductor struct {
	name    string
	nodes   [2]string
	l, g    float64
	a, b, m int
	br      int
}

func init() { Register(netlist.Inductor, newInductor) }

func newInductor(e *netlist.Element) (Device, error) {
	l := e.Get("value")
	if !(l > 0) || l > maxLinearValue {
		return nil, fmt.Errorf("%s: %s: inductance must be positive and finite, have %g H", e.Pos, e.Name, l)
	}
	r, err := linearParasitic(e, "r", "ohm")
	if err != nil {
		return nil, err
	}
	d := &inductor{name: e.Name, nodes: e.Nodes, l: l}
	if r > 0 {
		d.g = 1 / r
	}
	return d, nil
}

func (d *inductor) Name() string { return d.name }

func (d *inductor) Layout() Layout {
	l := Layout{Terminals: d.nodes[:], Branches: []string{"i"}}
	if d.g > 0 {
		l.Internal = []string{"r"}
	}
	return l
}

func (d *inductor) Bind(n Nodes) []StateRows {
	d.a, d.b, d.br = n.Terminals[0], n.Terminals[1], n.Branches[0]
	d.m = d.a
	if d.g > 0 {
		d.m = n.Internal[0]
	}
	return []StateRows{{Plus: Ground, Minus: d.br}}
}

func (d *inductor) Eval(c *Context) {
	if d.g > 0 {
		c.Conductance(d.a, d.m, d.g)
	}
	stampBranch(c, 0, d.m, d.b, d.br, d.l)
}
