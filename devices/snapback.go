package devices

import (
	"errors"
	"fmt"
	"math"

	"zapnet/devices/spec"
)

// Snapback is a snapback clamp: an S-shaped quasi-static I–V through a
// trigger point (vt1, it1), where the voltage is highest before the device
// turns on, and a holding point (vh, ih), where it is lowest after, then an
// on-resistance ron. The S-curve is single-valued as a voltage V(I) of the
// current I from the line a to the reference b, so the model is
// current-controlled; a TLP curve measured on a 50 Ω load line has this
// form too (it1 < ih).
//
// The curve (I ≥ 0; a = nbr·Vt, Vt = k·300 K/q as in junction.go):
//
//	u_j(I) = ub + a·ln(I/it1 + ε),  ε = e^(−ub/a)            blocking junction
//	A  0 ≤ I ≤ it1:  V = u_j(I) + ron·I − s1·I²/(2·it1),      s1 = a/(it1·(1+ε)) + ron
//	B  it1 ≤ I ≤ ih: V = vt1 + (vh − vt1)·(3t² − 2t³),         t = (I − it1)/(ih − it1)
//	C  I ≥ ih:       V = vh + ron·[(I − ih) − w·(1 − e^(−(I−ih)/w))], w = ron·(ih − it1)²/(6·(vt1 − vh))
//
// ub is set so that V(it1) = vt1 (ub ≈ vt1 − ron·it1/2 + a/2). Then V rises
// to its maximum vt1 at it1 (V' = 0 there), falls through the snapback to
// its minimum vh at ih (V' = 0), and turns onto the slope ron; V is smooth
// at it1 (V and V' continuous) and twice smooth at ih (w matches the
// curvatures). For I < 0 the uni device conducts forward, V = u_j(I) +
// ron·I with the forward junction u_j(I) = −n·Vt·ln(1 + |I|/is); the bi
// device is odd, V(−I) = −V(I).
//
// Formulation. The device is a voltage-controlled junction in series with a
// current-controlled remainder:
//
//	a –[junction ∥ cj]– k –[ρ(i), l]– b,   ρ(I) = V(I) − u_j(I)
//
// The junction, i(u) = it1·[e^((u−ub)/a) − ε] for u ≥ 0 (and the forward
// −is·[e^(−u/(n·Vt)) − 1], or the mirrored breakdown for bi, below 0),
// carries the steep blocking region with the engine's usual junction
// limiting; ρ(i) is smooth with a bounded slope, negative in the snapback.
// Its branch current i is an unknown with the branch equation
// v(k) − v(b) − ρ(i) − dλ/dt = 0, λ = l·i, l = ls + ton·(vt1 − vh)/(ih − it1).
// The second part of l makes the snapback a continuous path in time: the
// device crosses its negative-resistance region in about ton (default
// 10 ps, a fast device's turn-on time [practice: grounded-gate and SCR
// snapback devices turn on in tens of picoseconds to a nanosecond]), and
// every Newton iteration of a transient step has a unique solution once the
// step is shorter than the crossing. At DC (l is a short) the device is the
// S-curve itself; a source stiffer than the snapback's slope (|V'| up to
// 1.5·(vt1 − vh)/(ih − it1)) can meet the S-curve three times, and the
// operating point is then the one Newton reaches from 0 V, the blocking one.
//
// cj is a linear capacitance across the junction, as the clamp's. The
// failure current it2 (second breakdown) is a rating, not part of V(I).
type Snapback struct {
	name  string
	nodes [2]string
	law   *SnapbackLaw
	cj    float64
	l     float64 // H

	a, b, k, br int
	kCharge     int
	kFlux       int
	uold        float64
}

// SnapbackSpec describes a snapback clamp in plain values (SI units).
// Zero values take the defaults: nbr 1, is 1e-14 A, n 1, ton 10 ps.
type SnapbackSpec struct {
	Name     string
	Nodes    [2]string
	Vt1, It1 float64 // trigger point, V and A (required)
	Vh, Ih   float64 // holding point, V and A (required)
	Ron      float64 // on-resistance, Ω (required)
	Nbr      float64 // emission coefficient of the blocking junction's breakdown
	Is, N    float64 // forward junction of a uni device
	Bi       bool    // symmetric
	Cj, Ls   float64 // F, H
	Ton      float64 // turn-on time, s; negative means none (an algebraic snapback)
}

