package devices

import "zapnet/netlist"

// Clamp is the TVS clamp of MODELS.md between the line a and the reference b:
//
//	a –ls– m –rdyn– j –[junction ∥ junction charge]– b,   u = v(j) − v(b)
//
// The series inductance ls is a branch current i with flux λ = ls·i, its
// branch equation v(a) − v(m) − dλ/dt = 0. rdyn is a plain conductance. A
// zero ls or rdyn adds no unknown (m is a, or j is m). The junction carries
// the current of clampLaw (uni or bi, see junction.go) plus the engine's
// gmin, and the charge q(u) with C(u) = cj·(1+|u|/vj)^(−m) when cj > 0.
//
// Defaults (applied here too, so an element built in code needs only vbr):
// it = 1 mA, nbr = 1, is = 1e-14 A, n = 1, rdyn = 0, ls = 0, cj = 0, m = 0,
// vj = 0.7 V, polarity = uni. The ratings ipp and emax are the study's, not
// the model's.
type Clamp struct {
	name  string
	nodes [2]string
	law   clampLaw
	ls    float64 // H
	grdyn float64 // 1/rdyn, S; 0: no rdyn

	a, b, m, j, br int
	kCharge, kFlux int
	uold           float64 // limiting memory, V
}

func init() { Register(netlist.Clamp, NewClamp) }

// NewClamp builds a clamp from its element.
func NewClamp(e *netlist.Element) (Device, error) {
	p := modelParams{e: e}
	p.require("vbr")
	vbr := p.get("vbr", 0)
	if e.Has("vbr") && !(vbr > 0) {
		p.complain("vbr must be > 0, got %g", vbr)
	}
	it := p.positive("it", 1e-3)
	nbr := p.positive("nbr", 1)
	is := p.nonNegative("is", 1e-14)
	n := p.positive("n", 1)
	rdyn := p.nonNegative("rdyn", 0)
	ls := p.nonNegative("ls", 0)
	cj := p.nonNegative("cj", 0)
	m := p.nonNegative("m", 0)
	vj := p.positive("vj", 0.7)
	bi := false
	switch pol := e.Str["polarity"]; pol {
	case "", "uni":
	case "bi":
		bi = true
	default:
		p.complain("polarity must be uni or bi, got %q", pol)
	}
	if err := p.err(); err != nil {
		return nil, err
	}
	d := &Clamp{name: e.Name, nodes: e.Nodes, ls: ls}
	d.law = newClampLaw(vbr, it, nbr, is, n, bi)
	d.law.cj, d.law.vj, d.law.m = cj, vj, m
	if rdyn > 0 {
		d.grdyn = 1 / rdyn
	}
	return d, nil
}

// Name implements Device.
func (d *Clamp) Name() string { return d.name }

// Layout implements Device.
func (d *Clamp) Layout() Layout {
	l := Layout{Terminals: []string{d.nodes[0], d.nodes[1]}}
	switch {
	case d.ls > 0 && d.grdyn > 0:
		l.Internal = []string{"m", "j"}
	case d.ls > 0 || d.grdyn > 0:
		l.Internal = []string{"j"}
	}
	if d.ls > 0 {
		l.Branches = []string{"ls"}
	}
	return l
}

// Bind implements Device.
func (d *Clamp) Bind(n Nodes) []StateRows {
	d.a, d.b = n.Terminals[0], n.Terminals[1]
	d.m, d.j, d.br = d.a, d.a, Ground
	switch {
	case d.ls > 0 && d.grdyn > 0:
		d.m, d.j = n.Internal[0], n.Internal[1]
	case d.ls > 0:
		d.m, d.j = n.Internal[0], n.Internal[0]
	case d.grdyn > 0:
		d.j = n.Internal[0]
	}
	var rows []StateRows
	d.kCharge, d.kFlux = -1, -1
	if d.law.cj > 0 {
		d.kCharge = len(rows)
		rows = append(rows, StateRows{Plus: d.j, Minus: d.b})
	}
	if d.ls > 0 {
		d.br = n.Branches[0]
		d.kFlux = len(rows)
		rows = append(rows, StateRows{Plus: Ground, Minus: d.br})
	}
	return rows
}

// Reset implements Resetter: the limiting memory restarts at 0 V.
func (d *Clamp) Reset() { d.uold = 0 }

// Eval implements Device.
func (d *Clamp) Eval(c *Context) {
	if d.ls > 0 {
		branchKCL(c, d.a, d.m, d.br)
		c.Charge(d.kFlux, d.ls*c.V(d.br))
		c.ChargeDeriv(d.kFlux, d.br, d.ls)
	}
	if d.grdyn > 0 {
		c.Conductance(d.m, d.j, d.grdyn)
	}
	u := stampJunction(c, &d.law, d.j, d.b, &d.uold)
	if d.kCharge >= 0 {
		q, cap := d.law.charge(u)
		c.Capacitance(d.kCharge, d.j, d.b, q, cap)
	}
}
