package devices

import "zapnet/devices/spec"

// capacitor is the chain a –esr– r –esl– l –C– b (MODELS.md, linear parts).
// A zero parasitic adds no unknown: without esr, r is a; without esl, l is r.
// States: 0 the charge C·v(l, b); 1 the flux esl·i of the esl branch.
type capacitor struct {
	name          string
	nodes         [2]string
	c, gesr, esl  float64
	a, b, r, l, i int
}

func init() {
	Register(&Kind{Kind: spec.Kind{
		Name: "capacitor", Summary: "a capacitor with optional esr and esl", Terminals: [2]string{"a", "b"},
		Role: spec.Storage, Order: 20, DC: spec.Blocks,
		Table: spec.Table{Params: []spec.Param{
			spec.Required("value", spec.Farad, spec.Positive).Scales().
				WarnFrom(0.1, "capacitor %s is %s: unusually large for a capacitor on a protected line"),
			spec.Default("esr", spec.Ohm, spec.NonNegative, 0),
			spec.Default("esl", spec.Henry, spec.NonNegative, 0),
			spec.Limit("rating", spec.Volt, spec.Positive, spec.PeakVoltage, true, "dielectric voltage").Of("vc"),
		}},
	}, New: newCapacitor})
}

func newCapacitor(name string, nodes [2]string, v *spec.Values) (Device, error) {
	esr := v.Num("esr")
	d := &capacitor{name: name, nodes: nodes, c: v.Num("value"), esl: v.Num("esl")}
	if esr > 0 {
		d.gesr = 1 / esr
	}
	return d, nil
}

func (d *capacitor) Name() string { return d.name }

func (d *capacitor) Layout() Layout {
	l := Layout{Terminals: d.nodes[:]}
	if d.gesr > 0 {
		l.Internal = append(l.Internal, "esr")
	}
	if d.esl > 0 {
		l.Internal = append(l.Internal, "esl")
		l.Branches = []string{"i"}
	}
	return l
}

func (d *capacitor) Bind(n Nodes) []StateRows {
	d.a, d.b = n.Terminals[0], n.Terminals[1]
	d.r, d.l, d.i = d.a, d.a, Ground
	k := 0
	if d.gesr > 0 {
		d.r = n.Internal[k]
		d.l = d.r
		k++
	}
	rows := []StateRows{{}}
	if d.esl > 0 {
		d.l = n.Internal[k]
		d.i = n.Branches[0]
		rows = append(rows, StateRows{Plus: Ground, Minus: d.i})
	}
	rows[0] = StateRows{Plus: d.l, Minus: d.b}
	return rows
}

// Probes implements Prober: "vc" is the voltage on the dielectric, across C
// alone, which is what a capacitor's voltage rating is about; the drop
// across esr and esl is not on the dielectric.
func (d *capacitor) Probes() []Probe { return []Probe{{Name: "vc", Unit: spec.Volt}} }

// Probe implements Prober.
func (d *capacitor) Probe(x []float64, dst []float64) { dst[0] = at(x, d.l) - at(x, d.b) }

func (d *capacitor) Eval(c *Context) {
	if d.gesr > 0 {
		c.Conductance(d.a, d.r, d.gesr)
	}
	if d.esl > 0 {
		stampBranch(c, 1, d.r, d.l, d.i, d.esl)
	}
	c.Capacitance(0, d.l, d.b, d.c*(c.V(d.l)-c.V(d.b)), d.c)
}
