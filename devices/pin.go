package devices

import "zapnet/devices/spec"

// Pin is the protected IC input of MODELS.md: node p, reference r and an
// optional supply rail.
//
//	cin between p and r (a linear charge, when cin > 0);
//	lower path p –rs– kl –diode– r, the diode's anode at r, cathode at kl:
//	    i_d(v) = is·[exp(v/(n·Vt)) − 1],  v = v(r) − v(kl);
//	with vbr, the lower path is instead an internal uni clamp from p to r:
//	    p –(rs + rdyn)– kl –junction– r, u = v(kl) − v(r), with the clamp's
//	    uni law (vbr, it, nbr, is, n); its forward term is the lower diode;
//	with rail, an upper path p –rs– ku –diode– rail (anode at ku).
//
// Each path has its own rs (default 1 Ω); a zero rs (and rdyn) joins kl or ku
// to p. The internal clamp's series resistance is rs + rdyn: the path keeps
// its rs and the clamp adds its dynamic resistance (rdyn default 0). The
// clamp keys it and nbr are read when present (defaults 1 mA and 1); cin,
// is, n default to 0, 1e-14 A and 1. The ratings vmax, vmin, ifail belong to
// the study.
//
// Probe "ipath" is the current through the internal paths, not cin: the
// lower (or internal clamp) path's current plus the upper path's, each
// counted as flowing out of p, in A. Its peak magnitude is what ifail is
// compared with.
type Pin struct {
	name    string
	nodes   [2]string
	rail    string
	cin     float64 // F
	gLow    float64 // conductance of the lower path's series resistance; 0: none
	gUp     float64 // same for the upper path
	clamp   bool    // lower path is the internal clamp
	low     clampLaw
	lowDio  diodeLaw
	upDio   diodeLaw
	hasRail bool

	p, r, rl, kl, ku int
	kCin             int
	uLow, uUp        float64 // limiting memories, V
	gmin             float64 // the engine's gmin at the last Eval, for Probe
}

func init() {
	Register(&Kind{Kind: spec.Kind{
		Name: "pin", Summary: "the protected IC input: cin, its ESD diodes, an optional internal clamp",
		Terminals: [2]string{"node", "ref"}, Role: spec.ProtectedPin, Order: 70,
		Table: spec.Table{
			Params: []spec.Param{
				spec.Default("cin", spec.Farad, spec.NonNegative, 0).Scales().
					WarnAbove(1e-9, "pin %s has cin %s: unusually large for an IC input"),
				keyIs,
				keyN,
				spec.Default("rs", spec.Ohm, spec.NonNegative, 1),
				spec.Optional("vbr", spec.Volt, spec.Positive).Noted("the internal clamp"),
				keyIt.Only("vbr"),
				keyNbr.Only("vbr"),
				spec.Default("rdyn", spec.Ohm, spec.NonNegative, 0).Only("vbr").
					WarnAbove(100, "pin %s has rdyn %s: unusually high"),
				spec.Limit("vmax", spec.Volt, spec.Any, spec.HighVoltage, true, "residual peak"),
				spec.Limit("vmin", spec.Volt, spec.Any, spec.LowVoltage, false, "residual low"),
				spec.Limit("ifail", spec.Ampere, spec.Positive, spec.PeakCurrent, true, "internal clamp current").Of("ipath"),
				// The signal side's limits, judged by the small-signal
				// study and the edge check, not by a strike's run: the
				// peaking of the transfer to the pin (dB), the capacitance
				// the pin's node sees and the 10–90 % rise of an edge there.
				spec.Optional("peaking", spec.Dimensionless, spec.Positive).Noted("in dB").As(spec.Rating),
				spec.Optional("cmax", spec.Farad, spec.Positive).As(spec.Rating),
				spec.Optional("rise", spec.Second, spec.Positive).As(spec.Rating),
			},
			Words: []spec.Word{
				{Key: "rail", Node: true, Fixed: true},
				{Key: "table", Path: true, Fixed: true},
				{Key: "ibis", Path: true, Fixed: true, Caution: ibisCaution},
				{Key: "model"},
				{Key: "corner", Choices: []string{"typ", "min", "max"}},
			},
		},
	}, New: newPin})
}

