package devices

import "zapnet/devices/spec"

// Diode is the diode of MODELS.md from anode a to cathode c:
//
//	a –rs– k –[junction ∥ cj]– c,   v = v(k) − v(c)
//	i(v) = is·[exp(v/(n·Vt)) − 1] − it·exp(−(v+vbr)/(n·Vt))
//
// the breakdown term only when vbr is given: the breakdown voltage at the
// test current it, as a clamp's. rs = 0 joins k to a; cj is a constant
// junction capacitance (a linear charge cj·v) when > 0. Both exponentials
// are step-limited (see junction.go), the breakdown one around −vbr.
// Defaults: is = 1e-14 A, n = 1, it = 1 mA, rs = 0, cj = 0, no breakdown.
// The pulse ratings ipp and emax let a steering or clamping diode be judged
// as a clamp is.
type Diode struct {
	name    string
	nodes   [2]string
	law     diodeLaw
	grs, cj float64

	a, c, k int
	kCap    int
	vold    float64 // limiting memory, V
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
	rs := v.Num("rs")
	d := &Diode{name: name, nodes: nodes, law: newDiodeLaw(v.Num("is"), v.Num("n"), v.Num("vbr"), v.Num("it")), cj: v.Num("cj")}
	if rs > 0 {
		d.grs = 1 / rs
	}
	return d, nil
}

// Name implements Device.
func (d *Diode) Name() string { return d.name }

// Layout implements Device.
func (d *Diode) Layout() Layout {
	l := Layout{Terminals: []string{d.nodes[0], d.nodes[1]}}
	if d.grs > 0 {
		l.Internal = []string{"k"}
	}
	return l
}

// Bind implements Device.
func (d *Diode) Bind(n Nodes) []StateRows {
	d.a, d.c = n.Terminals[0], n.Terminals[1]
	d.k = d.a
	if d.grs > 0 {
		d.k = n.Internal[0]
	}
	d.kCap = -1
	if d.cj > 0 {
		d.kCap = 0
		return []StateRows{{Plus: d.k, Minus: d.c}}
	}
	return nil
}

// Reset implements Resetter.
func (d *Diode) Reset() { d.vold = 0 }

// Eval implements Device.
func (d *Diode) Eval(c *Context) {
	if d.grs > 0 {
		c.Conductance(d.a, d.k, d.grs)
	}
	v := stampJunction(c, &d.law, d.k, d.c, &d.vold)
	if d.kCap >= 0 {
		c.Capacitance(d.kCap, d.k, d.c, d.cj*v, d.cj)
	}
}
