package report

import (
	"bytes"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"zapnet/mna/study"
	"zapnet/netlist"
)

// A failed write leaves the old file as it was and no temporary file behind;
// a good one replaces it whole.
func TestWriteFileWholeOrNothing(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.json")
	if err := os.WriteFile(path, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	boom := errors.New("boom")
	err := WriteFile(path, func(w io.Writer) error {
		io.WriteString(w, "half of a new file")
		return boom
	})
	if !errors.Is(err, boom) {
		t.Fatalf("error %v, want boom", err)
	}
	if b, _ := os.ReadFile(path); string(b) != "old" {
		t.Errorf("file changed to %q after a failed write", b)
	}
	if ents, _ := os.ReadDir(dir); len(ents) != 1 {
		t.Errorf("temporary files left: %v", ents)
	}
	if err := WriteFile(path, func(w io.Writer) error { _, err := io.WriteString(w, "new"); return err }); err != nil {
		t.Fatal(err)
	}
	if b, _ := os.ReadFile(path); string(b) != "new" {
		t.Errorf("file is %q, want new", b)
	}
}

func sampleRuns() []study.Run {
	mk := func(i int, level float64, pol string, v netlist.Variant) study.Run {
		r := study.Run{Index: i, Level: level, Polarity: pol, Variant: v,
			Waveform: "iec61000-4-2", LevelUnit: "V"}
		r.Limits = []study.Limit{study.NewLimit("U1", "vmax", "V", 5.5, 4.8, 1e-9, true, "residual peak"),
			study.NewLimit("D1", "emax", "J", 1e-3, 2e-6, math.NaN(), true, "energy")}
		r.Ledger = study.Ledger{Strike: -4e-6, Entries: []study.LedgerEntry{{Name: "D1", Energy: 4e-6, Percent: 100}}, Balance: 1e-15}
		study.Judge(&r)
		return r
	}
	return []study.Run{mk(0, 8000, "pos", nil), mk(1, 8000, "neg", netlist.Variant{{Element: "C1", Param: "value", Num: 1e-6, Text: "1u"}})}
}

// Several runs go to a folder or a pattern, one name per run; one file name
// for several runs is refused.
func TestCSVPaths(t *testing.T) {
	var runs []string
	for _, r := range sampleRuns() {
		runs = append(runs, RunName(r.Variant, r.Level, r.LevelUnit, r.Polarity))
	}
	got, err := CSVPaths("out/", "decks/demo.zap", runs)
	if err != nil {
		t.Fatal(err)
	}
	want := []string{"out/demo_8kV_pos.csv", "out/demo_C1.value-1u_8kV_neg.csv"}
	if strings.Join(got, " ") != strings.Join(want, " ") {
		t.Errorf("folder: %v, want %v", got, want)
	}
	got, err = CSVPaths("w/{run}.csv", "demo.zap", runs)
	if err != nil || got[0] != "w/8kV_pos.csv" {
		t.Errorf("pattern: %v %v", got, err)
	}
	if _, err := CSVPaths("one.csv", "demo.zap", runs); err == nil {
		t.Errorf("one file for two runs accepted")
	}
	if got, err := CSVPaths("one.csv", "demo.zap", runs[:1]); err != nil || got[0] != "one.csv" {
		t.Errorf("one run: %v %v", got, err)
	}
}

// The summary has a row per run and ends with the caution.
func TestSummary(t *testing.T) {
	var buf bytes.Buffer
	if err := Summary(&buf, sampleRuns()); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	for _, want := range []string{"C1.value=1u", "8 kV", "U1 vmax: 700 mV (12.7 %)", "2 runs: 2 PASS, 0 FAIL", Caution} {
		if !strings.Contains(out, want) {
			t.Errorf("summary lacks %q:\n%s", want, out)
		}
	}
}
