package plots

import (
	"bytes"
	"context"
	"encoding/xml"
	"io"
	"maps"
	"math"
	"slices"
	"strings"
	"sync"
	"testing"

	"zapnet/mna/study"
	"zapnet/netlist"

	"gonum.org/v1/plot/plotter"
)

// demo solves the demo deck once for every test, with its waveforms.
var demo = sync.OnceValues(func() (*netlist.Circuit, []study.Run) {
	c, err := netlist.ParseFile("../../../testdata/demo-weak.zap")
	if err != nil {
		panic(err)
	}
	jobs, err := study.Jobs(c, &study.Options{Record: true})
	if err != nil {
		panic(err)
	}
	runs, err := study.Execute(context.Background(), c, jobs, &study.Options{Record: true}, nil)
	if err != nil {
		panic(err)
	}
	return c, runs
})

// svgText parses an SVG document (it must be well-formed XML) and returns
// the text of its <text> elements and the names of every element.
func svgText(t *testing.T, name string, svg []byte) (texts []string, elems map[string]int) {
	t.Helper()
	elems = map[string]int{}
	d := xml.NewDecoder(bytes.NewReader(svg))
	in := 0
	var cur strings.Builder
	for {
		tok, err := d.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("%s: not well-formed SVG: %v", name, err)
		}
		switch tk := tok.(type) {
		case xml.StartElement:
			elems[tk.Name.Local]++
			if tk.Name.Local == "text" {
				in++
				cur.Reset()
			}
		case xml.CharData:
			if in > 0 {
				cur.Write(tk)
			}
		case xml.EndElement:
			if tk.Name.Local == "text" {
				in--
				texts = append(texts, cur.String())
			}
		}
	}
	return texts, elems
}

// The series of each figure are the deck's own names (testdata/demo-weak.zap:
// strike zap into tip, watch n1 and n2, clamp D1 with ipp=20A, pin U1 with
// vmax=5.5V and vmin=-1.5V), and every series is written in the legend.
func TestRunFiguresSeries(t *testing.T) {
	c, runs := demo()
	r := &runs[0] // 2 kV pos
	figs, err := RunFigures(c, r, &Options{Title: c.Title})
	if err != nil {
		t.Fatal(err)
	}
	want := map[string][]string{
		"strike":      {"zap"},
		"nodes":       {"n1", "n2"},
		"clamps":      {"D1", "D1 ipp 20 A"},
		"residual-U1": {"n2", "vmax 5.5 V", "vmin -1.5 V"},
		"ledger":      {"strike (delivered)", "Lpad (inductor)", "D1 (clamp)", "FB1 (bead)", "C1 (capacitor)", "U1 (pin)", "balance"},
	}
	var got []string
	for _, f := range figs {
		got = append(got, f.Name)
		w, ok := want[f.Name]
		if !ok {
			t.Errorf("unexpected figure %q", f.Name)
			continue
		}
		if !slices.Equal(f.Series, w) {
			t.Errorf("%s: series %q, want %q", f.Name, f.Series, w)
		}
		texts, elems := svgText(t, f.Name, f.SVG)
		for _, s := range w {
			if !slices.Contains(texts, s) {
				t.Errorf("%s: no text %q in the figure", f.Name, s)
			}
		}
		if !slices.Contains(texts, c.Title) {
			t.Errorf("%s: the deck's title is not in the heading", f.Name)
		}
		if elems["path"] < 5 {
			t.Errorf("%s: %d paths: nothing drawn?", f.Name, elems["path"])
		}
		if f.Caption == "" {
			t.Errorf("%s: no caption", f.Name)
		}
	}
	if len(got) != len(want) {
		t.Errorf("figures %q, want the %d of %v", got, len(want), want)
	}
}

