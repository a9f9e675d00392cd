package main

import (
	"bytes"
	"os"
	"path/filepath"
	"slices"
	"testing"

	"zapnet/cmd/internal/report"
)

// `zapnet sensitivity --plot DIR --html FILE` draws the ranking as bars,
// names every parameter studied and the two steps, puts the figure in an
// HTML report with the caution and the deck, and leaves the table and the
// JSON exactly as without the flags: the table is the golden file of
// TestWhatIfTablesGolden [practice: drawing must not change a result].
func TestSensitivityPlotCommand(t *testing.T) {
	args := []string{"sensitivity", clampAtPin, "--param", "D1.ls,D1.rdyn,D1.vbr,Lpad.value"}
	dir := t.TempDir()
	figs, page := filepath.Join(dir, "figs"), filepath.Join(dir, "s.html")
	plain, drawn := filepath.Join(dir, "plain.json"), filepath.Join(dir, "drawn.json")

	out, e, code := zapnet(t, append(args, "--plot", figs, "--html", page, "--json", drawn)...)
	if code != exitPass {
		t.Fatalf("exit %d\n%s", code, e)
	}
	golden(t, "sensitivity-clamp-at-pin.txt", []byte(out))
	if _, e, code := zapnet(t, append(args, "--json", plain)...); code != exitPass {
		t.Fatalf("exit %d\n%s", code, e)
	}
	if a, b := readJSON(t, plain), readJSON(t, drawn); a != b {
		t.Errorf("--plot and --html changed the JSON:\nwithout:\n%s\nwith:\n%s", a, b)
	}

	svg, err := os.ReadFile(filepath.Join(figs, "clamp-at-pin_sensitivity.svg"))
	if err != nil {
		t.Fatal(err)
	}
	texts := svgTexts(t, svg)
	for _, w := range []string{"D1.ls", "D1.rdyn", "D1.vbr", "Lpad.value", "−10 %", "+10 %", "worst margin (% of the limit)"} {
		if !slices.Contains(texts, w) {
			t.Errorf("the figure has no text %q; it has %q", w, texts)
		}
	}
	html, err := os.ReadFile(page)
	if err != nil {
		t.Fatal(err)
	}
	for _, w := range []string{`id="fig-sensitivity"`, "<svg", "Sensitivity of the worst margin", report.Caution, "clamp     D1"} {
		if !bytes.Contains(html, []byte(w)) {
			t.Errorf("the HTML report lacks %q", w)
		}
	}
}
