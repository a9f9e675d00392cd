package devices

import (
	"math"

	"zapnet/devices/spec"
)

// Bead is the ferrite bead of MODELS.md:
//
//	a –rdc– k –[ l ∥ rac ∥ c ]– b
//
// The inductive path is a branch current i with flux λ(i) and branch equation
// v(k) − v(b) − dλ/dt = 0. Without isat λ = l·i. With isat the flux
// saturates, λ(i) = l·isat·atan(i/isat), so the incremental inductance is
// dλ/di = l/(1+(i/isat)²): integrating the flux rather than l(i)·di/dt keeps
// the stored energy a function of i alone, so a current cycle creates no
// energy. rac and c sit between k and b when they are > 0; rdc = 0 joins k
// to a. Small-signal impedance:
//
//	Z(f) = rdc + 1/(1/rac + 1/(j2πf·l) + j2πf·c)
//
// Every parameter defaults to 0 (absent isat: linear).
type Bead struct {
	name          string
	nodes         [2]string
	grdc, grac    float64 // S; 0: absent
	l, c, isat    float64
	a, b, k, br   int
	kFlux, kCap   int
	hasCap, isSat bool
}

func init() {
	Register(&Kind{Kind: spec.Kind{
		Name: "bead", Summary: "a ferrite bead, rdc in series with l ∥ rac ∥ c, optionally saturating",
		Terminals: [2]string{"a", "b"}, Role: spec.Storage, Order: 40, IdealWithout: "rdc",
		Table: spec.Table{Params: []spec.Param{
			spec.Default("rdc", spec.Ohm, spec.NonNegative, 0),
			spec.Default("rac", spec.Ohm, spec.NonNegative, 0),
			spec.Required("l", spec.Henry, spec.Positive).Scales(),
			spec.Default("c", spec.Farad, spec.NonNegative, 0),
			spec.Optional("isat", spec.Ampere, spec.Positive),
		}},
	}, New: newBead})
}

// newBead builds a bead from its checked values.
func newBead(name string, nodes [2]string, v *spec.Values) (Device, error) {
	rdc, rac, c := v.Num("rdc"), v.Num("rac"), v.Num("c")
	d := &Bead{name: name, nodes: nodes, l: v.Num("l"), c: c, hasCap: c > 0}
	if isat, ok := v.Lookup("isat"); ok {
		d.isat, d.isSat = isat, true
	}
	if rdc > 0 {
		d.grdc = 1 / rdc
	}
	if rac > 0 {
		d.grac = 1 / rac
	}
	return d, nil
}

// Name implements Device.
func (d *Bead) Name() string { return d.name }

// Layout implements Device.
func (d *Bead) Layout() Layout {
	l := Layout{Terminals: []string{d.nodes[0], d.nodes[1]}, Branches: []string{"l"}}
	if d.grdc > 0 {
		l.Internal = []string{"k"}
	}
	return l
}

// Bind implements Device.
func (d *Bead) Bind(n Nodes) []StateRows {
	d.a, d.b = n.Terminals[0], n.Terminals[1]
	d.k = d.a
	if d.grdc > 0 {
		d.k = n.Internal[0]
	}
	d.br = n.Branches[0]
	d.kFlux, d.kCap = 0, -1
	rows := []StateRows{{Plus: Ground, Minus: d.br}}
	if d.hasCap {
		d.kCap = 1
		rows = append(rows, StateRows{Plus: d.k, Minus: d.b})
	}
	return rows
}

// flux returns λ(i) and dλ/di.
func (d *Bead) flux(i float64) (lam, dlam float64) {
	if !d.isSat {
		return d.l * i, d.l
	}
	x := i / d.isat
	return d.l * d.isat * math.Atan(x), d.l / (1 + x*x)
}

// Eval implements Device.
func (d *Bead) Eval(c *Context) {
	if d.grdc > 0 {
		c.Conductance(d.a, d.k, d.grdc)
	}
	branchKCL(c, d.k, d.b, d.br)
	lam, dlam := d.flux(c.V(d.br))
	c.Charge(d.kFlux, lam)
	c.ChargeDeriv(d.kFlux, d.br, dlam)
	if d.grac > 0 {
		c.Conductance(d.k, d.b, d.grac)
	}
	if d.hasCap {
		u := c.V(d.k) - c.V(d.b)
		c.Capacitance(d.kCap, d.k, d.b, d.c*u, d.c)
	}
}
