package plots

import (
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"

	"zapnet/mna/study/signal"
)

// ACFigures draws a signal-side analysis: the Bode plot of every transfer
// (gain, then phase), the impedance seen at the drive with each bead's and
// capacitor's own (magnitude on log axes), and with a two-port S11 and S21
// in dB. Names: "transfer-gain", "transfer-phase", "impedance",
// "s-parameters".
func ACFigures(title string, res *signal.Result, opt *Options) ([]Figure, error) {
	o := opt.withDefaults()
	var figs []Figure
	var curves []freqCurve
	for _, n := range res.Order {
		tr := res.Nodes[n]
		curves = append(curves, freqCurve{name: n, f: tr.Freq, y: tr.GainDB})
	}
	if len(curves) > 0 {
		f, err := freqFigure(&o, freqSpec{name: "transfer-gain", title: title,
			what: "Gain from " + res.Drive.Node + " (small signal)", caption: "gain of v(node)/v(" + res.Drive.Node + ") against frequency, dB",
			ylabel: "gain [dB]", curves: curves})
		if err != nil {
			return nil, err
		}
		figs = append(figs, f)
		curves = curves[:0]
		for _, n := range res.Order {
			tr := res.Nodes[n]
			curves = append(curves, freqCurve{name: n, f: tr.Freq, y: tr.PhaseDeg})
		}
		if f, err = freqFigure(&o, freqSpec{name: "transfer-phase", title: title,
			what: "Phase from " + res.Drive.Node + " (small signal)", caption: "phase of v(node)/v(" + res.Drive.Node + ") against frequency, degrees",
			ylabel: "phase [°]", curves: curves}); err != nil {
			return nil, err
		}
		figs = append(figs, f)
	}
	curves = []freqCurve{{name: "at " + res.Drive.Node, f: res.Impedance.Freq, y: res.Impedance.MagOhm}}
	for _, n := range res.ElementOrder {
		im := res.Elements[n]
		curves = append(curves, freqCurve{name: n, f: im.Freq, y: im.MagOhm})
	}
	f, err := freqFigure(&o, freqSpec{name: "impedance", title: title,
		what: "Impedance magnitude", caption: "|Z| seen at " + res.Drive.Node + " into the network and of each bead and capacitor alone, Ω",
		ylabel: "|Z| [Ω]", logY: true, curves: curves})
	if err != nil {
		return nil, err
	}
	figs = append(figs, f)
	if tp := res.TwoPort; tp != nil {
		f, err := freqFigure(&o, freqSpec{name: "s-parameters", title: title,
			what:    "Two-port " + tp.Ports[0] + " → " + tp.Ports[1],
			caption: "S11 (return) and S21 (transmission) between ports " + tp.Ports[0] + " and " + tp.Ports[1] + ", dB",
			ylabel:  "[dB]",
			curves:  []freqCurve{{name: "S11", f: tp.Freq, y: tp.S11DB}, {name: "S21", f: tp.Freq, y: tp.S21DB}}})
		if err != nil {
			return nil, err
		}
		figs = append(figs, f)
	}
	return figs, nil
}

// freqCurve is one line of a frequency figure.
type freqCurve struct {
	name string
	f, y []float64
}

type freqSpec struct {
	name, title, what, caption, ylabel string
	logY                               bool
	curves                             []freqCurve
}

// freqFigure draws curves against frequency on a log axis.
func freqFigure(o *Options, s freqSpec) (Figure, error) {
	p := newPlot("")
	p.X.Scale = plot.LogScale{}
	p.X.Tick.Marker = decadeTicks{unit: "Hz"}
	p.X.Label.Text = "frequency"
	p.Y.Label.Text = s.ylabel
	if s.logY {
		p.Y.Scale = plot.LogScale{}
		p.Y.Tick.Marker = decadeTicks{}
	}
	var entries []legendEntry
	var names []string
	for i, c := range s.curves {
		xy := make(plotter.XYs, 0, len(c.f))
		for k := range c.f {
			y := c.y[k]
			if s.logY && !(y > 0) || math.IsNaN(y) || math.IsInf(y, 0) {
				continue
			}
			xy = append(xy, plotter.XY{X: c.f[k], Y: y})
		}
		if len(xy) == 0 {
			continue
		}
		l, err := plotter.NewLine(xy)
		if err != nil {
			return Figure{}, err
		}
		l.LineStyle = lineStyle(i)
		p.Add(l)
		entries = append(entries, legendEntry{name: c.name, thumb: l})
		names = append(names, c.name)
	}
	if !s.logY {
		padY(p)
	}
	svg, err := render(o, heading(s.title, s.what), []*plot.Plot{p}, entries)
	if err != nil {
		return Figure{}, err
	}
	return Figure{Name: s.name, Caption: s.caption, Series: names, SVG: svg}, nil
}

// decadeTicks labels every decade on a log axis with an SI prefix and
// puts minor ticks at 2…9 times each.
type decadeTicks struct{ unit string }

func (d decadeTicks) Ticks(min, max float64) []plot.Tick {
	if !(min > 0) || !(max > min) {
		return nil
	}
	var ticks []plot.Tick
	for e := math.Floor(math.Log10(min)); e <= math.Ceil(math.Log10(max)); e++ {
		base := math.Pow(10, e)
		for m := 1.0; m < 10; m++ {
			v := m * base
			if v < min*(1-1e-9) || v > max*(1+1e-9) {
				continue
			}
			t := plot.Tick{Value: v}
			if m == 1 {
				t.Label = siLabel(v, d.unit)
			}
			ticks = append(ticks, t)
		}
	}
	return ticks
}

// siLabel writes a power of ten with an SI prefix: 10k, 1M, 100m.
func siLabel(v float64, unit string) string {
	e := int(math.Round(math.Log10(v)))
	eng := e - ((e%3)+3)%3
	if eng < -15 {
		eng = -15
	}
	if eng > 9 {
		eng = 9
	}
	mant := math.Pow(10, float64(e-eng))
	sep := ""
	if unit != "" {
		sep = " "
	}
	return strconv.FormatFloat(mant, 'f', -1, 64) + sep + prefixes[eng] + unit
}
