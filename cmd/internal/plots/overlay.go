package plots

import (
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"zapnet/devices/spec"
	"zapnet/mna/study"
	"zapnet/netlist"
)

// Overlays draws one quantity across runs, one line per run: the residual
// pulse of each protected pin (with vmax and vmin) and the current of each
// clamp (with ipp on both sides, since polarities differ). The runs of the
// first variant are compared across levels and polarities ("2 kV pos",
// "2 kV neg", ...); with several variants, the runs at the highest level are
// compared across variants too, one figure per polarity, each line named by
// its variant. Unsolved and unrecorded runs are skipped; a group of fewer
// than two runs draws nothing. At most Options.MaxOverlay runs are drawn in
// one figure, the first in plan order, and the caption says so.
func Overlays(c *netlist.Circuit, runs []study.Run, opt *Options) ([]Figure, error) {
	o := opt.withDefaults()
	var solved []study.Run
	for _, r := range runs {
		if r.Err == nil && r.Waves != nil {
			solved = append(solved, r)
		}
	}
	if len(solved) == 0 {
		return nil, nil
	}
	var figs []Figure
	for _, g := range overlayGroups(solved) {
		if len(g.runs) < 2 {
			continue
		}
		fs, err := g.figures(&o, c)
		if err != nil {
			return nil, err
		}
		figs = append(figs, fs...)
	}
	return figs, nil
}

// overlayGroup is a set of runs compared in one figure a quantity.
type overlayGroup struct {
	name, what string
	runs       []study.Run
	label      func(*study.Run) string
}

// overlayGroups groups the solved runs as Overlays compares them: the
// first variant's across levels and polarities, and with several variants
// every variant's run at the highest level, a group a polarity.
func overlayGroups(solved []study.Run) []overlayGroup {
	var groups []overlayGroup
	first := solved[0].VariantIndex
	var levels []study.Run
	several := false
	for _, r := range solved {
		if r.VariantIndex == first {
			levels = append(levels, r)
		} else {
			several = true
		}
	}
	g := overlayGroup{name: "overlay", what: "every run", runs: levels,
		label: func(r *study.Run) string { return spec.FormatSI(r.Level, r.LevelUnit) + " " + r.Polarity }}
	if several {
		g.what = "every level, " + levels[0].Variant.String()
	}
	groups = append(groups, g)
	if !several {
		return groups
	}
	top := math.Inf(-1)
	for _, r := range solved {
		top = math.Max(top, r.Level)
	}
	for _, pol := range []string{"pos", "neg"} {
		var vs []study.Run
		for _, r := range solved {
			if r.Level == top && r.Polarity == pol {
				vs = append(vs, r)
			}
		}
		if len(vs) == 0 {
			continue
		}
		groups = append(groups, overlayGroup{name: "overlay-variants-" + pol,
			what:  "every variant, " + spec.FormatSI(top, vs[0].LevelUnit) + " " + pol,
			runs:  vs,
			label: func(r *study.Run) string { return r.Variant.String() }})
	}
	return groups
}

// figures draws the group's figures: the residual pulse at each protected
// pin and the current in each clamp, of at most o.MaxOverlay runs.
func (g overlayGroup) figures(o *Options, c *netlist.Circuit) ([]Figure, error) {
	use := g.runs
	note := ""
	if len(use) > o.MaxOverlay {
		note = fmt.Sprintf(" (the first %d of %d runs)", o.MaxOverlay, len(use))
		use = use[:o.MaxOverlay]
	}
	var figs []Figure
	ref := &use[0]
	closeUp := closeUpSpan(ref.Waves)
	for _, pin := range ref.Pins() {
		what := "Residual pulse at " + pin.Name + ", " + g.what + note
		f, err := residualFigure(o, c, use, g.label, pin, g.name+"-residual-"+pin.Name, what, closeUp)
		if err != nil {
			return nil, err
		}
		figs = append(figs, f)
	}
	for _, e := range ref.Elements {
		if e.Role != spec.Protector {
			continue
		}
		var cs []curve
		for i := range use {
			if iw := elementWave(use[i].Waves, e.Name); iw != nil {
				cs = append(cs, curve{g.label(&use[i]), use[i].Waves.Time, iw})
			}
		}
		var lims []limitLine
		if l := ref.LimitOn(e.Name, spec.PeakCurrent); l != nil {
			lims = append(lims, limitLine{l.Param + " +" + spec.FormatSI(l.Value, "A"), l.Value},
				limitLine{l.Param + " " + spec.FormatSI(-l.Value, "A"), -l.Value})
		}
		what := "Current in " + e.Name + ", " + g.what + note
		f, err := timeFigure(o, timeSpec{name: g.name + "-clamp-" + e.Name, what: what, caption: what,
			quantity: "current", unit: "A", curves: cs, limits: lims, closeUp: closeUp})
		if err != nil {
			return nil, err
		}
		figs = append(figs, f)
	}
	return figs, nil
}

