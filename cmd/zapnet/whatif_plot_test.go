package main

import (
	"path/filepath"
	"slices"
	"strings"
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

	figureHas(t, filepath.Join(figs, "clamp-at-pin_sensitivity.svg"), "D1.ls", "D1.rdyn", "D1.vbr", "Lpad.value", "−10 %", "+10 %", "worst margin (% of the limit)")
	pageHas(t, page, `id="fig-sensitivity"`, "<svg", "Sensitivity of the worst margin", report.Caution, "clamp     D1")
}

// `zapnet spread --plot DIR --html FILE` draws a histogram per pin peak and
// clamp energy, and leaves the tables and the JSON exactly as without the
// flags: the tables are the golden file of TestWhatIfTablesGolden
// [practice: drawing must not change a result].
func TestSpreadPlotCommand(t *testing.T) {
	args := []string{"spread", spreadDeck, "--runs", "20", "--seed", "5"}
	dir := t.TempDir()
	figs, page := filepath.Join(dir, "figs"), filepath.Join(dir, "sp.html")
	plain, drawn := filepath.Join(dir, "plain.json"), filepath.Join(dir, "drawn.json")

	out, e, code := zapnet(t, append(args, "--plot", figs, "--html", page, "--json", drawn)...)
	if code != exitFail { // every drawn circuit fails (TestSpreadCommand)
		t.Fatalf("exit %d, want 1\n%s", code, e)
	}
	golden(t, "spread-net-a.txt", []byte(out))
	if _, e, code := zapnet(t, append(args, "--json", plain)...); code != exitFail {
		t.Fatalf("exit %d, want 1\n%s", code, e)
	}
	if a, b := readJSON(t, plain), readJSON(t, drawn); a != b {
		t.Errorf("--plot and --html changed the JSON:\nwithout:\n%s\nwith:\n%s", a, b)
	}

	// Reference network A rates U1 at vmax 5.5 V (testdata/reference/net-a.zap).
	for file, want := range map[string][]string{
		"net-a-spread_spread-U1-peak.svg": {"residual peak (V)", "Residual peak of U1", "circuits (20)", "circuits", "vmax 5.5 V, off scale right",
			"20 circuits, seed 5; within vmax: 100.0 % (95 %: 83.9–100.0 %); every limit met by 0.0 %"},
		"net-a-spread_spread-D1-energy.svg": {"energy (µJ)", "Energy of D1", "circuits (20)"},
	} {
		texts := figureHas(t, filepath.Join(figs, file), want...)
		// Every circuit fails a limit, but not the peak's vmax: the
		// heading says both, never "pass 0.0 %" over a peak within vmax.
		if !slices.ContainsFunc(texts, func(s string) bool {
			return strings.HasPrefix(s, "20 circuits, seed 5") && strings.HasSuffix(s, "every limit met by 0.0 %")
		}) {
			t.Errorf("%s: the heading lacks the count, seed and pass fraction: %q", file, texts)
		}
		if !slices.ContainsFunc(texts, func(s string) bool { return strings.HasPrefix(s, "p99 ") }) {
			t.Errorf("%s: no p99 line in the legend: %q", file, texts)
		}
	}
	pageHas(t, page, `id="fig-spread-U1-peak"`, `id="fig-spread-D1-energy"`, "Spread over the drawn circuits", report.Caution, "tolerance D1.vbr")
}
