package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"zapnet/cmd/internal/report"
	"zapnet/waveforms"
)

func runW(t *testing.T, args ...string) (stdout, stderr string, code int) {
	t.Helper()
	return zapnet(t, append([]string{"waveform"}, args...)...)
}

// The 4 kV contact-discharge report: its numbers are those of the annex
// formula [calc: CHECKS.md: 14.92 A first peak, 0.811 ns rise] against the
// calibration table [pub], and the caution line ends it.
func TestWaveformReportIEC4k(t *testing.T) {
	out, errOut, code := runW(t, "iec61000-4-2", "--level", "4k")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	for _, want := range []string{"14.92 A", "811 ps", "15 A", "within", "[pub]",
		report.Caution} {
		if !strings.Contains(out, want) {
			t.Errorf("report lacks %q:\n%s", want, out)
		}
	}
	if strings.Contains(out, "OUTSIDE") {
		t.Errorf("a check of the annex waveform at 4 kV is outside:\n%s", out)
	}
	golden(t, "waveform-iec61000-4-2-4k.txt", []byte(out))
	// SI spellings of the same level give the same report.
	for _, lv := range []string{"4kV", "4000", "4e3"} {
		if o, _, _ := runW(t, "iec61000-4-2", "--level", lv); o != out {
			t.Errorf("--level %q gives a different report", lv)
		}
	}
	// No level: the typical 4 kV.
	if o, _, _ := runW(t, "iec61000-4-2"); o != out {
		t.Error("the default level is not 4 kV")
	}
}

// Every waveform prints a report with the caution; surge-1.2-50 also
// prints its simplification note.
func TestWaveformEveryName(t *testing.T) {
	for _, n := range waveforms.Names() {
		args := []string{n}
		if n == "pwl" {
			args = append(args, "--set", "file=../../waveforms/testdata/pulse.csv")
		}
		out, errOut, code := runW(t, args...)
		if code != 0 {
			t.Errorf("%s: exit %d: %s", n, code, errOut)
			continue
		}
		if !strings.HasSuffix(out, report.Caution+"\n") {
			t.Errorf("%s: no caution at the end:\n%s", n, out)
		}
		if n == "surge-1.2-50" && !strings.Contains(out, "8/20 µs current into a short, which this source does not") {
			t.Errorf("surge-1.2-50 report lacks the simplification note:\n%s", out)
		}
	}
	out, _, _ := runW(t, "iso10605", "--set", "c=330p", "--set", "r=2k", "--level", "8k")
	// 330 pF / 2 kΩ at 8 kV: 4 A·e^(−400/660) at 400 ns [calc].
	want := waveforms.FormatValue(4*math.Exp(-400.0/660), "A")
	if !strings.Contains(out, "current at 400 ns") || !strings.Contains(out, want) {
		t.Errorf("iso10605 330p/2k report lacks the current at 400 ns = %s:\n%s", want, out)
	}
}

// The CSV holds the waveform itself: read back, its samples are the
// stimulus's values, its peak the annex's 14.921 A at 4 kV [calc], and the
// file is the only one in its folder (no temporary left behind).
func TestWaveformCSV(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "iec.csv")
	if _, e, code := runW(t, "iec61000-4-2", "--csv", path); code != 0 {
		t.Fatalf("exit %d: %s", code, e)
	}
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(data)), "\n")
	if lines[0] != "time [s],current [A]" {
		t.Errorf("header %q", lines[0])
	}
	ts, is, err := waveforms.ReadPWL(path)
	if err != nil {
		t.Fatal(err)
	}
	s, _ := waveforms.Lookup("iec61000-4-2").New(4000, nil)
	for k := range ts {
		if want := s.F(ts[k]); math.Abs(is[k]-want) > 1e-8*math.Abs(want)+1e-12 {
			t.Fatalf("row %d: i(%g) = %g, want %g", k+2, ts[k], is[k], want)
		}
	}
	pk, _ := waveforms.Peak(ts, is)
	if math.Abs(pk-14.921) > 14.921e-3 {
		t.Errorf("peak from the CSV %g A, want 14.921 A ±0.1 %%", pk)
	}
	if ents, _ := os.ReadDir(dir); len(ents) != 1 {
		t.Errorf("folder holds %d entries, want the CSV alone", len(ents))
	}

	// A network into a load: three columns, v = i·load.
	path = filepath.Join(dir, "hbm.csv")
	if _, e, code := runW(t, "hbm", "--load", "500", "--csv", path); code != 0 {
		t.Fatalf("exit %d: %s", code, e)
	}
	data, _ = os.ReadFile(path)
	lines = strings.Split(strings.TrimSpace(string(data)), "\n")
	if lines[0] != "time [s],current [A],voltage [V]" {
		t.Errorf("header %q", lines[0])
	}
	for _, l := range lines[1:] {
		f := strings.Split(l, ",")
		i, _ := strconv.ParseFloat(f[1], 64)
		v, _ := strconv.ParseFloat(f[2], 64)
		if len(f) != 3 || math.Abs(v-500*i) > 1e-8*math.Abs(v)+1e-15 {
			t.Fatalf("row %q: v is not 500 Ω · i", l)
		}
	}
}

