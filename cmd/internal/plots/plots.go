package plots

import (
	"bytes"
	"errors"
	"fmt"
	"image/color"
	"math"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgsvg"

	"zapnet/devices/spec"
	"zapnet/mna/study"
)

// Options tune the figures. A nil *Options means every default; a zero field
// means that field's default.
type Options struct {
	// Title is the deck's title, the first line of every figure's heading.
	// Empty: the heading says only what the figure shows.
	Title string
	// Width and Height are the size of one figure, legend included.
	// Zero: 16 cm by 9 cm.
	Width, Height vg.Length
	// MaxPoints bounds the points drawn per line: a longer waveform is
	// thinned to the lowest and highest sample of each time slice, so
	// peaks survive, and then every point that moves the drawn line by
	// less than a fifth of a typographic point is left out. Zero: 800,
	// two slices per point of a 16 cm figure.
	MaxPoints int
	// MaxOverlay bounds the runs drawn in one overlay figure; the caption
	// says when runs were left out. Zero: 12.
	MaxOverlay int
}

// Figure is one drawn picture.
type Figure struct {
	// Name is the figure's file stem, unique among the figures of one run
	// (or among the overlays): "strike", "nodes", "clamps",
	// "residual-U1", "ledger", "overlay-residual-U1", "margin".
	Name string
	// Caption says in one line of plain text what the figure shows.
	Caption string
	// Series are the names in the legend (for the ledger, the bars), in
	// drawing order; limit lines are included by their legend text.
	Series []string
	// SVG is the figure as a standalone SVG document.
	SVG []byte
}

func (o *Options) withDefaults() Options {
	var d Options
	if o != nil {
		d = *o
	}
	if d.Width == 0 {
		d.Width = 16 * vg.Centimeter
	}
	if d.Height == 0 {
		d.Height = 9 * vg.Centimeter
	}
	if d.MaxPoints == 0 {
		d.MaxPoints = 800
	}
	if d.MaxOverlay == 0 {
		d.MaxOverlay = 12
	}
	return d
}

// The house font: a sans face reads better at small sizes than the library's
// default serif. The SVG names its family; fontFallback adds common sans
// families for a viewer that lacks it.
var (
	sansFont   = font.Font{Typeface: "Liberation", Variant: "Sans"}
	titleFont  = font.From(sansFont, 12)
	labelFont  = font.From(sansFont, 11)
	tickFont   = font.From(sansFont, 10)
	legendFont = font.From(sansFont, 10)
)

// palette is the Okabe–Ito set of colours told apart by readers with the
// common colour-vision deficiencies [pub: Okabe & Ito, "Color Universal
// Design", 2008], without its yellow, which is unreadable on white.
var palette = []color.Color{
	color.RGBA{0x00, 0x72, 0xB2, 0xff}, // blue
	color.RGBA{0xD5, 0x5E, 0x00, 0xff}, // vermillion
	color.RGBA{0x00, 0x9E, 0x73, 0xff}, // bluish green
	color.RGBA{0xCC, 0x79, 0xA7, 0xff}, // reddish purple
	color.RGBA{0xE6, 0x9F, 0x00, 0xff}, // orange
	color.RGBA{0x56, 0xB4, 0xE9, 0xff}, // sky blue
	color.RGBA{0x00, 0x00, 0x00, 0xff}, // black
}

// limitColor draws ratings: a dark red that none of the palette resembles.
var limitColor = color.RGBA{0xB0, 0x00, 0x20, 0xff}

// dashes cycle when there are more lines than colours.
var dashes = [][]vg.Length{nil, {vg.Points(6), vg.Points(3)}, {vg.Points(2), vg.Points(2)}}

func lineStyle(i int) draw.LineStyle {
	return draw.LineStyle{
		Color:  palette[i%len(palette)],
		Width:  vg.Points(1.2),
		Dashes: dashes[(i/len(palette))%len(dashes)],
	}
}

// prefixes are the SI prefixes an axis may use, by power of ten.
var prefixes = map[int]string{-15: "f", -12: "p", -9: "n", -6: "µ", -3: "m", 0: "", 3: "k", 6: "M", 9: "G"}

// engineering returns the factor that brings values up to maxAbs into
// 0.1…1000 (a power of ten divisible by three) and its SI prefix.
func engineering(maxAbs float64) (scale float64, prefix string) {
	if maxAbs == 0 || math.IsNaN(maxAbs) || math.IsInf(maxAbs, 0) {
		return 1, ""
	}
	// Nudge so that 1000 stays "1000 m" rather than flipping at rounding
	// noise, and 999.9 stays below the next prefix.
	e := int(math.Floor(math.Log10(maxAbs*(1+1e-9)) / 3))
	e *= 3
	if e < -15 {
		e = -15
	}
	if e > 9 {
		e = 9
	}
	return math.Pow(10, float64(-e)), prefixes[e]
}

