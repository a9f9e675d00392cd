package devices

import "zapnet/devices/spec"

// Diode is the diode of MODELS.md from anode a to cathode c:
//
//	a –rs– j –[junction ∥ cj]– c,   v = v(j) − v(c)
//	i(v) = is·[exp(v/(n·Vt)) − 1] − it·exp(−(v+vbr)/(n·Vt))
//
// the breakdown term only when vbr is given: the breakdown voltage at the
// test current it, as a clamp's. rs is the series path of series.go
// (rs = 0 joins j to a); cj is a constant
// junction capacitance (a linear charge cj·v) when > 0. Both exponentials
// are step-limited (see junction.go), the breakdown one around −vbr.
// Defaults: is = 1e-14 A, n = 1, it = 1 mA, rs = 0, cj = 0, no breakdown.
// The pulse ratings ipp and emax let a steering or clamping diode be judged
// as a clamp is.
type Diode struct {
	name  string
	nodes [2]string
	law   diodeLaw
	cj    float64
	series

	c    int
	kCap int
	vold float64 // limiting memory, V
}

func init() {
	Register(&Kind{Kind: spec.Kind{
		Name: "diode", Summary: "a junction diode with optional breakdown",
		Terminals: [2]string{"anode", "cathode"}, Role: spec.Protector, Order: 60,
		Table: spec.Table{Params: []spec.Param{
			keyIs,
			keyN,
			spec.Default("rs", spec.Ohm, spec.NonNegative, 0),
			spec.Default("cj", spec.Farad, spec.NonNegative, 0),
			spec.Optional("vbr", spec.Volt, spec.Positive),
			keyIt,
			ratingIpp,
			ratingEmax,
		}},
		Renamed: map[string]string{"bv": "vbr", "ibv": "it"},
	}, New: newDiode})
}

// newDiode builds a diode from its checked values.
func newDiode(name string, nodes [2]string, v *spec.Values) (Device, error) {
	d := &Diode{name: name, nodes: nodes, law: newDiodeLaw(v.Num("is"), v.Num("n"), v.Num("vbr"), v.Num("it")), cj: v.Num("cj"),
		series: newSeries(0, v.Num("rs"))}
	return d, nil
}

// Name implements Device.
func (d *Diode) Name() string { return d.name }

// Layout implements Device.
func (d *Diode) Layout() Layout {
	l := Layout{Terminals: []string{d.nodes[0], d.nodes[1]}}
	d.layout(&l, "k")
	return l
}

// Bind implements Device.
func (d *Diode) Bind(n Nodes) []StateRows {
	d.c = n.Terminals[1]
	d.bind(n.Terminals[0], n)
	d.kCap = -1
	if d.cj > 0 {
		d.kCap = 0
		return []StateRows{{Plus: d.j, Minus: d.c}}
	}
	return nil
}

// Reset implements Resetter.
func (d *Diode) Reset() { d.vold = 0 }

// Eval implements Device.
func (d *Diode) Eval(c *Context) {
	d.stamp(c)
	v := stampJunction(c, &d.law, d.j, d.c, &d.vold)
	if d.kCap >= 0 {
		c.Capacitance(d.kCap, d.j, d.c, d.cj*v, d.cj)
	}
}
