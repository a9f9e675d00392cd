package study

import (
	"context"
	"math"

	"zapnet/devices/spec"
	"zapnet/mna"
	"zapnet/netlist"
)

// Verification is a run's error bar: each headline number of the run
// beside the same number solved at a tenfold tighter accuracy. The engine's
// error falls about tenfold with the accuracy, so the difference is the
// run's own error to within about a tenth of itself.
type Verification struct {
	// Accuracy is the relative accuracy the run asked for; Tighter the
	// one it was solved again at (Accuracy/10).
	Accuracy float64 `json:"accuracy"`
	Tighter  float64 `json:"tighter"`
	// Quantities are every headline number: each node's extremes, each
	// element's peak current, the energy each resistor, protector and pin
	// takes, each pin's residual and internal-path current, each probe's
	// peak, each limit's measured value; each number once (a limit or a
	// probe that reads a number already listed is not listed again).
	Quantities []VerifiedQuantity `json:"quantities"`
	// Worst is the quantity whose relative difference is largest against
	// the accuracy it is held to; Beyond counts those whose difference
	// exceeds it.
	Worst  *VerifiedQuantity `json:"worst,omitempty"`
	Beyond int               `json:"beyond"`
	// Error says why the tighter solution failed; the quantities are then
	// empty.
	Error string `json:"error,omitempty"`
}

// VerifiedQuantity is one headline number and its check.
type VerifiedQuantity struct {
	Name    string    `json:"name"` // "n1 max", "D1 energy", "U1 residual peak"
	Unit    spec.Unit `json:"unit"`
	Value   float64   `json:"value"`
	Tighter float64   `json:"tighter"`
	// Difference is Value − Tighter; Relative is |Difference| over the
	// quantity's scale: for a highest or lowest voltage the largest
	// magnitude it reached on its side of zero, and at least
	// mna.SideFloor of its largest on either side (as the engine states
	// its accuracy); for an energy the larger of itself and the energy
	// the strike moved through the element in either direction
	// (ElementResult.Gross: a load on a rail that the strike lifts and
	// then pulls below its rest nets the small difference of the two); for
	// the others the larger magnitude of the two; at least the noise
	// floor: a millivolt, a milliampere, and for an energy a
	// hundred-thousandth of the energy delivered (the integrator leaves
	// the net energy of a part that only stores it, an inductor carrying
	// the strike, at a few millionths of the delivered). Scale is that
	// scale.
	Difference float64 `json:"difference"`
	Relative   float64 `json:"relative"`
	Scale      float64 `json:"scale"`
	// Asked is the relative accuracy the quantity is held to: the run's
	// Accuracy, and mna.PinCurrentFactor times it for a protected pin's
	// currents. Within says Relative is at most Asked.
	Asked  float64 `json:"asked"`
	Within bool    `json:"within"`
}

// Accuracy is the relative accuracy the runs of c ask of the engine under
// opt: the options' window, else the deck's, else the default.
func Accuracy(c *netlist.Circuit, opt *Options) float64 {
	if a := windowOf(c, opt).Accuracy; a > 0 {
		return a
	}
	return mna.DefaultAccuracy
}

// Tighter returns a copy of opt that solves at a tenth of the accuracy
// the runs of c ask for, without recording waveforms; an expert's RelTol
// and ChargeTol in opt.Settings are dropped, so that the accuracy alone
// decides.
func Tighter(c *netlist.Circuit, opt *Options) *Options {
	var t Options
	if opt != nil {
		t = *opt
	}
	t.Window.Accuracy, t.Record = Accuracy(c, opt)/10, false
	if t.Settings != nil {
		s := *t.Settings
		s.RelTol, s.ChargeTol = 0, 0
		t.Settings = &s
	}
	return &t
}

// Verify solves each solved run of runs again at a tenth of its accuracy
// (an expert's RelTol and ChargeTol in opt.Settings are dropped for it, so
// that the accuracy alone decides) and sets the run's Verify. Runs that
// were not solved are left alone. The error joins the tighter solves that
// failed and ctx's error when it stopped them; a run without its check
// then says why in its Verify.
func Verify(ctx context.Context, c *netlist.Circuit, runs []Run, opt *Options) error {
	acc := Accuracy(c, opt)
	tight := Tighter(c, opt)
	var jobs []Job
	at := map[int]int{} // job index → place in runs
	for i := range runs {
		if runs[i].Err == nil && runs[i].Error == "" {
			jobs = append(jobs, runs[i].Job())
			at[runs[i].Index] = i
		}
	}
	checked, err := Execute(ctx, c, jobs, tight, nil)
	for k := range checked {
		t := &checked[k]
		r := &runs[at[t.Index]]
		if t.Err != nil {
			r.Verify = &Verification{Accuracy: acc, Tighter: acc / 10, Error: t.Err.Error()}
			continue
		}
		r.Verify = compare(r, t, acc)
	}
	return err
}

