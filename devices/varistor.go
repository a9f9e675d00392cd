package devices

import (
	"fmt"
	"math"

	"zapnet/devices/spec"
)

// Varistor is the metal-oxide varistor of MODELS.md between a and b:
//
//	a –rs– j –[ i(u) ∥ c ]– b,   u = v(j) − v(b)
//	i(u) = sign(u)·i1·(|u|/v1)^alpha
//
// v1 is the varistor voltage, the voltage at which it conducts i1 (1 mA by
// default, the current varistor voltages are quoted at [practice]); alpha
// is the nonlinearity exponent, 20–50 for zinc oxide [practice], 30 by
// default. The law is odd in u, so the part clamps both polarities alike.
// rs is the series path of series.go (rs = 0 joins j to a); c > 0 is a constant capacitance across the law (the
// grains' capacitance, hundreds of pF to nF for a disc [practice]).
//
// Newton and the power law: i grows as exp(alpha·ln|u|), an exponential in
// ln|u| whose "thermal voltage" is 1/alpha. The step of |u| above v1 is
// limited in that variable as a junction's is in u (junction.go): a rise
// of ln|u| by more than 2/alpha becomes (1/alpha)·ln(1 + alpha·Δln|u|), so
// one iteration never raises the current by more than a factor of about
// 1 + alpha·Δln|u|. Below v1 the current is under i1 and needs no limit.
// Above an exponent of maxExpArg the law continues along its tangent, as
// every exponential of the models does.
type Varistor struct {
	name  string
	nodes [2]string
	v1    float64 // V
	i1    float64 // A
	alpha float64
	c     float64 // F
	series

	b    int
	kCap int
	uold float64 // limiting memory, V
}

func init() {
	Register(&Kind{Kind: spec.Kind{
		Name: "varistor", Summary: "a metal-oxide varistor, i = i1·(|v|/v1)^alpha, with series rs and parallel c",
		Terminals: [2]string{"a", "b"}, Role: spec.Protector, Order: 55,
		Table: spec.Table{Params: []spec.Param{
			spec.Required("v1", spec.Volt, spec.Positive).
				WarnAbove(10e3, "varistor %s has v1 %s: unusually high for a board-level varistor"),
			spec.Default("i1", spec.Ampere, spec.Positive, 1e-3).As(spec.Model),
			spec.Default("alpha", spec.Dimensionless, spec.Positive, 30).As(spec.Model).
				WarnAbove(100, "varistor %s has alpha %s: zinc-oxide varistors are about 20 to 50"),
			spec.Default("rs", spec.Ohm, spec.NonNegative, 0),
			spec.Default("c", spec.Farad, spec.NonNegative, 0),
			ratingIpp,
			ratingEmax,
		}},
	}, New: newVaristor})
}

// newVaristor builds a varistor from its checked values.
func newVaristor(name string, nodes [2]string, v *spec.Values) (Device, error) {
	alpha := v.Num("alpha")
	if alpha < 1 {
		// Below 1 the law's slope is infinite at 0 V: no varistor
		// conducts better at low voltage than at high.
		return nil, fmt.Errorf("varistor %s: alpha must be at least 1, have %g", name, alpha)
	}
	d := &Varistor{name: name, nodes: nodes, v1: v.Num("v1"), i1: v.Num("i1"), alpha: alpha, c: v.Num("c"),
		series: newSeries(0, v.Num("rs"))}
	return d, nil
}

// Name implements Device.
func (d *Varistor) Name() string { return d.name }

// Layout implements Device.
func (d *Varistor) Layout() Layout {
	l := Layout{Terminals: []string{d.nodes[0], d.nodes[1]}}
	d.layout(&l, "j")
	return l
}

// Bind implements Device.
func (d *Varistor) Bind(n Nodes) []StateRows {
	d.b = n.Terminals[1]
	d.bind(n.Terminals[0], n)
	d.kCap = -1
	if d.c > 0 {
		d.kCap = 0
		return []StateRows{{Plus: d.j, Minus: d.b}}
	}
	return nil
}

// Reset implements Resetter: the limiting memory restarts at 0 V.
func (d *Varistor) Reset() { d.uold = 0 }

// Eval implements Device.
func (d *Varistor) Eval(c *Context) {
	d.stamp(c)
	u := stampJunction(c, d, d.j, d.b, &d.uold)
	if d.kCap >= 0 {
		c.Capacitance(d.kCap, d.j, d.b, d.c*u, d.c)
	}
}

// current returns i(u) and di/du (junctionLaw).
func (d *Varistor) current(u float64) (i, g float64) {
	x := math.Abs(u)
	if x == 0 {
		if d.alpha == 1 {
			return 0, d.i1 / d.v1
		}
		return 0, 0
	}
	e, de := expLin(d.alpha * math.Log(x/d.v1))
	i = d.i1 * e
	g = d.i1 * de * d.alpha / x
	if u < 0 {
		i = -i
	}
	return i, g
}

// limit damps the rise of |u| above v1 in ln|u| (junctionLaw).
func (d *Varistor) limit(u, uold float64) (float64, bool) {
	x, xo := math.Abs(u), math.Abs(uold)
	if x <= d.v1 {
		return u, false
	}
	if u*uold <= 0 {
		xo = 0 // a change of sign starts again from no conduction
	}
	xo = math.Max(xo, d.v1)
	if x <= xo {
		return u, false
	}
	rise := d.alpha * math.Log(x/xo)
	if rise <= 2 {
		return u, false
	}
	xl := xo * math.Pow(1+rise, 1/d.alpha)
	return math.Copysign(xl, u), true
}
