package devices

import "zapnet/netlist"

// Diode is the diode of MODELS.md from anode a to cathode c:
//
//	a –rs– k –[junction ∥ cj]– c,   v = v(k) − v(c)
//	i(v) = is·[exp(v/(n·Vt)) − 1] − ibv·exp(−(v+bv)/(n·Vt))
//
// the breakdown term only when bv > 0. rs = 0 joins k to a; cj is a constant
// junction capacitance (a linear charge cj·v) when > 0. Both exponentials
// are step-limited (see junction.go), the breakdown one around −bv.
// Defaults: is = 1e-14 A, n = 1, ibv = 1 mA, rs = 0, cj = 0, no bv.
type Diode struct {
	name    string
	nodes   [2]string
	law     diodeLaw
	grs, cj float64

	a, c, k int
	kCap    int
	vold    float64 // limiting memory, V
}

func init() { Register(netlist.Diode, NewDiode) }

// NewDiode builds a diode from its element.
func NewDiode(e *netlist.Element) (Device, error) {
	p := modelParams{e: e}
	is := p.nonNegative("is", 1e-14)
	n := p.positive("n", 1)
	rs := p.nonNegative("rs", 0)
	cj := p.nonNegative("cj", 0)
	bv := p.nonNegative("bv", 0)
	ibv := p.positive("ibv", 1e-3)
	if err := p.err(); err != nil {
		return nil, err
	}
	d := &Diode{name: e.Name, nodes: e.Nodes, law: newDiodeLaw(is, n, bv, ibv), cj: cj}
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
