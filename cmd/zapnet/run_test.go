package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

const (
	demoDeck   = "../../testdata/demo-weak.zap"
	noClamp    = "../../testdata/fail/no-clamp.zap"
	brokenDeck = "../../testdata/bad/run-unknown-key.zap"
)

func runMain(t *testing.T, args ...string) (stdout, stderr string, code int) {
	t.Helper()
	return zapnet(t, append([]string{"run"}, args...)...)
}

// The demo's report is a golden file: every number in it is printed with
// four significant digits, and nothing depends on the machine or the clock.
func TestRunDemoGolden(t *testing.T) {
	out, errs, code := runMain(t, demoDeck)
	if code != exitFail {
		t.Errorf("exit %d, want %d (the demo fails at 6 and 8 kV); stderr:\n%s", code, exitFail, errs)
	}
	golden(t, "run-demo.txt", []byte(out))
	for _, want := range []string{"2 kV  | pos      | PASS", "8 kV  | neg      | FAIL",
		"A simulation is an estimate, not a compliance result"} {
		if !strings.Contains(out, want) {
			t.Errorf("report lacks %q", want)
		}
	}
}

// Exit status per OUTPUT.md: 0 every run PASS, 1 completed with a FAIL, 2
// unusable input, with a message naming file:line:col.
func TestRunExitCodes(t *testing.T) {
	cases := []struct {
		name string
		args []string
		code int
		msg  string // in stderr
	}{
		{"passing levels", []string{demoDeck, "--level", "2k,4k"}, exitPass, ""},
		{"failing levels", []string{demoDeck, "--level", "8kV", "--polarity", "neg"}, exitFail, ""},
		{"no clamp", []string{noClamp}, exitFail, ""},
		{"broken deck", []string{brokenDeck}, exitUnusable, "run-unknown-key.zap:5:27: unknown parameter vbrr"},
		{"unsolvable deck", []string{"../../testdata/bad/run-solve-fail.zap"}, exitUnusable, "V1"},
		{"missing deck", []string{"../../testdata/no-such-deck.zap"}, exitUnusable, "no-such-deck.zap"},
		{"bad polarity", []string{demoDeck, "--polarity", "up"}, exitUnusable, "--polarity"},
		{"bad level", []string{demoDeck, "--level", "8kk"}, exitUnusable, "--level"},
		{"no deck", nil, exitUnusable, "want one deck"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, errs, code := runMain(t, c.args...)
			if code != c.code {
				t.Errorf("exit %d, want %d; stderr:\n%s", code, c.code, errs)
			}
			if !strings.Contains(errs, c.msg) {
				t.Errorf("stderr %q lacks %q", errs, c.msg)
			}
			if strings.Contains(errs, "goroutine ") || strings.Contains(errs, "panic") {
				t.Errorf("stderr shows a stack trace:\n%s", errs)
			}
		})
	}
}

// The JSON carries every field OUTPUT.md documents, with the documented
// types and units, and its ledger adds up to its balance.
func TestRunJSONFields(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.json")
	_, errs, code := runMain(t, demoDeck, "--level", "2k", "--json", path)
	if code != exitPass {
		t.Fatalf("exit %d; stderr:\n%s", code, errs)
	}
	raw, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var doc map[string]any
	if err := json.Unmarshal(raw, &doc); err != nil {
		t.Fatalf("not JSON: %v", err)
	}
	if doc["tool"] != "zapnet" || doc["version"] != Version || doc["deck"] != demoDeck || doc["title"] == "" {
		t.Errorf("header fields wrong: tool %v version %v deck %v title %v", doc["tool"], doc["version"], doc["deck"], doc["title"])
	}
	runs, _ := doc["runs"].([]any)
	if len(runs) != 2 {
		t.Fatalf("want 2 runs (2 kV pos and neg), got %d", len(runs))
	}
	for i, x := range runs {
		r := x.(map[string]any)
		need := func(obj map[string]any, key string) any {
			t.Helper()
			v, ok := obj[key]
			if !ok {
				t.Errorf("run %d: field %q missing", i, key)
			}
			return v
		}
		if _, ok := need(r, "variant").(map[string]any); !ok {
			t.Errorf("run %d: variant is not an object", i)
		}
		if need(r, "waveform") != "iec61000-4-2" || need(r, "level") != 2000.0 {
			t.Errorf("run %d: waveform %v level %v", i, r["waveform"], r["level"])
		}
		if p := need(r, "polarity"); p != []string{"pos", "neg"}[i] {
			t.Errorf("run %d: polarity %v", i, p)
		}
		if v := need(r, "verdict"); v != "PASS" {
			t.Errorf("run %d: verdict %v", i, v)
		}
		if _, ok := need(r, "failures").([]any); !ok {
			t.Errorf("run %d: failures is not a list", i)
		}
		nodes, _ := need(r, "nodes").(map[string]any)
		n2, _ := nodes["n2"].(map[string]any)
		for _, k := range []string{"max", "t_max", "min", "t_min"} {
			if _, ok := n2[k].(float64); !ok {
				t.Errorf("run %d: nodes.n2.%s missing", i, k)
			}
		}
		elems, _ := need(r, "elements").(map[string]any)
		d1, _ := elems["D1"].(map[string]any)
		for _, k := range []string{"peak_current", "energy"} {
			if _, ok := d1[k].(float64); !ok {
				t.Errorf("run %d: elements.D1.%s missing", i, k)
			}
		}
		u1, _ := elems["U1"].(map[string]any)
		res, _ := u1["residual"].(map[string]any)
		for _, k := range []string{"peak", "t_peak", "width_above_vmax", "energy"} {
			if _, ok := res[k].(float64); !ok {
				t.Errorf("run %d: elements.U1.residual.%s missing", i, k)
			}
		}
		// Ranges from physics, not from this program: at 2 kV the clamp
		// carries most of the 7.5 A first peak [pub: IEC 61000-4-2 table].
		if pk := d1["peak_current"].(float64); pk < 5 || pk > 8.7 {
			t.Errorf("run %d: D1 peak current %.3g A, want 5 to 8.7 A at 2 kV", i, pk)
		}
		ledger, _ := need(r, "ledger").(map[string]any)
		strike, _ := ledger["strike"].(float64)
		bal, ok := ledger["balance"].(float64)
		if !(strike < 0) || !ok {
			t.Errorf("run %d: ledger strike %v (want negative: it delivers) balance %v", i, ledger["strike"], ledger["balance"])
		}
		sum := 0.0
		for k, v := range ledger {
			if k != "balance" {
				sum += v.(float64)
			}
		}
		if math.Abs(sum-bal) > 1e-9*math.Abs(strike) {
			t.Errorf("run %d: ledger entries sum to %.4g J, balance %.4g J", i, sum, bal)
		}
		stats, _ := need(r, "stats").(map[string]any)
		for _, k := range []string{"steps", "rejected", "newton"} {
			if _, ok := stats[k].(float64); !ok {
				t.Errorf("run %d: stats.%s missing", i, k)
			}
		}
		if stats["steps"].(float64) < 10 {
			t.Errorf("run %d: %v steps", i, stats["steps"])
		}
	}
}

