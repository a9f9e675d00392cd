package plots

import (
	"fmt"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"zapnet/devices/spec"
	"zapnet/mna/study"
	"zapnet/netlist"
)

// RunFigures draws one recorded run: the strike current, the watched node
// voltages (the pin nodes when nothing is watched), the clamp currents with
// their ipp, the residual pulse of each protected pin with its vmax and vmin,
// and the energy ledger. A figure with nothing to show (no clamp, no pin) is
// left out. c is the circuit the run solved; it names the strike and each
// pin's reference node (nil: the strike is called "strike" and pins refer to
// ground).
func RunFigures(c *netlist.Circuit, r *study.Run, opt *Options) ([]Figure, error) {
	if r.Err != nil {
		return nil, fmt.Errorf("plots: run %s was not solved: %w", RunLabel(r), r.Err)
	}
	w := r.Waves
	if w == nil {
		return nil, errNotRecorded
	}
	o := opt.withDefaults()
	label := RunLabel(r)
	closeUp := closeUpSpan(w)
	var figs []Figure
	add := func(f Figure, err error) error {
		if err != nil {
			return err
		}
		figs = append(figs, f)
		return nil
	}

	if w.Strike != nil {
		name, node := strikeOf(c)
		what := fmt.Sprintf("Strike current into %s, %s %s", node, r.Waveform, label)
		if err := add(timeFigure(&o, timeSpec{name: "strike", what: what, caption: what,
			quantity: "current", unit: "A", curves: []curve{{name, w.Time, w.Strike}}, closeUp: closeUp})); err != nil {
			return nil, err
		}
	}

	nodes, nodeLimits := nodeCurves(r)
	if len(nodes) > 0 {
		what := "Node voltages, " + label
		if err := add(timeFigure(&o, timeSpec{name: "nodes", what: what, caption: what,
			quantity: "voltage", unit: "V", curves: nodes, limits: nodeLimits, closeUp: closeUp})); err != nil {
			return nil, err
		}
	}

	clamps, clampLimits := clampCurves(r)
	if len(clamps) > 0 {
		what := "Clamp current, " + label
		if err := add(timeFigure(&o, timeSpec{name: "clamps", what: what, caption: what,
			quantity: "current", unit: "A", curves: clamps, limits: clampLimits, closeUp: closeUp})); err != nil {
			return nil, err
		}
	}

	for _, pin := range r.Pins() {
		f, err := residualFigure(&o, c, []study.Run{*r}, nil, pin, "residual-"+pin.Name,
			fmt.Sprintf("Residual pulse at %s, %s", pin.Name, label), closeUp)
		if err := add(f, err); err != nil {
			return nil, err
		}
	}

	if err := add(ledgerFigure(&o, r)); err != nil {
		return nil, err
	}
	return figs, nil
}

// nodeCurves are the voltages of the watched nodes (of the pins' nodes when
// nothing is watched), with the watched nodes' max and min.
func nodeCurves(r *study.Run) ([]curve, []limitLine) {
	w := r.Waves
	var nodes []curve
	var limits []limitLine
	watched := map[string]bool{}
	for _, n := range r.Nodes {
		watched[n.Name] = n.Watched
	}
	anyWatch := false
	for _, n := range r.Nodes {
		anyWatch = anyWatch || n.Watched
	}
	for _, n := range r.Nodes {
		if (anyWatch && !n.Watched) || (!anyWatch && !n.Pin) {
			continue
		}
		if v := nodeWave(w, n.Name); v != nil {
			nodes = append(nodes, curve{n.Name, w.Time, v})
		}
	}
	for _, l := range r.Limits {
		if (l.Param == "max" || l.Param == "min") && watched[l.Element] {
			limits = append(limits, limitLine{l.Element + " " + l.Param + " " + spec.FormatSI(l.Value, "V"), l.Value})
		}
	}
	return nodes, limits
}

