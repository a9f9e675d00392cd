package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const (
	usbDeck  = "../../testdata/usb-fs-port.zap"
	railDeck = "../../testdata/rail-bead.zap"
)

// The signal side of the full-speed line within its interface's budgets
// (the band a 12 Mb/s line lives in), as a golden report; the exit status
// is 0 when every limit is kept.
func TestACUSBGolden(t *testing.T) {
	out, errs, code := zapnet(t, "ac", usbDeck, "--interface", "usb2-fs", "--to", "1G")
	if code != exitPass {
		t.Errorf("exit %d, want 0; stderr:\n%s", code, errs)
	}
	golden(t, "ac-usb-fs-port.txt", []byte(out))
	for _, want := range []string{"Transfer from conn", "Two-port P1 → P2 (45 Ω, 45 Ω)", "Edge P1 → P2",
		"budget 20 pF on what is added", "A simulation is an estimate"} {
		if !strings.Contains(out, want) {
			t.Errorf("report lacks %q", want)
		}
	}
}

// The rail's bead and capacitor peak over the watch's 3 dB: exit status 1,
// with the damping values found by solving again.
func TestACRailGolden(t *testing.T) {
	out, errs, code := zapnet(t, "ac", railDeck, "--to", "100M")
	if code != exitFail {
		t.Errorf("exit %d, want 1; stderr:\n%s", code, errs)
	}
	golden(t, "ac-rail-bead.txt", []byte(out))
	for _, want := range []string{"| out  | +11.12 dB | 142.4 kHz |", "OVER", "C2 esr 5 mΩ → 660 mΩ", "FB1 rdc 300 mΩ → 840 mΩ"} {
		if !strings.Contains(out, want) {
			t.Errorf("report lacks %q", want)
		}
	}
}

// The JSON of OUTPUT.md: nodes.NODE.{freq, gain_db, phase_deg} for every
// watched node and protected pin, peaking[] with node, gain_db, freq, q;
// the tables go to stderr when the JSON takes stdout.
func TestACJSON(t *testing.T) {
	out, errs, code := zapnet(t, "ac", railDeck, "--to", "100M", "--json", "-")
	if code != exitFail || !strings.Contains(errs, "Peaking above the gain") {
		t.Fatalf("exit %d; stderr:\n%s", code, errs)
	}
	var doc struct {
		Tool, Deck string
		Nodes      map[string]struct {
			Freq     []float64 `json:"freq"`
			GainDB   []float64 `json:"gain_db"`
			PhaseDeg []float64 `json:"phase_deg"`
		}
		Peaking []struct {
			Node   string
			GainDB float64 `json:"gain_db"`
			Freq   float64
			Q      float64
		}
		Loading []map[string]any
		Edges   []any
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	n := doc.Nodes["out"]
	if doc.Tool != "zapnet" || len(n.Freq) == 0 || len(n.GainDB) != len(n.Freq) || len(n.PhaseDeg) != len(n.Freq) || n.Freq[0] != 10e3 {
		t.Errorf("nodes: %+v", doc.Nodes)
	}
	if len(doc.Peaking) != 1 || doc.Peaking[0].Node != "out" || math.Abs(doc.Peaking[0].GainDB-11.12) > 0.01 ||
		math.Abs(doc.Peaking[0].Freq-142.4e3) > 0.1e3 || doc.Peaking[0].Q < 3 {
		t.Errorf("peaking: %+v", doc.Peaking)
	}
	if len(doc.Loading) != 1 || doc.Edges == nil {
		t.Errorf("loading %v, edges %v", doc.Loading, doc.Edges)
	}
}

// --touchstone writes the two-port as Touchstone v1 (the option line, one
// line of nine numbers a frequency); --csv the sweep; --plot and --html
// the figures and the report page with the signal side.
func TestACFiles(t *testing.T) {
	dir := t.TempDir()
	s2p, csvPath, html := filepath.Join(dir, "line.s2p"), filepath.Join(dir, "line.csv"), filepath.Join(dir, "line.html")
	_, errs, code := zapnet(t, "ac", usbDeck, "--to", "1G", "--points-per-decade", "5",
		"--touchstone", s2p, "--csv", csvPath, "--plot", dir, "--html", html)
	if code == exitUnusable {
		t.Fatalf("exit %d; stderr:\n%s", code, errs)
	}
	b, err := os.ReadFile(s2p)
	if err != nil {
		t.Fatal(err)
	}
	var data int
	option := ""
	for _, l := range strings.Split(strings.TrimSpace(string(b)), "\n") {
		switch {
		case strings.HasPrefix(l, "!"):
		case strings.HasPrefix(l, "#"):
			option = l
		default:
			if len(strings.Fields(l)) != 9 {
				t.Errorf("data line %q", l)
			}
			data++
		}
	}
	// 10 kHz … 1 GHz at five a decade: 26 points.
	if option != "# Hz S RI R 45" || data != 26 {
		t.Errorf("option line %q, %d data lines", option, data)
	}
	c, err := os.ReadFile(csvPath)
	if err != nil {
		t.Fatal(err)
	}
	head := strings.SplitN(string(c), "\n", 2)[0]
	for _, col := range []string{"freq [Hz]", "a gain [dB]", "p phase [deg]", "Zin conn |Z| [ohm]", "S21 [dB]"} {
		if !strings.Contains(head, col) {
			t.Errorf("CSV header %q lacks %q", head, col)
		}
	}
	for _, f := range []string{"usb-fs-port_transfer-gain.svg", "usb-fs-port_transfer-phase.svg", "usb-fs-port_impedance.svg", "usb-fs-port_s-parameters.svg"} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Error(err)
		}
	}
	h, err := os.ReadFile(html)
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{`<section id="signal">`, "<h2>The signal's side</h2>", "<svg", "Transfer from conn", "A simulation is an estimate"} {
		if !strings.Contains(string(h), want) {
			t.Errorf("HTML lacks %q", want)
		}
	}
}