// newPlot is a plot in the house style: sans text, a light grid, ticks at
// round numbers. The figure's heading is drawn by render; a plot's own title
// is a panel's subtitle.
func newPlot(subtitle string) *plot.Plot {
	p := plot.New()
	p.Title.Text = subtitle
	p.Title.TextStyle.Font = labelFont
	p.Title.Padding = vg.Points(3)
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		ax.Label.TextStyle.Font = labelFont
		ax.Tick.Label.Font = tickFont
		ax.Tick.Marker = niceTicks{}
		ax.Padding = vg.Points(2)
	}
	g := plotter.NewGrid()
	g.Vertical.Color = color.Gray{Y: 0xe0}
	g.Horizontal.Color = color.Gray{Y: 0xe0}
	p.Add(g)
	return p
}

// heading is the figure's title: the deck's title (on one line, shortened to
// fit) over what the figure shows.
func heading(title, what string) string {
	title = strings.Join(strings.Fields(title), " ")
	if title == "" {
		return what
	}
	return clip(title, 90) + "\n" + what
}

// clip shortens s to at most n runes with an ellipsis.
func clip(s string, n int) string {
	if utf8.RuneCountInString(s) <= n {
		return s
	}
	r := []rune(s)
	return string(r[:n-1]) + "…"
}

// legendEntry is one line of the legend beside the plot.
type legendEntry struct {
	name  string
	thumb plot.Thumbnailer
}

// render draws the heading across the top, the panels side by side below it
// (the first narrower when there are two: it is the close-up) and the legend
// to their right, outside the data, and returns the SVG document.
func render(o *Options, head string, panels []*plot.Plot, entries []legendEntry) ([]byte, error) {
	c := vgsvg.New(o.Width, o.Height)
	dc := draw.New(c)
	hs := text.Style{Color: color.Black, Font: titleFont, XAlign: draw.XCenter, YAlign: draw.YTop,
		Handler: plot.DefaultTextHandler}
	pad := vg.Points(5)
	headH := hs.Rectangle(head).Size().Y + 2*pad

	leg := plot.NewLegend()
	leg.TextStyle.Font = legendFont
	leg.Top, leg.Left = true, true
	leg.ThumbnailWidth = vg.Points(18)
	leg.Padding = vg.Points(3)
	for _, e := range entries {
		leg.Add(clip(e.name, 32), e.thumb)
	}
	legW := vg.Length(0)
	if len(entries) > 0 {
		r := leg.Rectangle(dc)
		legW = r.Size().X + 2*pad
	}
	err := drawSafely(func() {
		dc.FillText(hs, vg.Point{X: (o.Width - legW) / 2, Y: o.Height - pad}, head)
		area := draw.Crop(dc, pad, -legW, 0, -headH)
		switch len(panels) {
		case 1:
			panels[0].Draw(area)
		case 2:
			split := 0.42 * (area.Max.X - area.Min.X)
			panels[0].Draw(draw.Crop(area, 0, split-(area.Max.X-area.Min.X), 0, 0))
			panels[1].Draw(draw.Crop(area, split+pad, 0, 0, 0))
		default:
			panic("plots: one or two panels")
		}
		if legW > 0 {
			// The legend's top lines up with the top of the panels.
			leg.Draw(draw.Crop(dc, o.Width-legW+pad, 0, 0, -headH-pad))
		}
	})
	if err != nil {
		return nil, err
	}
	var buf bytes.Buffer
	if _, err := c.WriteTo(&buf); err != nil {
		return nil, err
	}
	return joinStrokes(fontFallback(buf.Bytes())), nil
}

// strokePath matches one unfilled path as the SVG writer emits it, with
// the white space after it.
var strokePath = regexp.MustCompile(`<path d="([^"]*)" style="(fill:none;[^"]*)" />\s*`)