// Written whole or not at all: a folder that does not exist is an error,
// the report is not printed, and no file appears.
func TestWaveformCSVFailure(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "missing", "x.csv")
	out, errOut, code := runW(t, "tlp", "--csv", path)
	if code != exitUnusable || !strings.Contains(errOut, "--csv") || out != "" {
		t.Errorf("exit %d, stdout %q, stderr %q", code, out, errOut)
	}
	if _, err := os.Stat(path); err == nil {
		t.Error("file created on failure")
	}
}

// Unusable input exits 2 with a message that helps.
func TestWaveformBadInput(t *testing.T) {
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"iec-61000"}, "known: eft, hbm, iec61000-4-2"},
		{[]string{}, "want one waveform name"},
		{[]string{"iec61000-4-2", "hbm"}, "want one waveform name"},
		{[]string{"iec61000-4-2", "--level", "4kA"}, "--level"},
		{[]string{"iec61000-4-2", "--level", "-4k"}, "must be positive"},
		{[]string{"hbm", "--load", "-5"}, "--load"},
		{[]string{"hbm", "--load", "lots"}, "--load"},
		{[]string{"tlp", "--set", "rise"}, "key=value"},
		{[]string{"tlp", "--set", "rise=200n"}, "shorter than width"},
		{[]string{"pwl"}, "file"},
	} {
		_, errOut, code := runW(t, c.args...)
		if code != exitUnusable || !strings.Contains(errOut, c.want) {
			t.Errorf("%v: exit %d, stderr %q, want 2 and %q", c.args, code, errOut, c.want)
		}
	}
	// --help is not an error and shows the worked example.
	_, errOut, code := runW(t, "--help")
	if code != 0 || !strings.Contains(errOut, "zapnet waveform iec61000-4-2 --level 8k") {
		t.Errorf("--help: exit %d, %q", code, errOut)
	}
}

// The generator self-check: every generator circuit, solved by the engine
// into each load its standard calibrates into, meets every published check
// point [pub/mem per check: IEC 61000-4-2's table; IEC 61000-4-5's wave
// parameters and 2 Ω; IEC 61000-4-4's pulse into 50 Ω and 1 kΩ], and the
// JSON for CI says so: pass true, each check with name, value, published,
// low, high and pass; an open circuit's load is null, as is an unbounded
// side of a window.
func TestWaveformGeneratorSelfCheck(t *testing.T) {
	for _, c := range []struct {
		args  []string
		load  any // the JSON's load: a number of ohms, or nil for open
		count int // checks
	}{
		{[]string{"iec61000-4-2-network", "--level", "8k"}, 2.0, 4},
		{[]string{"iec61000-4-2-air", "--level", "15k", "--set", "approach=0.5"}, 2.0, 12},
		{[]string{"surge-cwg", "--load", "open"}, nil, 4},
		{[]string{"surge-cwg", "--load", "short", "--set", "path=io"}, 0.0, 5},
		{[]string{"eft", "--set", "burst=5k", "--load", "50"}, 50.0, 3},
		{[]string{"eft", "--set", "burst=100k", "--load", "1000", "--level", "4k"}, 1000.0, 3},
	} {
		out, errOut, code := runW(t, append(c.args, "--json", "-")...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", c.args, code, errOut)
		}
		var doc struct {
			Waveform string         `json:"waveform"`
			Load     any            `json:"load"`
			Pass     bool           `json:"pass"`
			Params   map[string]any `json:"params"`
			Checks   []map[string]any
			Caution  string `json:"caution"`
		}
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatalf("%v: %v\n%s", c.args, err, out)
		}
		if !doc.Pass || doc.Waveform != c.args[0] || doc.Load != c.load || len(doc.Checks) != c.count || doc.Caution == "" {
			t.Errorf("%v: pass %v, load %v, %d checks:\n%s", c.args, doc.Pass, doc.Load, len(doc.Checks), out)
		}
		for _, k := range doc.Checks {
			for _, key := range []string{"name", "value", "published", "low", "high", "pass"} {
				if _, ok := k[key]; !ok {
					t.Errorf("%v: check %v lacks %s", c.args, k, key)
				}
			}
			if k["pass"] != true {
				t.Errorf("%v: check %v fails", c.args, k)
			}
			if k["tolerance"] == "none published" && (k["published"] != nil && !strings.HasPrefix(k["name"].(string), "through") || k["low"] != nil || k["high"] != nil) {
				t.Errorf("%v: a row without a published window carries one: %v", c.args, k)
			}
		}
		// The report itself went to stderr.
		if !strings.Contains(errOut, "Waveform "+c.args[0]) {
			t.Errorf("%v: no report on stderr:\n%s", c.args, errOut)
		}
	}
}

// The generator reports are golden files: the circuit, the checks into the
// calibration load, the air discharge's first peak against the level, the
// coupling path's current.
func TestWaveformGeneratorReports(t *testing.T) {
	for _, c := range []struct {
		file string
		args []string
	}{
		{"waveform-iec61000-4-2-network-8k.txt", []string{"iec61000-4-2-network", "--level", "8k"}},
		{"waveform-iec61000-4-2-air-8k.txt", []string{"iec61000-4-2-air", "--level", "8k"}},
		{"waveform-surge-cwg-line-earth-short.txt", []string{"surge-cwg", "--load", "short", "--set", "path=line-earth"}},
		{"waveform-eft-burst-1k.txt", []string{"eft", "--set", "burst=5k", "--load", "1k"}},
	} {
		out, errOut, code := runW(t, c.args...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", c.args, code, errOut)
		}
		golden(t, c.file, []byte(out))
	}
}