// newPin builds a protected pin from its checked values.
func newPin(name string, nodes [2]string, v *spec.Values) (Device, error) {
	if v.Word("table") != "" || v.Word("ibis") != "" || v.Word("model") != "" {
		return newTablePin(name, nodes, v)
	}
	is, n, rs := v.Num("is"), v.Num("n"), v.Num("rs")
	d := &Pin{name: name, nodes: nodes, cin: v.Num("cin")}
	rLow := rs
	if vbr, ok := v.Lookup("vbr"); ok {
		rLow += v.Num("rdyn")
		d.clamp = true
		d.low = newClampLaw(vbr, v.Num("it"), v.Num("nbr"), is, n, false)
	} else {
		d.lowDio = newDiodeLaw(is, n, 0, 0)
	}
	if rail := v.Word("rail"); rail != "" {
		d.hasRail, d.rail = true, rail
		d.upDio = newDiodeLaw(is, n, 0, 0)
		if rs > 0 {
			d.gUp = 1 / rs
		}
	}
	if rLow > 0 {
		d.gLow = 1 / rLow
	}
	return d, nil
}

// Name implements Device.
func (d *Pin) Name() string { return d.name }

// Layout implements Device.
func (d *Pin) Layout() Layout {
	l := Layout{Terminals: []string{d.nodes[0], d.nodes[1]}}
	if d.hasRail {
		l.Terminals = append(l.Terminals, d.rail)
	}
	if d.gLow > 0 {
		l.Internal = append(l.Internal, "low")
	}
	if d.hasRail && d.gUp > 0 {
		l.Internal = append(l.Internal, "up")
	}
	return l
}

// Bind implements Device.
func (d *Pin) Bind(n Nodes) []StateRows {
	d.p, d.r, d.rl = n.Terminals[0], n.Terminals[1], Ground
	if d.hasRail {
		d.rl = n.Terminals[2]
	}
	d.kl, d.ku = d.p, d.p
	k := 0
	if d.gLow > 0 {
		d.kl = n.Internal[k]
		k++
	}
	if d.hasRail && d.gUp > 0 {
		d.ku = n.Internal[k]
	}
	d.kCin = -1
	if d.cin > 0 {
		d.kCin = 0
		return []StateRows{{Plus: d.p, Minus: d.r}}
	}
	return nil
}

// Reset implements Resetter.
func (d *Pin) Reset() { d.uLow, d.uUp = 0, 0 }

// Eval implements Device.
func (d *Pin) Eval(c *Context) {
	d.gmin = c.Gmin
	if d.kCin >= 0 {
		u := c.V(d.p) - c.V(d.r)
		c.Capacitance(d.kCin, d.p, d.r, d.cin*u, d.cin)
	}
	if d.gLow > 0 {
		c.Conductance(d.p, d.kl, d.gLow)
	}
	if d.clamp {
		stampJunction(c, &d.low, d.kl, d.r, &d.uLow)
	} else {
		stampJunction(c, &d.lowDio, d.r, d.kl, &d.uLow)
	}
	if d.hasRail {
		if d.gUp > 0 {
			c.Conductance(d.p, d.ku, d.gUp)
		}
		stampJunction(c, &d.upDio, d.ku, d.rl, &d.uUp)
	}
}

// Probes implements Prober.
func (d *Pin) Probes() []Probe { return []Probe{{Name: "ipath", Unit: spec.Ampere}} }

// Probe implements Prober: dst[0] is ipath at the solution x.
func (d *Pin) Probe(x []float64, dst []float64) {
	var out float64
	switch {
	case d.gLow > 0:
		out = (at(x, d.p) - at(x, d.kl)) * d.gLow
	case d.clamp:
		u := at(x, d.kl) - at(x, d.r)
		i, _ := d.low.current(u)
		out = i + d.gmin*u
	default:
		v := at(x, d.r) - at(x, d.kl)
		i, _ := d.lowDio.current(v)
		out = -(i + d.gmin*v)
	}
	if d.hasRail {
		if d.gUp > 0 {
			out += (at(x, d.p) - at(x, d.ku)) * d.gUp
		} else {
			v := at(x, d.ku) - at(x, d.rl)
			i, _ := d.upDio.current(v)
			out += i + d.gmin*v
		}
	}
	dst[0] = out
}