// joinStrokes draws runs of consecutive unfilled paths of one style (the
// grid lines, the tick marks) as one path of several parts, each
// horizontal or vertical line written as such. Without a fill, a path of
// parts draws exactly what the separate paths drew.
func joinStrokes(svg []byte) []byte {
	var out bytes.Buffer
	out.Grow(len(svg))
	last := 0
	m := strokePath.FindAllSubmatchIndex(svg, -1)
	for i := 0; i < len(m); {
		j := i + 1
		for j < len(m) && m[j][0] == m[j-1][1] && bytes.Equal(svg[m[j][4]:m[j][5]], svg[m[i][4]:m[i][5]]) {
			j++
		}
		out.Write(svg[last:m[i][0]])
		out.WriteString(`<path d="`)
		for k := i; k < j; k++ {
			out.WriteString(straightLines(string(svg[m[k][2]:m[k][3]])))
		}
		out.WriteString(`" style="`)
		out.Write(svg[m[i][4]:m[i][5]])
		out.WriteString("\" />\n")
		last = m[j-1][1]
		i = j
	}
	out.Write(svg[last:])
	return out.Bytes()
}

// straightLines rewrites a path of absolute moves and lines ("M1,2L1,5")
// with a line that keeps x or y as an absolute vertical or horizontal line
// ("M1,2V5"), which draws the same. A path with any other command is
// returned as it is.
func straightLines(d string) string {
	if strings.ContainsFunc(d, func(r rune) bool {
		return r != 'M' && r != 'L' && r != ',' && r != '.' && r != '-' && r != 'e' && r != '+' && (r < '0' || r > '9')
	}) {
		return d
	}
	whole := d
	var b strings.Builder
	b.Grow(len(d))
	x, y := "", ""
	for len(d) > 0 {
		cmd := d[0]
		d = d[1:]
		end := strings.IndexAny(d, "ML")
		if end < 0 {
			end = len(d)
		}
		nx, ny, ok := strings.Cut(d[:end], ",")
		if !ok {
			return whole
		}
		d = d[end:]
		switch {
		case cmd == 'L' && nx == x:
			b.WriteString("V" + ny)
		case cmd == 'L' && ny == y:
			b.WriteString("H" + nx)
		default:
			b.WriteString(string(cmd) + nx + "," + ny)
		}
		x, y = nx, ny
	}
	return b.String()
}

// drawSafely turns a panic of the drawing library (it panics on degenerate
// axes) into an error, so that one odd figure never takes a report down.
func drawSafely(f func()) (err error) {
	defer func() {
		if r := recover(); r != nil {
			err = fmt.Errorf("plots: drawing failed: %v", r)
		}
	}()
	f()
	return nil
}

// fontFallback lets a viewer without the Liberation family fall back on a
// sans face of the same width class instead of its default serif.
func fontFallback(svg []byte) []byte {
	return bytes.ReplaceAll(svg, []byte("font-family:Liberation Sans;"),
		[]byte("font-family:Liberation Sans,Arimo,Arial,Helvetica,sans-serif;"))
}

// niceTicks puts labelled ticks at round numbers (1, 2 or 5 times a power
// of ten), four to eight of them, with minor ticks between, and writes
// negative labels with a true minus sign.
type niceTicks struct{}

func (niceTicks) Ticks(min, max float64) []plot.Tick {
	if !(max > min) || math.IsInf(max-min, 0) {
		return []plot.Tick{{Value: min, Label: tickLabel(min, 0)}}
	}
	span := max - min
	step, minor := 0.0, 0.0
	for e := math.Floor(math.Log10(span)) - 1; ; e++ {
		p := math.Pow(10, e)
		for _, m := range [...]struct{ major, minor float64 }{{1, 0.5}, {2, 1}, {5, 1}} {
			if span/(m.major*p) <= 8 {
				step, minor = m.major*p, m.minor*p
				break
			}
		}
		if step > 0 {
			break
		}
	}
	decimals := 0
	if step < 1 {
		decimals = int(math.Ceil(-math.Log10(step) - 1e-9))
	}
	var ticks []plot.Tick
	for k := math.Ceil(min/minor - 1e-9); k*minor <= max+1e-9*span; k++ {
		v := k * minor
		major := math.Abs(math.Remainder(v, step)) < 1e-6*step
		t := plot.Tick{Value: v}
		if major {
			t.Label = tickLabel(v, decimals)
		}
		ticks = append(ticks, t)
	}
	return ticks
}

func tickLabel(v float64, decimals int) string {
	s := strconv.FormatFloat(v, 'f', decimals, 64)
	if strings.Trim(s, "-0.") == "" {
		return strings.TrimPrefix(s, "-")
	}
	return strings.Replace(s, "-", "−", 1)
}

// curve is one line of a time figure, in SI units.
type curve struct {
	name string
	t, y []float64
}

// limitLine is a rating drawn across a figure.
type limitLine struct {
	name  string
	value float64 // SI
}