// snapbackTon is the default turn-on time, s.
const snapbackTon = 10e-12

func init() {
	Register(&Kind{Kind: spec.Kind{
		Name: "snapback", Summary: "a snapback clamp: an S-curve through its trigger and holding points, then ron",
		Terminals: [2]string{"line", "ref"}, Role: spec.Protector, Order: 52,
		Table: spec.Table{
			Params: []spec.Param{
				spec.Required("vt1", spec.Volt, spec.Positive).Noted("the trigger voltage").
					WarnAbove(1000, "snapback %s triggers at %s: unusually high for a clamp"),
				spec.Required("it1", spec.Ampere, spec.Positive).Noted("the trigger current"),
				spec.Required("vh", spec.Volt, spec.Positive).Noted("the holding voltage"),
				spec.Required("ih", spec.Ampere, spec.Positive).Noted("the holding current"),
				spec.Required("ron", spec.Ohm, spec.Positive).
					WarnAbove(100, "snapback %s has ron %s: a clamp's on-resistance is usually a few ohms at most"),
				keyNbr,
				spec.Default("ton", spec.Second, spec.NonNegative, snapbackTon).As(spec.Model),
				spec.Default("ls", spec.Henry, spec.NonNegative, 0),
				spec.Default("cj", spec.Farad, spec.NonNegative, 0),
				keyIs,
				keyN,
				spec.Limit("it2", spec.Ampere, spec.Positive, spec.PeakCurrent, true, "peak current"),
				ratingEmax,
			},
			Words: []spec.Word{{Key: "polarity", Choices: []string{"uni", "bi"}, Default: "uni"}},
		},
	}, New: newSnapbackKind})
}

// newSnapbackKind builds a snapback clamp from its checked values; a ton
// of 0 means no turn-on time.
func newSnapbackKind(name string, nodes [2]string, v *spec.Values) (Device, error) {
	ton := v.Num("ton")
	if ton == 0 {
		ton = -1
	}
	d, err := NewSnapback(SnapbackSpec{Name: name, Nodes: nodes,
		Vt1: v.Num("vt1"), It1: v.Num("it1"), Vh: v.Num("vh"), Ih: v.Num("ih"), Ron: v.Num("ron"),
		Nbr: v.Num("nbr"), Is: v.Num("is"), N: v.Num("n"), Bi: v.Word("polarity") == "bi",
		Cj: v.Num("cj"), Ls: v.Num("ls"), Ton: ton})
	if err != nil {
		return nil, err
	}
	return d, nil
}

// SnapbackLaw is the snapback clamp's quasi-static curve and its junction.
type SnapbackLaw struct {
	vt1, it1, vh, ih, ron float64
	bi                    bool
	a, ub, eps, s1, c2, w float64
	is, nvt               float64
	br, fw                expTerm // breakdown (u ≥ 0) and forward (uni, u < 0) terms
}

