package plots

import (
	"fmt"
	"image/color"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"zapnet/devices/spec"
	"zapnet/mna/study/whatif"
	"zapnet/netlist"
)

// SpreadHistograms draws the distribution of a spread: one histogram per
// protected pin's residual peak ("spread-U1-peak", V) and per clamp's
// energy ("spread-D1-energy", J), each of the circuits' worst value over
// their levels and polarities (the values the spread's percentiles are of).
// Vertical lines mark p1, p50 and p99, and the rating where c gives one (a
// pin's vmax, a clamp's emax); a rating far beyond the data is named in the
// legend but left off the scale, so that the histogram stays readable. The
// heading says how many circuits, the seed, the fraction within the rating
// drawn, with its 95 % interval, and the fraction that passed every limit:
// a pin's peak can be well inside vmax while its circuits fail at vmin.
// The counts are the spread's summary (SpreadResult.Worst), not samples:
// above the spread's exact count each bar is a group of whole sketch
// buckets, its edges on theirs, so its count is still exact; the fraction
// within the rating is then a range when a bucket straddles the rating.
// c is the design the circuits were drawn around (for its ratings); title
// is the deck's title.
func SpreadHistograms(title string, c *netlist.Circuit, res *whatif.SpreadResult, opt *Options) ([]Figure, error) {
	if res == nil || res.Solved == 0 {
		return nil, fmt.Errorf("plots: spread: no solved circuit to draw")
	}
	o := opt.withDefaults()
	o.Title = title
	count := fmt.Sprintf("%d circuits, seed %d", res.Solved, res.Seed)
	if res.Solved < res.Runs {
		count = fmt.Sprintf("%d of %d circuits solved, seed %d", res.Solved, res.Runs, res.Seed)
	}
	every := "every limit met by " + percent(100*res.PassFraction)
	over := ""
	if len(res.Conditions) > 1 {
		over = ", worst over each circuit's strikes"
	}
	var figs []Figure
	for _, m := range res.Measures {
		var elem, quantity, name string
		var unit spec.Unit
		var rating spec.Measure
		switch {
		case strings.HasSuffix(m, ".residual.peak"):
			elem = strings.TrimSuffix(m, ".residual.peak")
			quantity, unit, name, rating = "residual peak", "V", "spread-"+elem+"-peak", spec.HighVoltage
		case strings.HasSuffix(m, ".energy"):
			elem = strings.TrimSuffix(m, ".energy")
			quantity, unit, name, rating = "energy", "J", "spread-"+elem+"-energy", spec.Energy
		default:
			continue
		}
		t := res.Worst(m)
		if t == nil || t.N() == 0 {
			return nil, fmt.Errorf("plots: spread: no distribution of %s to draw (a spread read back from its JSON holds statistics only)", m)
		}
		var lim *limitLine
		// Short enough to fit beside the legend on one line.
		stats := count + ", no rating of this; " + every
		if c != nil {
			if e := c.Element(elem); e != nil {
				if p, v, ok := e.Rating(rating); ok {
					lim = &limitLine{p.Key + " " + spec.FormatSI(v, unit), v}
					stats = count + "; " + within(p.Key, t, v) + "; " + every
				}
			}
		}
		what := strings.ToUpper(quantity[:1]) + quantity[1:] + " of " + elem + over
		f, err := histogram(&o, name, what, stats, quantity, unit, t, res.Percentiles[m], lim)
		if err != nil {
			return nil, err
		}
		figs = append(figs, f)
	}
	if len(figs) == 0 {
		return nil, fmt.Errorf("plots: spread: the deck has no protected pin and no clamp to draw")
	}
	return figs, nil
}

// within says what fraction of the tally's values lie at or under the
// rating v named key, with its 95 % interval: from the lower count's lower
// bound to the higher count's upper bound when the tally's sketch leaves a
// range of counts.
func within(key string, t *whatif.Tally, v float64) string {
	k, kHi := t.CountAtMost(v)
	n := t.N()
	lo, _ := whatif.Wilson95(k, n)
	_, hi := whatif.Wilson95(kHi, n)
	frac := percent(100 * float64(k) / float64(n))
	if kHi > k {
		frac = strings.TrimSuffix(frac, " %") + "–" + percent(100*float64(kHi)/float64(n))
	}
	return fmt.Sprintf("within %s: %s (95 %%: %s–%s)", key, frac, strings.TrimSuffix(percent(100*lo), " %"), percent(100*hi))
}

