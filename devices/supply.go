package devices

import "zapnet/devices/spec"

// supply holds v(pos) − v(neg) = V behind its series r (MODELS.md, linear
// parts), scaled by Context.SourceScale during the engine's source stepping.
//
// An ideal supply needs its current as an unknown. With r > 0 the Thevenin
// source is stamped in its exact Norton form (1/r beside V/r), which needs
// no internal node and no branch: fewer unknowns, same terminal behaviour.
type supply struct {
	name  string
	nodes [2]string
	v, g  float64
	a, b  int
	br    int
}

func init() {
	Register(&Kind{Kind: spec.Kind{
		Name: "supply", Summary: "a DC supply behind an optional source resistance", Terminals: [2]string{"pos", "neg"},
		Role: spec.Source, Order: 80, IdealWithout: "r",
		Table: spec.Table{Params: []spec.Param{
			spec.Required("value", spec.Volt, spec.Any).As(spec.Condition),
			spec.Default("r", spec.Ohm, spec.NonNegative, 0).Scales(),
		}},
	}, New: newSupply})
}

func newSupply(name string, nodes [2]string, v *spec.Values) (Device, error) {
	r := v.Num("r")
	d := &supply{name: name, nodes: nodes, v: v.Num("value"), br: Ground}
	if r > 0 {
		d.g = 1 / r
	}
	return d, nil
}

func (d *supply) Name() string { return d.name }

func (d *supply) Layout() Layout {
	l := Layout{Terminals: d.nodes[:]}
	if d.g == 0 {
		l.Branches = []string{"i"}
	}
	return l
}

func (d *supply) Bind(n Nodes) []StateRows {
	d.a, d.b = n.Terminals[0], n.Terminals[1]
	if d.g == 0 {
		d.br = n.Branches[0]
	}
	return nil
}

func (d *supply) Eval(c *Context) {
	v := d.v * c.SourceScale
	if d.g > 0 {
		c.Conductance(d.a, d.b, d.g)
		c.Inject(d.a, d.b, v*d.g)
		return
	}
	// i is the current from pos through the supply to neg.
	i := c.V(d.br)
	c.AddF(d.a, i)
	c.AddF(d.b, -i)
	c.AddJ(d.a, d.br, 1)
	c.AddJ(d.b, d.br, -1)
	c.AddF(d.br, c.V(d.a)-c.V(d.b)-v)
	c.AddJ(d.br, d.a, 1)
	c.AddJ(d.br, d.b, -1)
}