// NewSnapbackLaw checks the spec's curve parameters and sets the law up.
func NewSnapbackLaw(s SnapbackSpec) (*SnapbackLaw, error) {
	var errs []error
	bad := func(format string, args ...any) { errs = append(errs, fmt.Errorf(format, args...)) }
	pos := func(key string, v float64) {
		if !(v > 0) || math.IsInf(v, 0) {
			bad("%s must be > 0, got %g", key, v)
		}
	}
	if s.Nbr == 0 {
		s.Nbr = keyNbr.Default
	}
	if s.Is == 0 {
		s.Is = keyIs.Default
	}
	if s.N == 0 {
		s.N = keyN.Default
	}
	for _, p := range []struct {
		k string
		v float64
	}{{"vt1", s.Vt1}, {"it1", s.It1}, {"vh", s.Vh}, {"ih", s.Ih}, {"ron", s.Ron}, {"nbr", s.Nbr}, {"is", s.Is}, {"n", s.N}} {
		pos(p.k, p.v)
	}
	if len(errs) == 0 {
		if s.Vh >= s.Vt1 {
			bad("the holding voltage vh (%g V) must lie below the trigger voltage vt1 (%g V)", s.Vh, s.Vt1)
		}
		if s.Ih <= s.It1 {
			bad("the holding current ih (%g A) must exceed the trigger current it1 (%g A): the S-curve is described as a voltage of the current", s.Ih, s.It1)
		}
	}
	if err := errors.Join(errs...); err != nil {
		return nil, err
	}
	l := &SnapbackLaw{vt1: s.Vt1, it1: s.It1, vh: s.Vh, ih: s.Ih, ron: s.Ron, bi: s.Bi,
		a: s.Nbr * ThermalVoltage, is: s.Is, nvt: s.N * ThermalVoltage}
	// ub from V(it1) = vt1: ub = vt1 − a·ln(1+ε) − ron·it1/2 + a/(2(1+ε)),
	// with ε = e^(−ub/a) depending weakly on ub: a fixed point that
	// contracts by a factor of about ε.
	ub := s.Vt1 - s.Ron*s.It1/2 + l.a/2
	for range 100 {
		eps := math.Exp(-ub / l.a)
		next := s.Vt1 - l.a*math.Log1p(eps) - s.Ron*s.It1/2 + l.a/(2*(1+eps))
		if math.Abs(next-ub) <= 1e-15*math.Abs(ub) {
			ub = next
			break
		}
		ub = next
	}
	if !(ub > 0) {
		return nil, fmt.Errorf("the trigger voltage vt1 %s is too low for ron·it1/2 = %s: the blocking junction would break down below 0 V", spec.FormatSI(s.Vt1, "V"), spec.FormatSI(s.Ron*s.It1/2, "V"))
	}
	l.ub = ub
	l.eps = math.Exp(-ub / l.a)
	l.s1 = l.a/(s.It1*(1+l.eps)) + s.Ron
	l.c2 = l.s1 / (2 * s.It1)
	d := s.Ih - s.It1
	l.w = s.Ron * d * d / (6 * (s.Vt1 - s.Vh))
	l.br = newExpTerm(s.It1, l.a, 1, ub)
	l.fw = newExpTerm(s.Is, l.nvt, -1, 0)
	return l, nil
}

// Junction returns the junction voltage u_j(I) and du_j/dI.
func (l *SnapbackLaw) Junction(i float64) (u, du float64) {
	switch {
	case i >= 0:
		return l.ub + l.a*math.Log(i/l.it1+l.eps), l.a / (i + l.it1*l.eps)
	case l.bi:
		u, du = l.Junction(-i)
		return -u, du
	}
	return -l.nvt * math.Log1p(-i/l.is), l.nvt / (l.is - i)
}

// V returns the quasi-static voltage V(I) and dV/dI.
func (l *SnapbackLaw) V(i float64) (v, dv float64) {
	switch {
	case i < 0 && l.bi:
		v, dv = l.V(-i)
		return -v, dv
	case i < 0:
		u, du := l.Junction(i)
		return u + l.ron*i, du + l.ron
	case i <= l.it1:
		u, du := l.Junction(i)
		return u + l.ron*i - l.c2*i*i, du + l.ron - 2*l.c2*i
	case i <= l.ih:
		d := l.ih - l.it1
		t := (i - l.it1) / d
		dvh := l.vh - l.vt1
		return l.vt1 + dvh*t*t*(3-2*t), dvh * 6 * t * (1 - t) / d
	}
	x := i - l.ih
	e := math.Exp(-x / l.w)
	return l.vh + l.ron*(x-l.w*(1-e)), l.ron * (1 - e)
}