// MarginSeries is one margin search: the worst margin found at each level it
// tried, for one polarity (and variant).
type MarginSeries struct {
	// Name is the legend entry: "pos", "neg", "C1.value=1u pos".
	Name string
	// Levels are the levels tried, in the waveform's unit (V for
	// discharges), in any order.
	Levels []float64
	// Margins are the worst margin at each level, percent of the limit
	// (study.Run.Worst.Percent): positive passes, negative fails.
	Margins []float64
}

// MarginCurve draws the worst margin against level for one or more margin
// searches, one line with markers per series, and the zero line where a run
// turns from PASS to FAIL. unit is the level's unit ("V" for discharges,
// "A", or "" for a waveform's own unit); title is the deck's title.
func MarginCurve(title string, unit spec.Unit, curves []MarginSeries, opt *Options) (Figure, error) {
	o := opt.withDefaults()
	o.Title = title
	if len(curves) == 0 {
		return Figure{}, fmt.Errorf("plots: margin: nothing to draw")
	}
	lMax := 0.0
	for _, c := range curves {
		if len(c.Levels) != len(c.Margins) {
			return Figure{}, fmt.Errorf("plots: margin: %s has %d levels and %d margins", c.Name, len(c.Levels), len(c.Margins))
		}
		for _, l := range c.Levels {
			lMax = math.Max(lMax, math.Abs(l))
		}
	}
	ls, lp := engineering(lMax)
	what := "Worst margin against level"
	p := newPlot("")
	if unit == "" {
		p.X.Label.Text = "level"
		ls, lp = 1, ""
	} else {
		p.X.Label.Text = "level (" + lp + string(unit) + ")"
	}
	p.Y.Label.Text = "worst margin (% of the limit)"
	fig := Figure{Name: "margin", Caption: what}
	var entries []legendEntry
	glyphs := []draw.GlyphDrawer{draw.CircleGlyph{}, draw.SquareGlyph{}, draw.TriangleGlyph{}, draw.PyramidGlyph{}, draw.CrossGlyph{}}
	for i, c := range curves {
		xy := make(plotter.XYs, len(c.Levels))
		for k := range c.Levels {
			xy[k] = plotter.XY{X: c.Levels[k] * ls, Y: c.Margins[k]}
		}
		sort.Slice(xy, func(a, b int) bool { return xy[a].X < xy[b].X })
		l, s, err := plotter.NewLinePoints(xy)
		if err != nil {
			return Figure{}, fmt.Errorf("plots: margin: %s: %w", c.Name, err)
		}
		l.LineStyle = lineStyle(i)
		s.GlyphStyle = draw.GlyphStyle{Color: palette[i%len(palette)], Radius: vg.Points(2.5), Shape: glyphs[i%len(glyphs)]}
		p.Add(l, s)
		entries = append(entries, legendEntry{c.Name, l})
		fig.Series = append(fig.Series, c.Name)
	}
	zero, err := plotter.NewLine(plotter.XYs{{X: math.Min(p.X.Min, 0), Y: 0}, {X: p.X.Max, Y: 0}})
	if err != nil {
		return Figure{}, fmt.Errorf("plots: margin: %w", err)
	}
	zero.LineStyle = draw.LineStyle{Color: limitColor, Width: vg.Points(1), Dashes: []vg.Length{vg.Points(5), vg.Points(3)}}
	p.Add(zero)
	entries = append(entries, legendEntry{"0 %: PASS above, FAIL below", zero})
	fig.Series = append(fig.Series, "0 %: PASS above, FAIL below")
	padY(p)
	svg, err := render(&o, heading(title, what), []*plot.Plot{p}, entries)
	if err != nil {
		return Figure{}, fmt.Errorf("plots: margin: %w", err)
	}
	fig.SVG = svg
	return fig, nil
}