// timeSpec describes a figure of quantities against time.
type timeSpec struct {
	name, caption, what string
	quantity, unit      string // "current", "A"
	curves              []curve
	limits              []limitLine
	// closeUp is the span of a close-up panel of the first instants,
	// drawn left of the whole window; 0, or a span that is not well
	// short of the window: no close-up.
	closeUp float64
}

// timeFigure draws curves against time, the current axis in engineering
// units, the limits as dashed dark-red lines across the whole span. With a
// close-up the figure has two panels on one vertical scale: the first
// instants, where the fast edges are, and the whole window.
func timeFigure(o *Options, s timeSpec) (Figure, error) {
	if len(s.curves) == 0 {
		return Figure{}, fmt.Errorf("plots: %s: nothing to draw", s.name)
	}
	tMax, yMax := 0.0, 0.0
	for _, c := range s.curves {
		if len(c.t) != len(c.y) {
			panic("plots: time and values differ in length")
		}
		for k := range c.t {
			tMax = math.Max(tMax, math.Abs(c.t[k]))
			yMax = math.Max(yMax, math.Abs(c.y[k]))
		}
	}
	for _, l := range s.limits {
		yMax = math.Max(yMax, math.Abs(l.value))
	}
	ys, yp := engineering(yMax)
	ylabel := s.quantity + " (" + yp + s.unit + ")"

	spans := []float64{tMax}
	if s.closeUp > 0 && s.closeUp <= tMax/4 {
		spans = []float64{s.closeUp, tMax}
	}
	fig := Figure{Name: s.name, Caption: s.caption}
	var entries []legendEntry
	var panels []*plot.Plot
	for pi, span := range spans {
		ts, tp := engineering(span)
		sub := ""
		if len(spans) == 2 {
			sub = "first " + spec.FormatSI(span, "s")
			if pi == 1 {
				sub = "whole window"
			}
		}
		p := newPlot(sub)
		p.X.Label.Text = "time (" + tp + "s)"
		if pi == 0 {
			p.Y.Label.Text = ylabel
		}
		for i, c := range s.curves {
			xy := thin(c.t, c.y, span, o.MaxPoints, ts, ys)
			// The panel is narrower and lower than the figure, so a
			// point scale taken from the figure's size errs on the
			// side of keeping points.
			if yMax > 0 {
				xy = simplify(xy, float64(o.Width)/(span*ts), float64(o.Height)/(yMax*ys), unseen)
			}
			l, err := plotter.NewLine(xy)
			if err != nil {
				return Figure{}, fmt.Errorf("plots: %s: %s: %w", s.name, c.name, err)
			}
			l.LineStyle = lineStyle(i)
			p.Add(l)
			if pi == 0 {
				entries = append(entries, legendEntry{c.name, l})
				fig.Series = append(fig.Series, c.name)
			}
		}
		t1 := span * ts
		for i, lim := range s.limits {
			v := lim.value * ys
			l, err := plotter.NewLine(plotter.XYs{{X: 0, Y: v}, {X: t1, Y: v}})
			if err != nil {
				return Figure{}, fmt.Errorf("plots: %s: %s: %w", s.name, lim.name, err)
			}
			l.LineStyle = draw.LineStyle{Color: limitColor, Width: vg.Points(1),
				Dashes: [][]vg.Length{{vg.Points(5), vg.Points(3)}, {vg.Points(1.5), vg.Points(2)}}[i%2]}
			p.Add(l)
			if pi == 0 {
				entries = append(entries, legendEntry{lim.name, l})
				fig.Series = append(fig.Series, lim.name)
			}
		}
		p.X.Min, p.X.Max = 0, t1
		panels = append(panels, p)
	}
	// One vertical scale for both panels, so that a peak reads the same.
	lo, hi := panels[0].Y.Min, panels[0].Y.Max
	for _, p := range panels {
		lo, hi = math.Min(lo, p.Y.Min), math.Max(hi, p.Y.Max)
	}
	for _, p := range panels {
		p.Y.Min, p.Y.Max = lo, hi
		padY(p)
	}
	svg, err := render(o, heading(o.Title, s.what), panels, entries)
	if err != nil {
		return Figure{}, fmt.Errorf("plots: %s: %w", s.name, err)
	}
	fig.SVG = svg
	return fig, nil
}