// histogram draws the tally's values as a histogram with the percentile
// lines and the rating lim (nil: none).
func histogram(o *Options, name, what, stats, quantity string, unit spec.Unit, t *whatif.Tally, pc whatif.Percentiles, lim *limitLine) (Figure, error) {
	n := t.N()
	if n == 0 {
		return Figure{}, fmt.Errorf("plots: %s: nothing to draw", name)
	}
	lo, hi, span := tallySpan(t)
	// A rating within a few spans of the data is drawn to scale; one far
	// off would squeeze the histogram into a sliver, so it is only named.
	drawLim := lim != nil && lim.value >= lo-3*span && lim.value <= hi+3*span
	xMax := math.Max(math.Abs(lo), math.Abs(hi))
	if drawLim {
		xMax = math.Max(xMax, math.Abs(lim.value))
	}
	xs, xp := engineering(xMax)

	bins, w := spreadBins(t, lo, hi, xs)
	top := 0.0
	for _, b := range bins {
		top = math.Max(top, b.Weight)
	}
	h := &plotter.Histogram{Bins: bins, Width: w * xs, FillColor: palette[5],
		LineStyle: draw.LineStyle{Color: color.White, Width: vg.Points(0.5)}}

	p := newPlot("")
	p.X.Label.Text = quantity + " (" + xp + string(unit) + ")"
	p.Y.Label.Text = "circuits"
	p.Y.Tick.Marker = countTicks{}
	p.Add(h)
	p.Y.Min, p.Y.Max = 0, top*1.08
	fig := Figure{Name: name, Caption: what + "; " + stats}
	if sk := t.Sketch(); sk != nil {
		a := strconv.FormatFloat(100*sk.Alpha(), 'g', -1, 64)
		fig.Caption += "; each bar a group of the sketch's buckets, p1, p50 and p99 within " + a + " %"
	}
	entries := []legendEntry{{fmt.Sprintf("circuits (%d)", n), h}}
	fig.Series = append(fig.Series, entries[0].name)
	lines, err := histogramLines(p, pc, unit, xs, lim, drawLim, lo)
	if err != nil {
		return Figure{}, fmt.Errorf("plots: %s: %w", name, err)
	}
	for _, l := range lines {
		entries = append(entries, l)
		fig.Series = append(fig.Series, l.name)
	}
	// Room on both sides so that no line sits on the frame.
	pad := 0.04 * (p.X.Max - p.X.Min)
	p.X.Min, p.X.Max = p.X.Min-pad, p.X.Max+pad
	p.Y.Min, p.Y.Max = 0, top*1.08

	svg, err := render(o, heading(o.Title, what+"\n"+stats), []*plot.Plot{p}, entries)
	if err != nil {
		return Figure{}, fmt.Errorf("plots: %s: %w", name, err)
	}
	fig.SVG = svg
	return fig, nil
}

// tallySpan is the range of the tally's values and its width, widened
// where every circuit gave the same value so that the bins have a width.
func tallySpan(t *whatif.Tally) (lo, hi, span float64) {
	values, sk := t.Values(), t.Sketch()
	if sk != nil {
		lo, hi = sk.Min(), sk.Max()
	} else {
		lo, hi = values[0], values[t.N()-1]
	}
	span = hi - lo
	if span < 1e-6*math.Max(math.Abs(hi), 1e-30) {
		span = math.Max(math.Abs(hi)*1e-3, 1e-30)
		lo, hi = lo-span/2, hi+span/2
	}
	return lo, hi, span
}

