package devices

import "zapnet/devices/spec"

// resistor is i = v/R between its nodes (MODELS.md, linear parts). Its
// pulse ratings are the energy it may absorb in one event (emax) and the
// largest instantaneous power (pmax), as a pulse-withstanding resistor's
// data give them.
type resistor struct {
	name  string
	nodes [2]string
	a, b  int
	g     float64
}

func init() {
	Register(&Kind{Kind: spec.Kind{
		Name: "resistor", Summary: "a resistor, i = v/R", Terminals: [2]string{"a", "b"},
		Role: spec.Passive, Order: 10,
		Table: spec.Table{Params: []spec.Param{
			spec.Required("value", spec.Ohm, spec.Positive).Scales().
				WarnAbove(1e9, "resistor %s is %s: unusually large"),
			ratingEmax,
			spec.Limit("pmax", spec.Watt, spec.Positive, spec.PeakPower, true, "peak power"),
		}},
	}, New: newResistor})
}

func newResistor(name string, nodes [2]string, v *spec.Values) (Device, error) {
	return &resistor{name: name, nodes: nodes, g: 1 / v.Num("value")}, nil
}

func (d *resistor) Name() string { return d.name }

func (d *resistor) Layout() Layout { return Layout{Terminals: d.nodes[:]} }

func (d *resistor) Bind(n Nodes) []StateRows {
	d.a, d.b = n.Terminals[0], n.Terminals[1]
	return nil
}

func (d *resistor) Eval(c *Context) { c.Conductance(d.a, d.b, d.g) }

// stampBranch stamps an inductive branch whose current i (unknown br) flows
// from node p to node m, with flux λ = l·i as local state k:
// KCL +i leaving p, −i leaving m; branch row v(p) − v(m) − dλ/dt = 0.
func stampBranch(c *Context, k, p, m, br int, l float64) {
	branchKCL(c, p, m, br)
	c.Charge(k, l*c.V(br))
	c.ChargeDeriv(k, br, l)
}