// Axes carry engineering units: the demo's window is 1.474 µs, its close-up
// 10 or 20 ns, currents tens of amperes, residuals volts (the run's tables).
func TestAxisUnits(t *testing.T) {
	c, runs := demo()
	figs, err := RunFigures(c, &runs[7], nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range figs {
		texts, _ := svgText(t, f.Name, f.SVG)
		var want []string
		switch f.Name {
		case "strike", "clamps":
			want = []string{"time (ns)", "time (µs)", "current (A)", "whole window"}
		case "nodes":
			want = []string{"time (ns)", "time (µs)", "voltage (V)"}
		case "residual-U1":
			want = []string{"time (ns)", "time (µs)", "residual voltage (V)"}
		case "ledger":
			want = []string{"energy (µJ)"}
		}
		for _, w := range want {
			if !slices.Contains(texts, w) {
				t.Errorf("%s: no axis label %q in %q", f.Name, w, texts)
			}
		}
	}
}

// Overlays name each run by level and polarity, in plan order, and draw the
// limits once.
func TestOverlaysSeries(t *testing.T) {
	c, runs := demo()
	figs, err := Overlays(c, runs, &Options{Title: c.Title})
	if err != nil {
		t.Fatal(err)
	}
	levels := []string{"2 kV pos", "2 kV neg", "4 kV pos", "4 kV neg", "6 kV pos", "6 kV neg", "8 kV pos", "8 kV neg"}
	want := map[string][]string{
		"overlay-residual-U1": append(slices.Clone(levels), "vmax 5.5 V", "vmin -1.5 V"),
		"overlay-clamp-D1":    append(slices.Clone(levels), "ipp +20 A", "ipp -20 A"),
	}
	if len(figs) != len(want) {
		t.Fatalf("%d overlays, want %d", len(figs), len(want))
	}
	for _, f := range figs {
		if !slices.Equal(f.Series, want[f.Name]) {
			t.Errorf("%s: series %q, want %q", f.Name, f.Series, want[f.Name])
		}
		svgText(t, f.Name, f.SVG)
	}
	// Fewer runs than the bound: the caption says so and draws that many.
	figs, err = Overlays(c, runs, &Options{MaxOverlay: 3})
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(figs[0].Caption, "first 3 of 8 runs") || len(figs[0].Series) != 3+2 {
		t.Errorf("bounded overlay: caption %q, series %q", figs[0].Caption, figs[0].Series)
	}
	// One run: nothing to compare.
	if figs, _ := Overlays(c, runs[:1], nil); len(figs) != 0 {
		t.Errorf("one run gave %d overlays", len(figs))
	}
}

// A deck's title is text, never markup, inside a figure.
func TestHostileTitle(t *testing.T) {
	c, runs := demo()
	title := `</text><script>alert("x")</script> & 'q' <b>`
	figs, err := RunFigures(c, &runs[0], &Options{Title: title})
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range figs {
		texts, elems := svgText(t, f.Name, f.SVG)
		if elems["script"] > 0 || elems["b"] > 0 {
			t.Errorf("%s: the title became markup: %v", f.Name, elems)
		}
		if !slices.Contains(texts, title) {
			t.Errorf("%s: the title is not shown as text", f.Name)
		}
	}
}

func TestNotRecorded(t *testing.T) {
	r := study.Run{}
	if _, err := RunFigures(nil, &r, nil); err == nil {
		t.Error("an unrecorded run drew figures")
	}
}

// The margin curve draws each series and the zero line; levels in kV for
// volts (SI prefixes, BIPM SI brochure [pub]).
func TestMarginCurve(t *testing.T) {
	f, err := MarginCurve("Deck", "V", []MarginSeries{
		{Name: "pos", Levels: []float64{2e3, 8e3, 5e3}, Margins: []float64{40, -48, 10}},
		{Name: "neg", Levels: []float64{2e3, 8e3}, Margins: []float64{38, -47}},
	}, nil)
	if err != nil {
		t.Fatal(err)
	}
	want := []string{"pos", "neg", "0 %: PASS above, FAIL below"}
	if !slices.Equal(f.Series, want) {
		t.Errorf("series %q, want %q", f.Series, want)
	}
	texts, _ := svgText(t, "margin", f.SVG)
	for _, w := range append(want, "level (kV)", "Deck") {
		if !slices.Contains(texts, w) {
			t.Errorf("no text %q", w)
		}
	}
	if _, err := MarginCurve("", "V", []MarginSeries{{Name: "x", Levels: []float64{1}, Margins: nil}}, nil); err == nil {
		t.Error("levels and margins of different lengths were accepted")
	}
	if _, err := MarginCurve("", "V", nil, nil); err == nil {
		t.Error("no series was accepted")
	}
}

// Engineering prefixes per the SI brochure [pub: BIPM, The International
// System of Units, 9th ed., table 7]: the value lands in [1, 1000).
func TestEngineering(t *testing.T) {
	for _, c := range []struct {
		max    float64
		scale  float64
		prefix string
	}{
		{1.474e-6, 1e6, "µ"},
		{20e-9, 1e9, "n"},
		{999e-9, 1e9, "n"},
		{1e-6, 1e6, "µ"},
		{29.7, 1, ""},
		{8000, 1e-3, "k"},
		{12.46e-6, 1e6, "µ"},
		{0.753, 1e3, "m"},
		{0, 1, ""},
		{1e-20, 1e15, "f"}, // below femto: stays at femto
	} {
		s, p := engineering(c.max)
		if math.Abs(s/c.scale-1) > 1e-12 || p != c.prefix {
			t.Errorf("engineering(%g) = %g %q, want %g %q", c.max, s, p, c.scale, c.prefix)
		}
	}
}

// Ticks at 1, 2 or 5 times a power of ten, four to eight labelled
// [practice: the usual rule for readable axes].
func TestNiceTicks(t *testing.T) {
	for _, c := range []struct {
		min, max float64
		labels   []string
	}{
		{0, 1.474, []string{"0.0", "0.2", "0.4", "0.6", "0.8", "1.0", "1.2", "1.4"}},
		{0, 20, []string{"0", "5", "10", "15", "20"}},
		{-31.5, 2, []string{"−30", "−25", "−20", "−15", "−10", "−5", "0"}},
		{-2.1, 5.8, []string{"−2", "−1", "0", "1", "2", "3", "4", "5"}},
		{0, 100, []string{"0", "20", "40", "60", "80", "100"}},
	} {
		var got []string
		for _, tk := range (niceTicks{}).Ticks(c.min, c.max) {
			if tk.Label != "" {
				got = append(got, tk.Label)
			}
		}
		if !slices.Equal(got, c.labels) {
			t.Errorf("ticks(%g, %g) = %q, want %q", c.min, c.max, got, c.labels)
		}
	}
}

// Thinning keeps every sample's extreme: a one-sample spike in a long record
// survives, and time stays in order [practice: min/max decimation].
func TestThin(t *testing.T) {
	n := 100000
	ts := make([]float64, n)
	ys := make([]float64, n)
	for k := range ts {
		ts[k] = float64(k) * 1e-12
		ys[k] = math.Sin(float64(k) / 5000)
	}
	ys[54321] = 7  // a spike one sample wide
	ys[77777] = -3 // and a dip
	xy := thin(ts, ys, math.Inf(1), 1000, 1e9, 1)
	if len(xy) > 1002 {
		t.Errorf("%d points, want at most 1002", len(xy))
	}
	hi, lo := math.Inf(-1), math.Inf(1)
	for k := range xy {
		hi, lo = math.Max(hi, xy[k].Y), math.Min(lo, xy[k].Y)
		if k > 0 && xy[k].X < xy[k-1].X {
			t.Fatalf("time goes back at %d", k)
		}
	}
	if hi != 7 || lo != -3 {
		t.Errorf("extremes %g, %g, want 7, -3", hi, lo)
	}
	// A span cuts the record after the first point past it.
	if xy := thin(ts[:10], ys[:10], 4.5e-12, 1000, 1, 1); len(xy) != 6 {
		t.Errorf("span 4.5 ps kept %d points, want 6", len(xy))
	}
}

// With a vary line the overlays compare the first variant across levels and
// polarities, then every variant at the top level, one figure per polarity
// (testdata/panel-button.zap: vary Cf.part=mlcc-100n,mlcc-1u, levels up to
// 8 kV, both polarities; pin U3 with vmax=3.6V vmin=-0.3V; clamp D4).
func TestOverlaysAcrossVariants(t *testing.T) {
	c, err := netlist.ParseFile("../../../testdata/panel-button.zap")
	if err != nil {
		t.Fatal(err)
	}
	jobs, err := study.Jobs(c, &study.Options{Record: true, Levels: []float64{2e3, 8e3}})
	if err != nil {
		t.Fatal(err)
	}
	runs, err := study.Execute(context.Background(), c, jobs, &study.Options{Record: true, Levels: []float64{2e3, 8e3}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	figs, err := Overlays(c, runs, nil)
	if err != nil {
		t.Fatal(err)
	}
	series := map[string][]string{}
	captions := map[string]string{}
	for _, f := range figs {
		series[f.Name] = f.Series
		captions[f.Name] = f.Caption
		svgText(t, f.Name, f.SVG)
	}
	variants := []string{"Cf.part=mlcc-100n", "Cf.part=mlcc-1u"}
	for name, want := range map[string][]string{
		"overlay-residual-U3":              {"2 kV pos", "2 kV neg", "8 kV pos", "8 kV neg", "vmax 3.6 V", "vmin -300 mV"},
		"overlay-variants-pos-residual-U3": append(slices.Clone(variants), "vmax 3.6 V", "vmin -300 mV"),
		"overlay-variants-neg-residual-U3": append(slices.Clone(variants), "vmax 3.6 V", "vmin -300 mV"),
	} {
		if !slices.Equal(series[name], want) {
			t.Errorf("%s: series %q, want %q (figures %v)", name, series[name], want, slices.Collect(maps.Keys(series)))
		}
	}
	if c := captions["overlay-variants-neg-residual-U3"]; !strings.Contains(c, "8 kV neg") {
		t.Errorf("caption %q does not name the level and polarity", c)
	}
}

// Simplifying keeps every sample within the tolerance of the line drawn
// [pub: Douglas & Peucker 1973, the method's guarantee], keeps the
// extremes and the ends, and drops most points of a smooth curve.
func TestSimplify(t *testing.T) {
	n := 2000
	xy := make(plotter.XYs, n)
	for k := range xy {
		x := float64(k) / float64(n-1)
		xy[k] = plotter.XY{X: x, Y: math.Exp(-5*x) * math.Sin(20*x)}
	}
	xy[1234].Y = 3 // a spike
	sx, sy, tol := 400.0, 200.0, 0.2
	got := simplify(append(plotter.XYs(nil), xy...), sx, sy, tol)
	if len(got) > n/10 {
		t.Errorf("kept %d of %d points of a smooth curve", len(got), n)
	}
	if got[0] != xy[0] || got[len(got)-1] != xy[n-1] {
		t.Error("the ends moved")
	}
	if !slices.Contains(got, xy[1234]) {
		t.Error("the spike was dropped")
	}
	// Every original point lies within tol (in points) of the segment of
	// the simplified line over its abscissa.
	j := 0
	for _, p := range xy {
		for j+1 < len(got)-1 && got[j+1].X <= p.X {
			j++
		}
		a, b := got[j], got[j+1]
		ax, ay, bx, by, px, py := a.X*sx, a.Y*sy, b.X*sx, b.Y*sy, p.X*sx, p.Y*sy
		d := math.Abs((px-ax)*(by-ay)-(py-ay)*(bx-ax)) / math.Hypot(bx-ax, by-ay)
		if d > tol*(1+1e-9) {
			t.Fatalf("point (%g, %g) is %.3g pt from the line drawn, more than %g", p.X, p.Y, d, tol)
		}
	}
}

// Consecutive unfilled paths of one style become one path whose parts are
// the same lines; a straight line keeps its coordinates as H or V
// [pub: SVG 1.1, 8.3.6 "The lineto commands"].
func TestJoinStrokes(t *testing.T) {
	svg := []byte(`<svg>
<path d="M1,2L1,5" style="fill:none;stroke:#000000" />
<path d="M3,2L7,2" style="fill:none;stroke:#000000" />
<path d="M0,0L1,1L2,0.5" style="fill:none;stroke:#000000" />
<path d="M0,0L4,0L4,4Z" style="fill:#FFFFFF" />
<path d="M9,9L9,8" style="fill:none;stroke:#E0E0E0" />
</svg>`)
	want := `<svg>
<path d="M1,2V5M3,2H7M0,0L1,1L2,0.5" style="fill:none;stroke:#000000" />
<path d="M0,0L4,0L4,4Z" style="fill:#FFFFFF" />
<path d="M9,9V8" style="fill:none;stroke:#E0E0E0" />
</svg>`
	if got := string(joinStrokes(svg)); got != want {
		t.Errorf("got\n%s\nwant\n%s", got, want)
	}
	if got := straightLines("M1,2L1,5Z"); got != "M1,2L1,5Z" {
		t.Errorf("a path with other commands changed: %s", got)
	}
}