// rho returns the remainder ρ(I) = V(I) − u_j(I) and its slope.
func (l *SnapbackLaw) rho(i float64) (r, dr float64) {
	switch {
	case i < 0 && l.bi:
		r, dr = l.rho(-i)
		return -r, dr
	case i < 0:
		return l.ron * i, l.ron
	case i <= l.it1:
		return l.ron*i - l.c2*i*i, l.ron - 2*l.c2*i
	}
	v, dv := l.V(i)
	u, du := l.Junction(i)
	return v - u, dv - du
}

// current is the junction current from a to k and its slope at u.
func (l *SnapbackLaw) current(u float64) (i, g float64) {
	switch {
	case u >= 0:
		e, de := l.br.eval(u)
		return e - l.it1*l.eps, de
	case l.bi:
		e, de := l.br.eval(-u)
		return -(e - l.it1*l.eps), de
	}
	f, df := l.fw.eval(u)
	return -(f - l.is), -df
}

// limit damps the junction's Newton step.
func (l *SnapbackLaw) limit(u, uold float64) (float64, bool) {
	switch {
	case u >= 0:
		return l.br.limit(u, math.Max(uold, 0))
	case l.bi:
		w, lim := l.br.limit(-u, math.Max(-uold, 0))
		return -w, lim
	}
	return l.fw.limit(u, math.Min(uold, 0))
}

// NewSnapback builds a snapback clamp.
func NewSnapback(s SnapbackSpec) (*Snapback, error) {
	law, err := NewSnapbackLaw(s)
	var errs []error
	if err != nil {
		errs = append(errs, err)
	}
	for _, p := range []struct {
		k string
		v float64
	}{{"cj", s.Cj}, {"ls", s.Ls}} {
		if !(p.v >= 0) || math.IsInf(p.v, 0) {
			errs = append(errs, fmt.Errorf("%s must be >= 0, got %g", p.k, p.v))
		}
	}
	ton := s.Ton
	switch {
	case ton == 0:
		ton = snapbackTon
	case ton < 0:
		ton = 0
	}
	if err := errors.Join(errs...); err != nil {
		return nil, fmt.Errorf("%s: %w", s.Name, err)
	}
	d := &Snapback{name: s.Name, nodes: s.Nodes, law: law, cj: s.Cj,
		l: s.Ls + ton*(s.Vt1-s.Vh)/(s.Ih-s.It1)}
	return d, nil
}

var _ Resetter = (*Snapback)(nil)

// Law returns the device's quasi-static curve.
func (d *Snapback) Law() *SnapbackLaw { return d.law }

// Name implements Device.
func (d *Snapback) Name() string { return d.name }

// Layout implements Device.
func (d *Snapback) Layout() Layout {
	return Layout{Terminals: []string{d.nodes[0], d.nodes[1]}, Internal: []string{"k"}, Branches: []string{"i"}}
}

// Bind implements Device.
func (d *Snapback) Bind(n Nodes) []StateRows {
	d.a, d.b = n.Terminals[0], n.Terminals[1]
	d.k, d.br = n.Internal[0], n.Branches[0]
	var rows []StateRows
	d.kCharge, d.kFlux = -1, -1
	if d.cj > 0 {
		d.kCharge = len(rows)
		rows = append(rows, StateRows{Plus: d.a, Minus: d.k})
	}
	if d.l > 0 {
		d.kFlux = len(rows)
		rows = append(rows, StateRows{Plus: Ground, Minus: d.br})
	}
	return rows
}

// Reset implements Resetter.
func (d *Snapback) Reset() { d.uold = 0 }

// Eval implements Device.
func (d *Snapback) Eval(c *Context) {
	u := stampJunction(c, d.law, d.a, d.k, &d.uold)
	if d.kCharge >= 0 {
		c.Capacitance(d.kCharge, d.a, d.k, d.cj*u, d.cj)
	}
	branchKCL(c, d.k, d.b, d.br)
	i := c.V(d.br)
	r, dr := d.law.rho(i)
	c.AddF(d.br, -r)
	c.AddJ(d.br, d.br, -dr)
	if d.kFlux >= 0 {
		c.Charge(d.kFlux, d.l*i)
		c.ChargeDeriv(d.kFlux, d.br, d.l)
	}
}