// clampCurves are the currents of the clamps, with their ipp.
func clampCurves(r *study.Run) ([]curve, []limitLine) {
	w := r.Waves
	var clamps []curve
	var limits []limitLine
	for _, e := range r.Elements {
		if e.Role != spec.Protector {
			continue
		}
		i := elementWave(w, e.Name)
		if i == nil {
			continue
		}
		clamps = append(clamps, curve{e.Name, w.Time, i})
		if l := r.LimitOn(e.Name, spec.PeakCurrent); l != nil {
			// The rating bounds |i|: draw it on the side the current
			// went.
			v := math.Copysign(l.Value, signAtPeak(i))
			limits = append(limits, limitLine{e.Name + " " + l.Param + " " + spec.FormatSI(v, "A"), v})
		}
	}
	return clamps, limits
}

// residualFigure draws the residual pulse v(pin) − v(ref) of pin in each of
// runs, with the pin's vmax and vmin; label names each run's line (nil: the
// line is named by its nodes).
func residualFigure(o *Options, c *netlist.Circuit, runs []study.Run, label func(*study.Run) string, pin *study.Residual, name, what string, closeUp float64) (Figure, error) {
	ref := refOf(c, pin.Name)
	var cs []curve
	for i := range runs {
		w := runs[i].Waves
		res := residualWave(w, pin.Node, ref)
		if res == nil {
			continue
		}
		n := pin.Node
		if ref != "gnd" {
			n += " − " + ref
		}
		if label != nil {
			n = label(&runs[i])
		}
		cs = append(cs, curve{n, w.Time, res})
	}
	var lims []limitLine
	if pin.HasVmax {
		lims = append(lims, limitLine{"vmax " + spec.FormatSI(pin.Vmax, "V"), pin.Vmax})
	}
	if pin.HasVmin {
		lims = append(lims, limitLine{"vmin " + spec.FormatSI(pin.Vmin, "V"), pin.Vmin})
	}
	return timeFigure(o, timeSpec{name: name, what: what, caption: what,
		quantity: "residual voltage", unit: "V", curves: cs, limits: lims, closeUp: closeUp})
}

// ledgerFigure draws where the strike's energy went, one bar per element,
// the strike's delivered energy first and the balance (solver residual) last.
func ledgerFigure(o *Options, r *study.Run) (Figure, error) {
	names := []string{"strike (delivered)"}
	vals := plotter.Values{-r.Ledger.Strike}
	shares := []string{""}
	if r.Ledger.Delivered > 0 {
		shares[0] = percent(100 * -r.Ledger.Strike / r.Ledger.Delivered)
	}
	kind := map[string]string{}
	for _, e := range r.Elements {
		kind[e.Name] = e.Kind
	}
	for _, e := range r.Ledger.Entries {
		name := e.Name
		if k := kind[e.Name]; k != "" {
			name += " (" + k + ")"
		}
		names = append(names, name)
		vals = append(vals, e.Energy)
		shares = append(shares, percent(math.Abs(e.Percent)))
	}
	names = append(names, "balance")
	vals = append(vals, r.Ledger.Balance)
	shares = append(shares, "")

	maxAbs := 0.0
	for _, v := range vals {
		maxAbs = math.Max(maxAbs, math.Abs(v))
	}
	s, pfx := engineering(maxAbs)
	// Bars read top-down in ledger order: the plot counts from the bottom.
	n := len(vals)
	scaled := make(plotter.Values, n)
	labels := plotter.XYLabels{XYs: make(plotter.XYs, n), Labels: make([]string, n)}
	ynames := make([]string, n)
	for i, v := range vals {
		j := n - 1 - i
		scaled[j] = v * s
		ynames[j] = names[i]
		labels.XYs[j] = plotter.XY{X: math.Max(v*s, 0), Y: float64(j)}
		labels.Labels[j] = " " + spec.FormatSI(v, "J")
		if shares[i] != "" {
			labels.Labels[j] += " (" + shares[i] + ")"
		}
	}

	what := "Energy ledger, " + RunLabel(r)
	p := newPlot("")
	p.X.Label.Text = "energy (" + pfx + "J)"
	bars, err := plotter.NewBarChart(scaled, vg.Points(12))
	if err != nil {
		return Figure{}, fmt.Errorf("plots: ledger: %w", err)
	}
	bars.Horizontal = true
	bars.Color = palette[0]
	bars.LineStyle = draw.LineStyle{}
	p.Add(bars)
	lab, err := plotter.NewLabels(labels)
	if err != nil {
		return Figure{}, fmt.Errorf("plots: ledger: %w", err)
	}
	for i := range lab.TextStyle {
		lab.TextStyle[i].Font = tickFont
		lab.TextStyle[i].YAlign = draw.YCenter
	}
	p.Add(lab)
	p.NominalY(ynames...)
	p.Y.Tick.Label.Font = labelFont
	// Room on the right for the value labels.
	lo, hi := math.Min(p.X.Min, 0), math.Max(p.X.Max, 0)
	p.X.Min, p.X.Max = lo, hi+0.45*(hi-lo)
	svg, err := render(o, heading(o.Title, what), []*plot.Plot{p}, nil)
	if err != nil {
		return Figure{}, fmt.Errorf("plots: ledger: %w", err)
	}
	return Figure{Name: "ledger", Caption: what, Series: names, SVG: svg}, nil
}