// padY leaves 5 % of room above and below the data so that a peak or a
// limit line does not sit on the frame, and keeps zero in view.
func padY(p *plot.Plot) {
	lo, hi := math.Min(p.Y.Min, 0), math.Max(p.Y.Max, 0)
	if hi == lo {
		hi, lo = lo+1, lo-1
	}
	pad := 0.05 * (hi - lo)
	if p.Y.Min < 0 {
		lo -= pad
	}
	if p.Y.Max > 0 {
		hi += pad
	}
	p.Y.Min, p.Y.Max = lo, hi
}

// thin returns the points to draw of t, y up to time span, scaled by ts and
// ys: all of them when there are at most max, otherwise the lowest and
// highest sample of each of max/2 equal time slices, in time order, so that
// no peak is lost at the resolution of the figure. The first point past
// span is kept so that the line reaches the panel's edge.
func thin(t, y []float64, span float64, max int, ts, ys float64) plotter.XYs {
	n := sort.SearchFloat64s(t, span)
	if n < len(t) {
		n++
	}
	t, y = t[:n], y[:n]
	if max < 4 {
		max = 4
	}
	if len(t) <= max {
		xy := make(plotter.XYs, len(t))
		for k := range t {
			xy[k] = plotter.XY{X: t[k] * ts, Y: y[k] * ys}
		}
		return xy
	}
	slices := max / 2
	t0, t1 := t[0], t[len(t)-1]
	width := (t1 - t0) / float64(slices)
	xy := make(plotter.XYs, 0, max+2)
	k := 0
	for s := 0; s < slices && k < len(t); s++ {
		end := t0 + float64(s+1)*width
		if s == slices-1 {
			end = math.Inf(1)
		}
		start := k
		lo, hi := k, k
		for ; k < len(t) && t[k] <= end; k++ {
			if y[k] < y[lo] {
				lo = k
			}
			if y[k] > y[hi] {
				hi = k
			}
		}
		if k == start { // nothing fell in this slice
			continue
		}
		a, b := lo, hi
		if a > b {
			a, b = b, a
		}
		xy = append(xy, plotter.XY{X: t[a] * ts, Y: y[a] * ys})
		if b != a {
			xy = append(xy, plotter.XY{X: t[b] * ts, Y: y[b] * ys})
		}
	}
	return xy
}

// unseen is the deviation of a drawn line, in typographic points, below
// which a reader cannot see it: a fifth of a point is well under a
// screen's pixel at 100 % zoom and a laser printer's dot at 600 dpi
// [common practice].
const unseen = 0.2

// simplify drops the points of a polyline that lie within tol of the line
// through their neighbours kept, by the Ramer–Douglas–Peucker method
// [pub: Douglas & Peucker, Cartographica 10(2), 1973]; x and y are first
// scaled by sx and sy to typographic points so that tol is a drawn
// distance. The first and last points, and therefore every extreme
// further than tol from a chord, are kept.
func simplify(xy plotter.XYs, sx, sy, tol float64) plotter.XYs {
	n := len(xy)
	if n < 3 || !(sx > 0) || !(sy > 0) || math.IsInf(sx, 0) || math.IsInf(sy, 0) {
		return xy
	}
	keep := make([]bool, n)
	keep[0], keep[n-1] = true, true
	type seg struct{ a, b int }
	stack := []seg{{0, n - 1}}
	for len(stack) > 0 {
		s := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		ax, ay := xy[s.a].X*sx, xy[s.a].Y*sy
		dx, dy := xy[s.b].X*sx-ax, xy[s.b].Y*sy-ay
		l := math.Hypot(dx, dy)
		far, worst := -1, tol
		for k := s.a + 1; k < s.b; k++ {
			px, py := xy[k].X*sx-ax, xy[k].Y*sy-ay
			var d float64
			if l == 0 {
				d = math.Hypot(px, py)
			} else {
				d = math.Abs(px*dy-py*dx) / l
			}
			if d > worst {
				far, worst = k, d
			}
		}
		if far >= 0 {
			keep[far] = true
			stack = append(stack, seg{s.a, far}, seg{far, s.b})
		}
	}
	out := xy[:0:0]
	for k, p := range xy {
		if keep[k] {
			out = append(out, p)
		}
	}
	return out
}

// RunLabel names a run in legends and captions: "8 kV pos", or with a
// variant "8 kV pos, C1.value=1u".
func RunLabel(r *study.Run) string {
	s := spec.FormatSI(r.Level, r.LevelUnit) + " " + r.Polarity
	if len(r.Variant) > 0 {
		s += ", " + r.Variant.String()
	}
	return s
}

var errNotRecorded = errors.New("plots: the run was not recorded (study.Options.Record)")
