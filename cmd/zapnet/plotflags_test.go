package main

import (
	"bytes"
	"errors"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"zapnet/cmd/internal/plots"
	"zapnet/cmd/internal/report"
	"zapnet/mna/study"
	"zapnet/netlist"
)

// `zapnet run --plot DIR --html FILE` writes every run's five figures and
// the two overlays of the demo (testdata/demo-weak.zap: 8 runs, clamp D1, pin U1),
// named after the deck and the run, and one HTML file that embeds them.
func TestRunPictures(t *testing.T) {
	dir := t.TempDir()
	figs := filepath.Join(dir, "figs")
	page := filepath.Join(dir, "report.html")
	err := runRun([]string{"../../testdata/demo-weak.zap", "--level", "2k,8k", "--polarity", "pos",
		"--plot", figs, "--html", page}, io.Discard, io.Discard)
	if err != nil && !errors.Is(err, errVerdictFail) {
		t.Fatal(err)
	}
	ents, err := os.ReadDir(figs)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range ents {
		names = append(names, e.Name())
	}
	var want []string
	for _, run := range []string{"2kV_pos", "8kV_pos"} {
		for _, f := range []string{"clamps", "ledger", "nodes", "residual-U1", "strike"} {
			want = append(want, "demo-weak_"+run+"_"+f+".svg")
		}
	}
	want = append(want, "demo-weak_overlay-clamp-D1.svg", "demo-weak_overlay-residual-U1.svg")
	slices.Sort(want)
	if !slices.Equal(names, want) {
		t.Errorf("files %q, want %q", names, want)
	}
	b, err := os.ReadFile(page)
	if err != nil {
		t.Fatal(err)
	}
	if n := bytes.Count(b, []byte("<svg")); n != 12 {
		t.Errorf("the report embeds %d figures, want 12", n)
	}
	if !bytes.Contains(b, []byte(report.Caution)) {
		t.Error("the report has no caution")
	}
}

// The margin figure goes into the --plot folder and into a report of its own.
func TestMarginPictures(t *testing.T) {
	c, err := netlist.ParseFile("../../testdata/demo-weak.zap")
	if err != nil {
		t.Fatal(err)
	}
	fig, err := plots.MarginCurve(c.Title, "V", []plots.MarginSeries{
		{Name: "pos", Levels: []float64{2e3, 4e3, 6e3}, Margins: []float64{40, 10, -11}}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	o := pictureOptions{plotDir: filepath.Join(dir, "figs"), htmlFile: filepath.Join(dir, "m.html")}
	meta := study.Meta{Tool: "zapnet", Version: Version, Deck: "testdata/demo-weak.zap", Title: c.Title}
	if err := writeMarginPictures(o, c, meta, fig); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(dir, "figs", "demo-weak_margin.svg")); err != nil {
		t.Error(err)
	}
	b, err := os.ReadFile(o.htmlFile)
	if err != nil {
		t.Fatal(err)
	}
	s := string(b)
	if !strings.Contains(s, `id="fig-margin"`) || !strings.Contains(s, "Margin against level") || strings.Contains(s, `id="summary"`) {
		t.Error("the margin report lacks its figure or shows an empty run summary")
	}
}
