package main

import (
	"bytes"
	"context"
	"encoding/json"
	"encoding/xml"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"zapnet/cmd/internal/report"
	"zapnet/mna/study"
	"zapnet/mna/study/whatif"
	"zapnet/netlist"
)

// figureHas reads the SVG file at path and reports each of want that is
// not the text of one of its <text> elements.
func figureHas(t *testing.T, path string, want ...string) []string {
	t.Helper()
	svg, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	texts := svgTexts(t, svg)
	for _, w := range want {
		if !slices.Contains(texts, w) {
			t.Errorf("%s has no text %q; it has %q", filepath.Base(path), w, texts)
		}
	}
	return texts
}

// pageHas reads the HTML file at path and reports each of want it lacks.
func pageHas(t *testing.T, path string, want ...string) {
	t.Helper()
	html, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	for _, w := range want {
		if !bytes.Contains(html, []byte(w)) {
			t.Errorf("the HTML report lacks %q", w)
		}
	}
}

// svgTexts parses an SVG document as XML (it must be well-formed) and
// returns the text of its <text> elements.
func svgTexts(t *testing.T, svg []byte) []string {
	t.Helper()
	var texts []string
	d := xml.NewDecoder(bytes.NewReader(svg))
	inText := false
	for {
		tok, err := d.Token()
		if err == io.EOF {
			return texts
		}
		if err != nil {
			t.Fatalf("the SVG is not well-formed XML: %v", err)
		}
		switch e := tok.(type) {
		case xml.StartElement:
			inText = e.Name.Local == "text"
		case xml.EndElement:
			inText = false
		case xml.CharData:
			if inText {
				texts = append(texts, strings.TrimSpace(string(e)))
			}
		}
	}
}

// `zapnet margin --plot DIR --html FILE` draws the margin against level:
// one series per polarity in DECK_margin.svg, the same figure in an HTML
// report with the caution and the deck [practice: OUTPUT.md, the figures
// of `zapnet run`]. A 200 V step up to 8 kV keeps it fast.
func TestMarginPlotCommand(t *testing.T) {
	dir := t.TempDir()
	figs, page := filepath.Join(dir, "figs"), filepath.Join(dir, "margin.html")
	args := []string{"margin", demoDeck, "--max", "8k", "--resolution", "200", "--plot", figs, "--html", page, "--json", "-"}
	out, e, code := zapnet(t, args...)
	if code != exitPass {
		t.Fatalf("exit %d\n%s", code, e)
	}
	figureHas(t, filepath.Join(figs, "demo-weak_margin.svg"), "pos", "neg", "0 %: PASS above, FAIL below", "level (kV)", "Worst margin against level")
	pageHas(t, page, `id="fig-margin"`, "<svg", "Margin against level", report.Caution, "strike    zap")

	// The search is deterministic: solved again through the package, its
	// curve must agree with the table the command wrote. Where the verdict
	// turns, the worst margin changes sign: not negative at the highest
	// pass, negative at the first failure (a run passes when every limit
	// holds, CHECKS.md [practice]).
	var doc struct {
		Margins []struct {
			Polarity  string   `json:"polarity"`
			MaxPass   *float64 `json:"max_pass_level"`
			FirstFail *float64 `json:"first_fail_level"`
		} `json:"margins"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	c, err := netlist.ParseFile(demoDeck)
	if err != nil {
		t.Fatal(err)
	}
	res, err := whatif.Margins(context.Background(), c, &whatif.MarginOptions{Max: 8000, Resolution: 200})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Margins) != len(doc.Margins) || len(doc.Margins) != 2 {
		t.Fatalf("%d searches in the package, %d in the JSON; want 2", len(res.Margins), len(doc.Margins))
	}
	for i, m := range res.Margins {
		j := doc.Margins[i]
		if j.Polarity != m.Polarity || j.MaxPass == nil || j.FirstFail == nil {
			t.Fatalf("search %d: JSON %+v, package %s; the demo deck must fail below 8 kV", i, j, m.Polarity)
		}
		if len(m.Curve) != m.Solves {
			t.Errorf("%s: %d curve points for %d solves", m.Polarity, len(m.Curve), m.Solves)
		}
		found := 0
		for k, p := range m.Curve {
			if k > 0 && !(p.Level > m.Curve[k-1].Level) {
				t.Errorf("%s: levels not rising at %d: %g after %g", m.Polarity, k, p.Level, m.Curve[k-1].Level)
			}
			switch p.Level {
			case *j.MaxPass:
				found++
				if !(p.Percent >= 0) || !p.Pass {
					t.Errorf("%s: margin %g %% (pass %v) at the highest pass %g V", m.Polarity, p.Percent, p.Pass, p.Level)
				}
			case *j.FirstFail:
				found++
				if !(p.Percent < 0) || p.Pass {
					t.Errorf("%s: margin %g %% (pass %v) at the first failure %g V", m.Polarity, p.Percent, p.Pass, p.Level)
				}
			}
		}
		if found != 2 {
			t.Errorf("%s: the curve lacks the highest pass %g V or the first failure %g V", m.Polarity, *j.MaxPass, *j.FirstFail)
		}
	}
}

// Variants name their series by their settings, and a deck without a
// limit has nothing to draw and says so instead of writing an empty figure.
func TestMarginPlotSeriesNames(t *testing.T) {
	c, err := netlist.ParseFile(demoDeck)
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	o := pictureOptions{plotDir: dir}
	meta := study.Meta{Deck: demoDeck, Title: c.Title}
	res := &whatif.MarginResult{LevelUnit: "V", Margins: []whatif.Margin{
		{Polarity: "pos", Variant: netlist.Variant{{Element: "D1", Param: "ls", Num: 0.2e-9, Text: "0.2n"}},
			Curve: []whatif.CurvePoint{{Level: 1000, Percent: 30, Pass: true}, {Level: 2000, Percent: -5}}},
		{Polarity: "neg", Variant: netlist.Variant{{Element: "D1", Param: "ls", Num: 0.2e-9, Text: "0.2n"}},
			Curve: []whatif.CurvePoint{{Level: 1000, Percent: 28, Pass: true}, {Level: 2000, Percent: -7}}},
	}}
	if err := drawMargins(o, c, meta, res); err != nil {
		t.Fatal(err)
	}
	svg, err := os.ReadFile(filepath.Join(dir, "demo-weak_margin.svg"))
	if err != nil {
		t.Fatal(err)
	}
	texts := svgTexts(t, svg)
	for _, w := range []string{"D1.ls=0.2n pos", "D1.ls=0.2n neg"} {
		if !slices.Contains(texts, w) {
			t.Errorf("no series %q in %q", w, texts)
		}
	}
	none := &whatif.MarginResult{LevelUnit: "V", Margins: []whatif.Margin{{Polarity: "pos",
		Curve: []whatif.CurvePoint{{Level: 1000, Percent: math.NaN(), Pass: true}}}}}
	if err := drawMargins(pictureOptions{plotDir: filepath.Join(dir, "none")}, c, meta, none); err == nil {
		t.Error("a search without any margin drew a figure")
	}
	if _, err := os.Stat(filepath.Join(dir, "none")); err == nil {
		t.Error("nothing to draw, yet the folder was made")
	}
}
