package devices

import "zapnet/devices/spec"

// Clamp is the TVS clamp of MODELS.md between the line a and the reference b:
//
//	a –ls– m –rdyn– j –[junction ∥ junction charge]– b,   u = v(j) − v(b)
//
// ls and rdyn are the series path of series.go (a zero one adds no
// unknown). The junction carries
// the current of clampLaw (uni or bi, see junction.go) plus the engine's
// gmin, and the charge q(u) with C(u) = cj·(1+|u|/vj)^(−m) when cj > 0.
//
// Defaults: it = 1 mA, nbr = 1, is = 1e-14 A, n = 1, rdyn = 0, ls = 0,
// cj = 0, m = 0, vj = 0.7 V, polarity = uni. The ratings are the study's,
// not the model's: vrwm, the stand-off (reverse working) voltage, against
// the voltage across the clamp at the operating point; ipp and emax against
// the strike.
type Clamp struct {
	name  string
	nodes [2]string
	law   clampLaw
	series

	b       int
	kCharge int
	uold    float64 // limiting memory, V
}

// clampKind is the clamp's description; the junction keys and their
// defaults are MODELS.md's.
var clampKind = &Kind{Kind: spec.Kind{
	Name: "clamp", Summary: "a TVS clamp, uni- or bidirectional, with rdyn, lead inductance and junction charge",
	Terminals: [2]string{"line", "ref"}, Role: spec.Protector, Order: 50,
	Table: spec.Table{
		Params: []spec.Param{
			spec.Required("vbr", spec.Volt, spec.Positive).UnlessWord("table").
				WarnAbove(1000, "clamp %s breaks down at %s: unusually high for a clamp"),
			keyIt,
			keyNbr,
			spec.Default("rdyn", spec.Ohm, spec.NonNegative, 0).
				WarnAbove(100, "clamp %s has rdyn %s: a clamp's dynamic resistance is usually below 1 Ω"),
			spec.Default("ls", spec.Henry, spec.NonNegative, 0),
			spec.Default("cj", spec.Farad, spec.NonNegative, 0),
			spec.Default("vj", spec.Volt, spec.Positive, 0.7).As(spec.Model),
			spec.Default("m", spec.Dimensionless, spec.Fraction, 0).As(spec.Model),
			keyIs,
			keyN,
			spec.Limit("vrwm", spec.Volt, spec.Positive, spec.StandOff, true, "stand-off voltage"),
			ratingIpp,
			ratingEmax,
		},
		Words: []spec.Word{
			{Key: "polarity", Choices: []string{"uni", "bi"}, Default: "uni"},
			{Key: "table", Path: true, Fixed: true},
		},
	},
}, New: newClamp}

func init() { Register(clampKind) }

// newClamp builds a clamp from its checked values.
func newClamp(name string, nodes [2]string, v *spec.Values) (Device, error) {
	if path := v.Word("table"); path != "" {
		return newTableClamp(name, nodes, path, v)
	}
	vbr, it, nbr, is, n := v.Num("vbr"), v.Num("it"), v.Num("nbr"), v.Num("is"), v.Num("n")
	rdyn, ls, cj, m, vj := v.Num("rdyn"), v.Num("ls"), v.Num("cj"), v.Num("m"), v.Num("vj")
	bi := v.Word("polarity") == "bi"
	d := &Clamp{name: name, nodes: nodes, series: newSeries(ls, rdyn)}
	d.law = newClampLaw(vbr, it, nbr, is, n, bi)
	d.law.cj, d.law.vj, d.law.m = cj, vj, m
	return d, nil
}

// Name implements Device.
func (d *Clamp) Name() string { return d.name }

// Layout implements Device.
func (d *Clamp) Layout() Layout {
	l := Layout{Terminals: []string{d.nodes[0], d.nodes[1]}}
	d.layout(&l, "j")
	return l
}

// Bind implements Device.
func (d *Clamp) Bind(n Nodes) []StateRows {
	d.b = n.Terminals[1]
	d.bind(n.Terminals[0], n)
	var rows []StateRows
	d.kCharge = -1
	if d.law.cj > 0 {
		d.kCharge = len(rows)
		rows = append(rows, StateRows{Plus: d.j, Minus: d.b})
	}
	return d.fluxRow(rows)
}

// Reset implements Resetter: the limiting memory restarts at 0 V.
func (d *Clamp) Reset() { d.uold = 0 }

// Eval implements Device.
func (d *Clamp) Eval(c *Context) {
	d.stamp(c)
	u := stampJunction(c, &d.law, d.j, d.b, &d.uold)
	if d.kCharge >= 0 {
		q, cap := d.law.charge(u)
		c.Capacitance(d.kCharge, d.j, d.b, q, cap)
	}
}