// --json - puts the document on stdout and the tables on stderr.
func TestRunJSONStdout(t *testing.T) {
	out, errs, code := runMain(t, demoDeck, "--level", "2k", "--polarity", "pos", "--json", "-")
	if code != exitPass {
		t.Fatalf("exit %d; stderr:\n%s", code, errs)
	}
	var doc struct {
		Runs []struct{ Verdict string } `json:"runs"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil || len(doc.Runs) != 1 {
		t.Fatalf("stdout is not the JSON document (%v):\n%s", err, out)
	}
	if !strings.Contains(errs, "Summary") {
		t.Errorf("tables not on stderr")
	}
}

// --csv writes one file per run into a folder, each named after its run,
// with OUTPUT.md's header and one row per accepted point.
func TestRunCSV(t *testing.T) {
	dir := t.TempDir() + "/"
	_, errs, code := runMain(t, demoDeck, "--level", "2k", "--csv", dir)
	if code != exitPass {
		t.Fatalf("exit %d; stderr:\n%s", code, errs)
	}
	for _, pol := range []string{"pos", "neg"} {
		f, err := os.Open(filepath.Join(dir, "demo-weak_2kV_"+pol+".csv"))
		if err != nil {
			t.Fatal(err)
		}
		rows, err := csv.NewReader(f).ReadAll()
		f.Close()
		if err != nil {
			t.Fatal(err)
		}
		head := strings.Join(rows[0], ",")
		if !strings.HasPrefix(head, "time [s],tip [V],n1 [V],n2 [V],Lpad [A],D1 [A]") || !strings.HasSuffix(head, "U1.ipath [A],zap [A]") {
			t.Errorf("header %q", head)
		}
		if len(rows) < 50 {
			t.Errorf("only %d rows", len(rows))
		}
		// The strike column is the waveform: its peak at 2 kV is 7.5 A
		// ±15 % [pub: IEC 61000-4-2 table], negative for neg.
		peak := 0.0
		for _, row := range rows[1:] {
			v := mustFloat(t, row[len(row)-1])
			if math.Abs(v) > math.Abs(peak) {
				peak = v
			}
		}
		if want := map[string]float64{"pos": 7.5, "neg": -7.5}[pol]; math.Abs(peak-want) > 0.15*7.5 {
			t.Errorf("%s: strike peak %.3g A, want %.3g A ±15 %%", pol, peak, want)
		}
	}
	// Several runs and a plain file name: refused, and nothing is written.
	file := filepath.Join(t.TempDir(), "one.csv")
	_, errs, code = runMain(t, demoDeck, "--level", "2k", "--csv", file)
	if code != exitUnusable || !strings.Contains(errs, "{run}") {
		t.Errorf("several runs into one file: exit %d, stderr %q", code, errs)
	}
	if _, err := os.Stat(file); !os.IsNotExist(err) {
		t.Errorf("a refused CSV left %s behind", file)
	}
}

func mustFloat(t *testing.T, s string) float64 {
	t.Helper()
	var v float64
	if err := json.Unmarshal([]byte(s), &v); err != nil {
		t.Fatalf("%q is not a number", s)
	}
	return v
}

// Levels on the command line follow the deck's rule: a plain number or one
// in the waveform's unit, so 8kA on a discharge deck (volts) or 24V on a
// current surge (amperes) is refused before anything is solved
// [LANGUAGE.md: a unit that does not fit is an error].
func TestCommandLineLevelsKeepTheirUnits(t *testing.T) {
	dir := t.TempDir()
	surge := filepath.Join(dir, "surge.zap")
	if err := os.WriteFile(surge, []byte("strike s a gnd waveform=surge-8-20 level=100\nresistor R a gnd 1\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"run", demoDeck, "--level", "8kA"}, "8kA is in amperes, but the levels of waveform iec61000-4-2 are in volts"},
		{[]string{"run", surge, "--level", "24V"}, "24V is in volts, but the levels of waveform surge-8-20 are in amperes"},
		{[]string{"margin", demoDeck, "--max", "30kA"}, "--max 30kA: 30kA is in amperes"},
		{[]string{"sensitivity", demoDeck, "--level", "-2k"}, "must be positive"},
		{[]string{"run", demoDeck, "--level", "2k,,4k"}, "--level"},
	} {
		out, errs, code := zapnet(t, c.args...)
		if code != exitUnusable || !strings.Contains(errs, c.want) || out != "" {
			t.Errorf("%v: exit %d, stdout %q, stderr %q; want 2 and %q before any solve", c.args, code, out, errs, c.want)
		}
	}
	if out, _, code := zapnet(t, "run", demoDeck, "--level", "2kV", "--polarity", "pos"); code != exitPass || !strings.Contains(out, "2 kV") {
		t.Errorf("--level 2kV: exit %d", code)
	}
}

// The JSON of one demo run is a golden file too: it shows the document's
// shape to anyone who reads it by machine. Numbers are rounded to four
// significant digits and the engine's counts zeroed for the comparison, so
// that the golden file follows the physics rather than the last bit of the
// step control.
func TestRunJSONGolden(t *testing.T) {
	var out, errs bytes.Buffer
	opt := runOptions{deck: demoDeck, levels: "2k", polarities: []string{"pos"}, json: "-"}
	if err := runStudy(opt, &out, &errs); err != nil {
		t.Fatalf("%v\n%s", err, errs.String())
	}
	var doc map[string]any
	if err := json.Unmarshal(out.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	for _, r := range doc["runs"].([]any) {
		stats := r.(map[string]any)["stats"].(map[string]any)
		if _, ok := stats["wall_s"]; ok {
			t.Errorf("wall time in the results without --timings: %v", stats["wall_s"])
		}
		for k := range stats {
			stats[k] = 0
		}
	}
	b, err := json.MarshalIndent(round4(doc), "", "  ")
	if err != nil {
		t.Fatal(err)
	}
	golden(t, "run-demo-2kV-pos.json", append(b, '\n'))
}

// round4 rounds every number in a decoded JSON value to four significant
// digits.
func round4(v any) any {
	switch x := v.(type) {
	case float64:
		if x == 0 || math.IsInf(x, 0) || math.IsNaN(x) {
			return x
		}
		f, _ := strconv.ParseFloat(strconv.FormatFloat(x, 'g', 4, 64), 64)
		return f
	case map[string]any:
		for k, e := range x {
			x[k] = round4(e)
		}
	case []any:
		for i, e := range x {
			x[i] = round4(e)
		}
	}
	return v
}

// The README's first command runs testdata/demo.zap: it must complete and
// pass at every level and polarity, so that a new user sees exit status 0
// and a report whose worst margins say how much room the design has.
func TestREADMEDemoPasses(t *testing.T) {
	var out, errs bytes.Buffer
	if code := Main([]string{"run", "../../testdata/demo.zap"}, &out, &errs); code != exitPass {
		t.Fatalf("exit %d, want 0; stderr:\n%s\n%s", code, errs.String(), out.String())
	}
	if !strings.Contains(out.String(), "8 runs: 8 PASS, 0 FAIL") {
		t.Errorf("summary line missing or not all PASS:\n%s", out.String())
	}
}

// Two identical runs write identical results, byte for byte; the wall
// time of each solve is in the JSON only with --timings [practice: a
// result file under version control changes only when a result does].
func TestIdenticalRunsIdenticalFiles(t *testing.T) {
	dir := t.TempDir()
	var files [3][]byte
	for i, extra := range [][]string{nil, nil, {"--timings"}} {
		path := filepath.Join(dir, fmt.Sprintf("r%d.json", i))
		args := append([]string{demoDeck, "--level", "2k,8k", "--json", path}, extra...)
		if _, errs, code := runMain(t, args...); code == exitUnusable {
			t.Fatalf("exit %d\n%s", code, errs)
		}
		b, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		files[i] = b
	}
	if !bytes.Equal(files[0], files[1]) {
		t.Error("two identical runs wrote different JSON")
	}
	if bytes.Contains(files[0], []byte("wall_s")) || !bytes.Contains(files[2], []byte(`"wall_s": `)) {
		t.Error("wall_s must be in the JSON with --timings only")
	}
}