// compare builds the verification of run r against the tighter run t.
func compare(r, t *Run, acc float64) *Verification {
	c := &comparison{v: &Verification{Accuracy: acc, Tighter: acc / 10},
		energyFloor: 1e-5 * math.Abs(r.Ledger.Delivered),
		scaleOf:     map[float64]float64{}, listed: map[[2]float64]bool{}}
	for i, n := range r.Nodes {
		if i >= len(t.Nodes) || t.Nodes[i].Name != n.Name {
			continue
		}
		c.extremes(n.Name, n.Max, n.Min, t.Nodes[i].Max, t.Nodes[i].Min, "max", "min")
	}
	for i := range r.Elements {
		if i >= len(t.Elements) || t.Elements[i].Name != r.Elements[i].Name {
			continue
		}
		c.element(&r.Elements[i], &t.Elements[i])
	}
	for i, l := range r.Limits {
		if i >= len(t.Limits) || t.Limits[i].Name() != l.Name() {
			continue
		}
		c.add(l.Name()+" measured", l.Unit, l.Measured, t.Limits[i].Measured, acc)
	}
	return c.v
}

// comparison is a verification being built.
type comparison struct {
	v           *Verification
	energyFloor float64             // J: a hundred-thousandth of the energy delivered
	scaleOf     map[float64]float64 // an extreme's scale, by its value (for the limits that read it)
	listed      map[[2]float64]bool // the numbers listed, by value and tighter value
}

// addAt compares a and b relative to scale, at least the unit's noise
// floor, and holds the difference to asked; a number listed already (a
// pin's residual peak is its node's highest, a limit reads a peak) is not
// listed again.
func (c *comparison) addAt(name string, unit spec.Unit, a, b, scale, asked float64) {
	if (a != 0 || b != 0) && c.listed[[2]float64{a, b}] {
		return
	}
	floor := 0.0
	switch unit {
	case spec.Volt, spec.Ampere:
		floor = 1e-3
	case spec.Joule:
		floor = c.energyFloor
	}
	d := a - b
	scale = math.Max(scale, floor)
	rel := math.Abs(d) / scale
	if math.IsNaN(rel) || math.IsInf(rel, 0) {
		rel = 0
	}
	c.listed[[2]float64{a, b}] = true
	q := VerifiedQuantity{Name: name, Unit: unit, Value: a, Tighter: b, Difference: d, Relative: rel,
		Scale: scale, Asked: asked, Within: rel <= asked}
	v := c.v
	v.Quantities = append(v.Quantities, q)
	if !q.Within {
		v.Beyond++
	}
	if v.Worst == nil || q.Relative/q.Asked > v.Worst.Relative/v.Worst.Asked {
		w := q
		v.Worst = &w
	}
}

// add adds a number at the scale an extreme gave it, or its own, held to
// asked.
func (c *comparison) add(name string, unit spec.Unit, a, b, asked float64) {
	s, ok := c.scaleOf[a]
	if !ok {
		s = math.Max(math.Abs(a), math.Abs(b))
	}
	c.addAt(name, unit, a, b, s, asked)
}

// extremes compares a highest and a lowest value as the engine states its
// accuracy: each relative to the largest magnitude the quantity reached on
// its side of zero (a rail's dip to 0.5 V from 5 V is held to a share of
// 5 V, not of 0.5 V), and at least mna.SideFloor of the largest on either
// side (a pin's dip to −0.4 V after +99 V is held to a share of 5 V).
func (c *comparison) extremes(name string, hi, lo, thi, tlo float64, hiName, loName string) {
	up, down := math.Max(math.Max(hi, thi), 0), -math.Min(math.Min(lo, tlo), 0)
	floor := mna.SideFloor * math.Max(up, down)
	side := func(x float64) float64 {
		if x >= 0 {
			return math.Max(up, floor)
		}
		return math.Max(down, floor)
	}
	c.scaleOf[hi], c.scaleOf[lo] = side(hi), side(lo)
	c.addAt(name+" "+hiName, spec.Volt, hi, thi, side(hi), c.v.Accuracy)
	c.addAt(name+" "+loName, spec.Volt, lo, tlo, side(lo), c.v.Accuracy)
}

// element compares an element's numbers: its peak current, the energy a
// resistor, protector or pin takes, a pin's residual and internal-path
// current, its probes' peaks. A pin's currents are held to
// mna.PinCurrentFactor times the accuracy.
func (c *comparison) element(e, te *ElementResult) {
	acc := c.v.Accuracy
	cur := acc
	if e.Role == spec.ProtectedPin {
		cur = mna.PinCurrentFactor * acc
	}
	c.add(e.Name+" peak current", spec.Ampere, e.PeakCurrent, te.PeakCurrent, cur)
	// The energy a part dissipates is a headline number; what a part that
	// stores or carries energy nets over the window is the small
	// difference of what went in and came back, left out.
	switch e.Role {
	case spec.Passive, spec.Protector, spec.ProtectedPin:
		// A limit on the energy (emax) reads the same number, at the
		// same scale.
		s := math.Max(math.Max(math.Abs(e.Energy), math.Abs(te.Energy)), math.Max(e.Gross, te.Gross))
		c.scaleOf[e.Energy] = s
		c.addAt(e.Name+" energy", spec.Joule, e.Energy, te.Energy, s, acc)
	}
	if e.Residual != nil && te.Residual != nil {
		c.extremes(e.Name, e.Residual.Peak, e.Residual.Min, te.Residual.Peak, te.Residual.Min, "residual peak", "residual low")
		c.add(e.Name+" internal-path current", spec.Ampere, e.Residual.IPath, te.Residual.IPath, cur)
	}
	for _, p := range e.Probes {
		if tp := te.Probe(p.Name); tp != nil {
			asked := acc
			if p.Unit == spec.Ampere {
				asked = cur
			}
			c.add(e.Name+"."+p.Name+" peak", p.Unit, p.Peak, tp.Peak, asked)
		}
	}
}