// strikeOf names the strike and the node it drives.
func strikeOf(c *netlist.Circuit) (name, node string) {
	if c != nil {
		if s := c.Strike(); s != nil && len(s.Nodes) > 0 {
			return s.Name, s.Nodes[0]
		}
	}
	return "strike", "its node"
}

// refOf is the reference node of a protected pin ("gnd" when unknown).
func refOf(c *netlist.Circuit, pin string) string {
	if c != nil {
		if e := c.Element(pin); e != nil && len(e.Nodes) > 1 {
			return e.Nodes[1]
		}
	}
	return "gnd"
}

func nodeWave(w *study.Waves, node string) []float64 {
	for i, n := range w.Nodes {
		if n == node {
			return w.V[i]
		}
	}
	return nil
}

func elementWave(w *study.Waves, name string) []float64 {
	for i, n := range w.Elements {
		if n == name {
			return w.I[i]
		}
	}
	return nil
}

// residualWave is v(node) − v(ref); ground (and any node not recorded) is
// at zero volts.
func residualWave(w *study.Waves, node, ref string) []float64 {
	v := nodeWave(w, node)
	if v == nil {
		return nil
	}
	r := nodeWave(w, ref)
	if r == nil {
		return v
	}
	d := make([]float64, len(v))
	for k := range v {
		d[k] = v[k] - r[k]
	}
	return d
}

// signAtPeak is the sign of the sample of largest magnitude (+1 for none).
func signAtPeak(y []float64) float64 {
	best := 0.0
	for _, v := range y {
		if math.Abs(v) > math.Abs(best) {
			best = v
		}
	}
	if best < 0 {
		return -1
	}
	return 1
}

// closeUpSpan is the span of the close-up panel: twelve times the time the
// strike's current peaks, rounded up to 1, 2 or 5 times a power of ten. For
// the IEC 61000-4-2 current, peaking near 0.8 ns, that is 10 ns: the first
// peak, the residual's fast edge and the clamp turning on, which a window of
// microseconds would squeeze into one pixel. Zero without a strike current.
func closeUpSpan(w *study.Waves) float64 {
	best, at := 0.0, 0.0
	for k, v := range w.Strike {
		if math.Abs(v) > best {
			best, at = math.Abs(v), w.Time[k]
		}
	}
	if at <= 0 {
		return 0
	}
	return spec.NiceCeil(12 * at)
}

// percent is a share as the tables print it, without "-0.0 %".
func percent(p float64) string {
	if math.Abs(p) < 0.05 {
		p = 0
	}
	return fmt.Sprintf("%.1f %%", p)
}
