package plots

import (
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"zapnet/devices/spec"
	"zapnet/mna/study/whatif"
)

// MaxBars bounds the parameters SensitivityBars draws: past about fifteen
// rows the names no longer fit a page, and the ranking puts the ones that
// matter first.
const MaxBars = 15

// SensitivityBars draws a sensitivity study as a ranked bar chart: one row
// per parameter, in the ranking's order from the top (at most MaxBars), each
// row two horizontal bars from the baseline worst margin to the worst margin
// with the parameter lowered and raised by the step. The baseline is a
// vertical line; where the bars reach both sides of 0 %, the zero line where
// PASS turns into FAIL is drawn too. Parameters whose perturbed circuit
// failed to solve, or whose margin is unbounded (a zero limit), cannot be
// placed: they are left out and the caption says how many. With a named
// limit (SensitivityResult.Limit) the axis is that limit's margin. title is the
// deck's title; the figure is named "sensitivity".
func SensitivityBars(title string, res *whatif.SensitivityResult, opt *Options) (Figure, error) {
	if res == nil {
		return Figure{}, fmt.Errorf("plots: sensitivity: nothing to draw")
	}
	rows, left := placedEffects(res)
	if len(rows) == 0 || !finite(res.Baseline) {
		return Figure{}, fmt.Errorf("plots: sensitivity: no parameter with a finite margin to draw")
	}
	// With a named limit the ranking is by that limit's margin alone.
	quantity := "worst margin"
	if res.Limit != "" {
		quantity = "margin of " + strings.Replace(strings.TrimSpace(res.Limit), ".", " ", 1)
	}
	step := spec.FormatFraction(res.Step) // as the table prints it
	what := strings.ToUpper(quantity[:1]) + quantity[1:] + " with each parameter changed by ±" + step
	caption := what
	if len(rows) > MaxBars {
		caption += fmt.Sprintf(" (the first %d of %d parameters)", MaxBars, len(rows))
		rows = rows[:MaxBars]
	}
	if left > 0 {
		caption += fmt.Sprintf("; %d left out (unsolved or unbounded)", left)
	}

	var o Options
	if opt != nil {
		o = *opt
	}
	// A row needs room for two bars and its name: grow the figure with the
	// number of rows rather than squeeze them.
	if o.Height == 0 {
		o.Height = vg.Length(math.Max(9, 3.5+0.7*float64(len(rows)))) * vg.Centimeter
	}
	o = o.withDefaults()
	o.Title = title

	p := newPlot("")
	p.X.Label.Text = quantity + " (% of the limit)"
	minus, plus := effectBars(p, res.Baseline, rows)
	lo, hi := marginSpan(res.Baseline, rows)
	pad := 0.05 * (hi - lo)
	p.X.Min, p.X.Max = lo-pad, hi+pad

	entries := []legendEntry{{"−" + step, minus}, {"+" + step, plus}}
	fig := Figure{Name: "sensitivity", Caption: caption, Series: []string{"−" + step, "+" + step}}
	lines, err := marginLines(p, res.Baseline, lo, hi)
	if err != nil {
		return Figure{}, fmt.Errorf("plots: sensitivity: %w", err)
	}
	for _, l := range lines {
		entries = append(entries, l)
		fig.Series = append(fig.Series, l.name)
	}
	svg, err := render(&o, heading(title, what), []*plot.Plot{p}, entries)
	if err != nil {
		return Figure{}, fmt.Errorf("plots: sensitivity: %w", err)
	}
	fig.SVG = svg
	return fig, nil
}

// finite says whether a margin can be placed on an axis.
func finite(v float64) bool { return !math.IsNaN(v) && math.Abs(v) < 1e300 }

// placedEffects are the parameters whose margins can be placed, in the
// ranking's order, and the count of those that cannot.
func placedEffects(res *whatif.SensitivityResult) (rows []whatif.ParamEffect, left int) {
	for _, p := range res.Parameters {
		if p.Error != "" || !finite(p.Minus10) || !finite(p.Plus10) {
			left++
			continue
		}
		rows = append(rows, p)
	}
	return rows, left
}

// effectBars adds to p a row per parameter, the first on top, of two bars
// from the baseline to the margin with the parameter lowered and raised.
func effectBars(p *plot.Plot, baseline float64, rows []whatif.ParamEffect) (minus, plus *plotter.Polygon) {
	names := make([]string, len(rows))
	n := len(rows)
	minus = &plotter.Polygon{Color: palette[0]}
	plus = &plotter.Polygon{Color: palette[1]}
	const half = 0.36 // of a row: the two bars and a gap between rows
	for i, r := range rows {
		// The ranking reads from the top: the first row sits highest.
		y := float64(n - 1 - i)
		names[n-1-i] = clip(r.Param, 24)
		minus.XYs = append(minus.XYs, bar(baseline, r.Minus10, y, y+half))
		plus.XYs = append(plus.XYs, bar(baseline, r.Plus10, y-half, y))
	}
	minus.LineStyle.Width, plus.LineStyle.Width = 0, 0
	p.Add(minus, plus)
	p.NominalY(names...)
	p.Y.Min, p.Y.Max = -0.6, float64(n)-0.4
	return minus, plus
}

// marginSpan is the range of margins the bars cover, the baseline's
// included; never empty.
func marginSpan(baseline float64, rows []whatif.ParamEffect) (lo, hi float64) {
	lo, hi = baseline, baseline
	for _, r := range rows {
		lo = math.Min(lo, math.Min(r.Minus10, r.Plus10))
		hi = math.Max(hi, math.Max(r.Minus10, r.Plus10))
	}
	if hi-lo < 1e-9*math.Max(1, math.Abs(hi)) {
		// No parameter moves the margin: give the axis a width to draw.
		lo, hi = lo-1, hi+1
	}
	return lo, hi
}

// marginLines adds to p the baseline and, where the bars reach both sides
// of it, the zero line where PASS turns into FAIL, with their legend
// entries.
func marginLines(p *plot.Plot, baseline, lo, hi float64) ([]legendEntry, error) {
	base, err := vline(baseline, p.Y.Min, p.Y.Max, draw.LineStyle{Color: palette[6], Width: vg.Points(1.2)})
	if err != nil {
		return nil, err
	}
	p.Add(base)
	lines := []legendEntry{{"baseline " + percent(baseline), base}} // as the table prints it
	if lo < 0 && hi > 0 {
		zero, err := vline(0, p.Y.Min, p.Y.Max, draw.LineStyle{Color: limitColor, Width: vg.Points(1),
			Dashes: []vg.Length{vg.Points(5), vg.Points(3)}})
		if err != nil {
			return nil, err
		}
		p.Add(zero)
		lines = append(lines, legendEntry{"0 %: PASS right, FAIL left", zero})
	}
	return lines, nil
}

// bar is the rectangle from x0 to x1 between heights y0 and y1.
func bar(x0, x1, y0, y1 float64) plotter.XYs {
	return plotter.XYs{{X: x0, Y: y0}, {X: x1, Y: y0}, {X: x1, Y: y1}, {X: x0, Y: y1}}
}

// vline is a vertical line at x from y0 to y1.
func vline(x, y0, y1 float64, s draw.LineStyle) (*plotter.Line, error) {
	l, err := plotter.NewLine(plotter.XYs{{X: x, Y: y0}, {X: x, Y: y1}})
	if err != nil {
		return nil, err
	}
	l.LineStyle = s
	return l, nil
}