// histogramLines adds to p the p1, p50 and p99 lines and the rating lim
// (nil: none; not drawn unless drawLim, only named with the side of lo it
// lies on), at the axis's scale xs, with their legend entries.
func histogramLines(p *plot.Plot, pc whatif.Percentiles, unit spec.Unit, xs float64, lim *limitLine, drawLim bool, lo float64) ([]legendEntry, error) {
	marks := []struct {
		name  string
		value float64
		style draw.LineStyle
	}{
		{"p1 " + spec.FormatSI(pc.P1, unit), pc.P1, draw.LineStyle{Color: palette[0], Width: vg.Points(1.2), Dashes: []vg.Length{vg.Points(2), vg.Points(2)}}},
		{"p50 " + spec.FormatSI(pc.P50, unit), pc.P50, draw.LineStyle{Color: palette[6], Width: vg.Points(1.2)}},
		{"p99 " + spec.FormatSI(pc.P99, unit), pc.P99, draw.LineStyle{Color: palette[1], Width: vg.Points(1.2), Dashes: []vg.Length{vg.Points(6), vg.Points(3)}}},
	}
	var entries []legendEntry
	for _, m := range marks {
		l, err := vline(m.value*xs, 0, p.Y.Max, m.style)
		if err != nil {
			return nil, err
		}
		p.Add(l)
		entries = append(entries, legendEntry{m.name, l})
	}
	if lim != nil {
		s := draw.LineStyle{Color: limitColor, Width: vg.Points(1.5), Dashes: []vg.Length{vg.Points(5), vg.Points(3)}}
		l, err := vline(lim.value*xs, 0, p.Y.Max, s)
		if err != nil {
			return nil, err
		}
		n := lim.name
		if drawLim {
			p.Add(l)
		} else {
			// Named, with its line style and the side it lies on, not drawn.
			n += ", off scale right"
			if lim.value < lo {
				n = lim.name + ", off scale left"
			}
		}
		entries = append(entries, legendEntry{n, l})
	}
	return entries, nil
}

// spreadBins are the histogram's bars over [lo, hi], scaled by xs, and the
// width of a bin before scaling. About the square root of the count of
// bins, 5 to 40: enough to show the shape, few enough that each bin holds
// several circuits. Exact values fall into equal bins; a sketch's buckets
// each join the bin their middle falls in, and the bar spans its buckets,
// so that a bar never splits a bucket's count.
func spreadBins(t *whatif.Tally, lo, hi, xs float64) ([]plotter.HistogramBin, float64) {
	nb := int(math.Ceil(math.Sqrt(float64(t.N()))))
	nb = max(5, min(nb, 40))
	w := (hi - lo) / float64(nb)
	bins := make([]plotter.HistogramBin, nb)
	for i := range bins {
		bins[i] = plotter.HistogramBin{Min: (lo + float64(i)*w) * xs, Max: (lo + float64(i+1)*w) * xs}
	}
	bin := func(v float64) int { return max(0, min(int((v-lo)/w), nb-1)) }
	sk := t.Sketch()
	if sk == nil {
		for _, v := range t.Values() {
			bins[bin(v)].Weight++
		}
		return bins, w
	}
	edges := make([][2]float64, nb)
	for _, b := range sk.Buckets() {
		i := bin((b.Lo + b.Hi) / 2)
		if bins[i].Weight == 0 {
			edges[i] = [2]float64{b.Lo, b.Hi}
		}
		bins[i].Weight += float64(b.Count)
		edges[i][1] = b.Hi
	}
	for i, e := range edges {
		if bins[i].Weight > 0 && e[1] > e[0] {
			bins[i].Min, bins[i].Max = e[0]*xs, e[1]*xs
		}
	}
	return bins, w
}

// countTicks are niceTicks for a count: no label between whole numbers.
type countTicks struct{}

func (countTicks) Ticks(min, max float64) []plot.Tick {
	ts := niceTicks{}.Ticks(min, max)
	for i := range ts {
		if ts[i].Value != math.Round(ts[i].Value) {
			ts[i].Label = ""
		} else if ts[i].Label != "" {
			ts[i].Label = tickLabel(ts[i].Value, 0)
		}
	}
	return ts
}
