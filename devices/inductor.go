package devices

import "zapnet/devices/spec"

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

func init() {
	Register(&Kind{Kind: spec.Kind{
		Name: "inductor", Summary: "an inductor with optional series resistance", Terminals: [2]string{"a", "b"},
		Role: spec.Storage, Order: 30, IdealWithout: "r",
		Table: spec.Table{Params: []spec.Param{
			spec.Required("value", spec.Henry, spec.Positive).Scales().
				WarnAbove(1e-3, "inductor %s is %s: unusually large for a protection path (nanohenries are usual)"),
			spec.Default("r", spec.Ohm, spec.NonNegative, 0),
		}},
	}, New: newInductor})
}

func newInductor(name string, nodes [2]string, v *spec.Values) (Device, error) {
	r := v.Num("r")
	d := &inductor{name: name, nodes: nodes, l: v.Num("value")}
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