// Unusable input is exit status 2 with a message that says what to change.
func TestACExitCodes(t *testing.T) {
	for _, tc := range []struct {
		name string
		args []string
		msg  string
	}{
		{"bad frequency", []string{usbDeck, "--from", "10kV"}, "--from"},
		{"falling sweep", []string{usbDeck, "--from", "1G", "--to", "1M"}, "must be above --from"},
		{"unknown interface", []string{usbDeck, "--interface", "usb9"}, "unknown interface \"usb9\""},
		{"two-port without ports", []string{railDeck, "--to", "1M", "--touchstone", filepath.Join(t.TempDir(), "x.s2p")}, "needs exactly two ports"},
		{"no deck", []string{}, "want one deck"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, errs, code := zapnet(t, append([]string{"ac"}, tc.args...)...)
			if code != exitUnusable || !strings.Contains(errs, tc.msg) {
				t.Errorf("exit %d, stderr %q; want 2 and %q", code, errs, tc.msg)
			}
		})
	}
}

// The HTML report of a deck's strike runs carries the signal side beside
// them when the deck asks for it (ports, signal-side limits), and not
// otherwise.
func TestRunHTMLWithSignalSide(t *testing.T) {
	dir := t.TempDir()
	for _, tc := range []struct {
		deck string
		want bool
	}{{usbDeck, true}, {demoDeck, false}} {
		html := filepath.Join(dir, filepath.Base(tc.deck)+".html")
		_, errs, code := zapnet(t, "run", tc.deck, "--level", "2k", "--polarity", "pos", "--html", html)
		if code == exitUnusable {
			t.Fatalf("%s: exit %d; stderr:\n%s", tc.deck, code, errs)
		}
		b, err := os.ReadFile(html)
		if err != nil {
			t.Fatal(err)
		}
		if got := strings.Contains(string(b), `<section id="signal">`); got != tc.want {
			t.Errorf("%s: signal section %v, want %v", tc.deck, got, tc.want)
		}
	}
}

// --csv - leaves standard output to the CSV alone, as --json - does the
// JSON: a header line, then one row per frequency with a value per column
// [practice: a file a spreadsheet or a script reads whole].
func TestACCSVToStandardOutput(t *testing.T) {
	out, errs, code := zapnet(t, "ac", usbDeck, "--csv", "-")
	if code != exitFail && code != exitPass {
		t.Fatalf("exit %d: %s", code, errs)
	}
	lines := strings.Split(strings.TrimSpace(out), "\n")
	if !strings.HasPrefix(lines[0], "freq [Hz],") {
		t.Fatalf("standard output starts %q, want the CSV header", lines[0])
	}
	cols := strings.Count(lines[0], ",")
	for i, l := range lines[1:] {
		if strings.Count(l, ",") != cols {
			t.Fatalf("line %d of standard output is not a CSV row: %q", i+2, l)
		}
	}
	if !strings.Contains(errs, "Transfer from") {
		t.Error("the tables must go to standard error")
	}
}
