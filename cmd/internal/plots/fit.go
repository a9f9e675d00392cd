package plots

import (
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"zapnet/mna/fit"
)

// FitFigures draws a fit's data and model: for a clamp, a snapback clamp
// or a TLP pin the I–V curve as TLP plots show it (current against voltage,
// the measured points as marks, the model through them; "iv"); for a bead
// |Z| against frequency on log scales per bias ("z"); for an IBIS pin the
// clamp tables against the pin's current ("iv").
func FitFigures(d *fit.Document, opt *Options) ([]Figure, error) {
	o := opt.withDefaults()
	o.Title = d.Name
	if d.Bead != nil {
		f, err := beadFigure(&o, d)
		if err != nil {
			return nil, err
		}
		return []Figure{f}, nil
	}
	f, err := ivFigure(&o, d)
	if err != nil {
		return nil, err
	}
	return []Figure{f}, nil
}

// ivFigure draws current against voltage: measured points, and the model
// at the same points joined in order of current.
func ivFigure(o *Options, d *fit.Document) (Figure, error) {
	var meas, model, aside plotter.XYs
	type pt struct{ i, v float64 }
	var line []pt
	xMax, yMax := 0.0, 0.0
	for _, p := range d.Points {
		var v, i, vm float64
		switch {
		case p.XUnit == "A" && p.Unit == "V": // a clamp point: current x, voltage y
			i, v, vm = p.X, p.Measured, p.Fitted
		case p.XUnit == "V" && p.Unit == "A": // an IBIS row: voltage x, current y
			v, i, vm = p.X, p.Measured, p.X
		default:
			continue // a capacitance
		}
		xMax, yMax = math.Max(xMax, math.Abs(v)), math.Max(yMax, math.Abs(i))
		if p.Used {
			meas = append(meas, plotter.XY{X: v, Y: i})
		} else {
			aside = append(aside, plotter.XY{X: v, Y: i})
		}
		if p.XUnit == "A" {
			line = append(line, pt{i, vm})
		} else {
			line = append(line, pt{p.Fitted, vm})
		}
		xMax, yMax = math.Max(xMax, math.Abs(vm)), math.Max(yMax, math.Abs(line[len(line)-1].i))
	}
	if len(meas)+len(aside) == 0 {
		return Figure{}, fmt.Errorf("plots: %s: no I–V points to draw", d.Name)
	}
	sort.Slice(line, func(a, b int) bool { return line[a].i < line[b].i })
	xs, xp := engineering(xMax)
	ys, yp := engineering(yMax)
	for _, q := range line {
		model = append(model, plotter.XY{X: q.v * xs, Y: q.i * ys})
	}
	scale := func(p plotter.XYs) plotter.XYs {
		out := make(plotter.XYs, len(p))
		for k := range p {
			out[k] = plotter.XY{X: p[k].X * xs, Y: p[k].Y * ys}
		}
		return out
	}
	p := newPlot("")
	p.X.Label.Text = "voltage (" + xp + "V)"
	p.Y.Label.Text = "current (" + yp + "A)"
	fig := Figure{Name: "iv", Caption: fmt.Sprintf("I–V of %s: the data as marks (crosses: shown, not fitted), the fitted %s as a line", d.Name, d.Kind)}
	var entries []legendEntry
	l, err := plotter.NewLine(model)
	if err != nil {
		return Figure{}, err
	}
	l.LineStyle = lineStyle(0)
	p.Add(l)
	entries = append(entries, legendEntry{"model", l})
	fig.Series = append(fig.Series, "model")
	for k, set := range []struct {
		name string
		xy   plotter.XYs
	}{{"data", meas}, {"aside", aside}} {
		if len(set.xy) == 0 {
			continue
		}
		s, err := plotter.NewScatter(scale(set.xy))
		if err != nil {
			return Figure{}, err
		}
		s.GlyphStyle = draw.GlyphStyle{Color: palette[1+k], Radius: vg.Points(2.5), Shape: draw.CircleGlyph{}}
		if k == 1 {
			s.GlyphStyle.Shape = draw.CrossGlyph{}
		}
		p.Add(s)
		entries = append(entries, legendEntry{set.name, s})
		fig.Series = append(fig.Series, set.name)
	}
	svg, err := render(o, heading(o.Title, "I–V: data and fit"), []*plot.Plot{p}, entries)
	if err != nil {
		return Figure{}, err
	}
	fig.SVG = svg
	return fig, nil
}

// beadFigure draws |Z| against frequency on log scales, the data as marks
// and the model as a line, one colour per bias.
func beadFigure(o *Options, d *fit.Document) (Figure, error) {
	byBias := map[float64][]fit.Point{}
	var biases []float64
	for _, p := range d.Points {
		if _, ok := byBias[p.Bias]; !ok {
			biases = append(biases, p.Bias)
		}
		byBias[p.Bias] = append(byBias[p.Bias], p)
	}
	sort.Float64s(biases)
	p := newPlot("")
	p.X.Scale, p.Y.Scale = plot.LogScale{}, plot.LogScale{}
	p.X.Tick.Marker, p.Y.Tick.Marker = plot.LogTicks{Prec: -1}, plot.LogTicks{Prec: -1}
	p.X.Label.Text = "frequency (Hz)"
	p.Y.Label.Text = "|Z| (Ω)"
	fig := Figure{Name: "z", Caption: fmt.Sprintf("|Z| of %s against frequency: the data as marks, the fitted bead as lines", d.Name)}
	var entries []legendEntry
	for bi, b := range biases {
		var meas, model plotter.XYs
		for _, q := range byBias[b] {
			if q.X > 0 && q.Measured > 0 && q.Fitted > 0 {
				meas = append(meas, plotter.XY{X: q.X, Y: q.Measured})
				model = append(model, plotter.XY{X: q.X, Y: q.Fitted})
			}
		}
		if len(meas) == 0 {
			continue
		}
		name := "data"
		if len(biases) > 1 {
			name = fmt.Sprintf("data at %g A", b)
		}
		l, err := plotter.NewLine(model)
		if err != nil {
			return Figure{}, err
		}
		l.LineStyle = lineStyle(bi)
		s, err := plotter.NewScatter(meas)
		if err != nil {
			return Figure{}, err
		}
		s.GlyphStyle = draw.GlyphStyle{Color: palette[bi%len(palette)], Radius: vg.Points(2), Shape: draw.CircleGlyph{}}
		p.Add(l, s)
		entries = append(entries, legendEntry{name, s}, legendEntry{"fit" + name[4:], l})
		fig.Series = append(fig.Series, name, "fit"+name[4:])
	}
	if len(entries) == 0 {
		return Figure{}, fmt.Errorf("plots: %s: no impedance points to draw", d.Name)
	}
	svg, err := render(o, heading(o.Title, "|Z| against frequency: data and fit"), []*plot.Plot{p}, entries)
	if err != nil {
		return Figure{}, err
	}
	fig.SVG = svg
	return fig, nil
}
