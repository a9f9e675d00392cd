package main

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const fitData = "../../testdata/fit/"

func TestFitReportsGolden(t *testing.T) {
	// The reports of the worked examples of README's fit section: the part
	// line, the parameters, every point beside the model, the notes.
	for _, c := range []struct {
		golden string
		args   []string
	}{
		{"fit-clamp-tlp.txt", []string{"fit", "clamp", "--tlp", fitData + "tvs5-tlp.csv", "--name", "tvs5u"}},
		{"fit-clamp-datasheet.txt", []string{"fit", "clamp", "--datasheet", fitData + "tvs5-uni.points"}},
		{"fit-snapback-tlp.txt", []string{"fit", "clamp", "--snapback", "--tlp", fitData + "esdsnap-tlp.csv", "--name", "esdsnap"}},
		{"fit-bead-touchstone.txt", []string{"fit", "bead", "--touchstone", fitData + "bead600.s2p"}},
		{"fit-bead-bias.txt", []string{"fit", "bead", "--z", fitData + "bead600-bias.csv", "--rdc", "90m", "--name", "bead600"}},
		{"fit-pin-tlp.txt", []string{"fit", "pin", "--tlp", fitData + "pinA-tlp.csv", "--name", "pinA"}},
		{"fit-pin-ibis.txt", []string{"fit", "pin", "--ibis", fitData + "sensor-input.ibs", "--model", "1", "--name", "senseA"}},
	} {
		out, errOut, code := zapnet(t, c.args...)
		if code != exitPass {
			t.Fatalf("%v: exit %d\n%s", c.args, code, errOut)
		}
		golden(t, c.golden, []byte(out))
	}
}

func TestFitJSONAndPartLineRun(t *testing.T) {
	// --json writes the document of OUTPUT.md's shape, keyed by the deck's
	// parameter names; the part line it prints is ready to include: a deck
	// that uses it runs.
	dir := t.TempDir()
	abs := func(p string) string { a, _ := filepath.Abs(fitData + p); return a }
	cases := []struct {
		args    []string
		kind    string
		keys    []string
		element string
	}{
		{[]string{"fit", "clamp", "--tlp", abs("tvs5-tlp.csv"), "--name", "tvs"}, "clamp", []string{"vbr", "rdyn", "nbr"}, "clamp D1 a gnd part=tvs"},
		{[]string{"fit", "clamp", "--snapback", "--tlp", abs("esdsnap-tlp.csv"), "--name", "snap"}, "snapback", []string{"vt1", "it1", "vh", "ih", "ron"}, "snapback D1 a gnd part=snap"},
		{[]string{"fit", "bead", "--touchstone", abs("bead600.s2p"), "--name", "fb"}, "bead", []string{"rdc", "l", "c", "rac"}, "bead D1 a b part=fb\ncapacitor C9 b gnd 10n"},
		{[]string{"fit", "pin", "--tlp", abs("pinA-tlp.csv"), "--name", "pinA"}, "pin", []string{"ifail"}, "resistor R1 a b 10ohm\npin D1 b gnd part=pinA"},
		{[]string{"fit", "pin", "--ibis", abs("sensor-input.ibs"), "--model", "1", "--name", "sense"}, "pin", nil, "resistor R1 a b 10ohm\npin D1 b gnd part=sense"},
	}
	for i, c := range cases {
		js := filepath.Join(dir, "fit.json")
		os.Remove(js)
		_, errOut, code := zapnet(t, append(c.args, "--json", js)...)
		if code != exitPass {
			t.Fatalf("%v: exit %d\n%s", c.args, code, errOut)
		}
		var doc struct {
			Tool   string             `json:"tool"`
			Kind   string             `json:"kind"`
			Params map[string]float64 `json:"params"`
			Part   string             `json:"part"`
			Points []struct {
				X        *float64 `json:"x"`
				Measured *float64 `json:"measured"`
				Fitted   *float64 `json:"fitted"`
			} `json:"points"`
		}
		b, err := os.ReadFile(js)
		if err != nil {
			t.Fatal(err)
		}
		if err := json.Unmarshal(b, &doc); err != nil {
			t.Fatal(err)
		}
		if doc.Tool != "zapnet" || doc.Kind != c.kind || len(doc.Points) == 0 || !strings.HasPrefix(doc.Part, "part ") {
			t.Errorf("%v: document %s", c.args, b)
		}
		for _, k := range c.keys {
			if _, ok := doc.Params[k]; !ok {
				t.Errorf("%v: params lack %s: %v", c.args, k, doc.Params)
			}
		}
		for _, p := range doc.Points {
			if p.X == nil || p.Measured == nil || p.Fitted == nil {
				t.Fatalf("%v: a point lacks x, measured or fitted", c.args)
			}
		}
		deck := filepath.Join(dir, "use.zap")
		text := "title \"fitted part\"\n" + doc.Part + "\nstrike zap a gnd waveform=iec61000-4-2 level=2k\n" + c.element + "\nwatch a\n"
		if err := os.WriteFile(deck, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		out, errOut, code := zapnet(t, "run", deck)
		if code == exitUnusable {
			t.Errorf("case %d: the deck with the fitted part does not run (exit %d):\n%s\n%s%s", i, code, text, out, errOut)
		}
	}
}

func TestFitPlots(t *testing.T) {
	dir := t.TempDir()
	for _, c := range []struct {
		args []string
		file string
	}{
		{[]string{"fit", "clamp", "--tlp", fitData + "tvs5-tlp.csv", "--name", "tvs"}, "tvs_iv.svg"},
		{[]string{"fit", "bead", "--z", fitData + "bead600-bias.csv", "--name", "fb"}, "fb_z.svg"},
	} {
		if _, errOut, code := zapnet(t, append(c.args, "--plot", dir)...); code != exitPass {
			t.Fatalf("%v: %s", c.args, errOut)
		}
		b, err := os.ReadFile(filepath.Join(dir, c.file))
		if err != nil || !strings.Contains(string(b), "<svg") {
			t.Errorf("%s: %v", c.file, err)
		}
	}
}

func TestFitJSONToStdoutKeepsTheReport(t *testing.T) {
	// With --json - standard output holds the JSON alone and the report,
	// its caution included, goes to stderr, as every command's tables do.
	out, errOut, code := zapnet(t, "fit", "clamp", "--tlp", fitData+"tvs5-tlp.csv", "--json", "-")
	if code != exitPass {
		t.Fatalf("exit %d\n%s", code, errOut)
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Errorf("stdout is not one JSON document: %v\n%s", err, out)
	}
	if !strings.Contains(errOut, fitCaution) || !strings.Contains(errOut, "part tvs5-tlp clamp") {
		t.Errorf("stderr lacks the report and its caution:\n%s", errOut)
	}
}

func TestFitClampSaysWhereIt2CameFrom(t *testing.T) {
	// A published it2 is the datasheet's, not a TLP curve's.
	out, errOut, code := zapnet(t, "fit", "clamp", "--point", "vbr 6.6V@1mA", "--point", "vc 11.9V@16A tlp", "--point", "it2 20A")
	if code != exitPass {
		t.Fatalf("exit %d\n%s", code, errOut)
	}
	if !strings.Contains(out, "the datasheet gives the clamp's TLP failure current It2 = 20 A") || strings.Contains(out, "the TLP curve shows") {
		t.Errorf("the note on it2 does not name the datasheet:\n%s", out)
	}
}

func TestFitBadInputWritesNothing(t *testing.T) {
	// Malformed files are reported as file:line:col: message, the command
	// exits 2 and writes no output file.
	dir := t.TempDir()
	write := func(name, text string) string {
		p := filepath.Join(dir, name)
		os.WriteFile(p, []byte(text), 0o644)
		return p
	}
	tlp := write("bad.csv", "v [V],i [A]\n1,0.001\n2,x\n")
	s2p := write("bad.s2p", "# MHz S MA R 50\n1 0.1 0 0.9 -10 0.9 -10\n")
	ibs := write("bad.ibs", "[Model] m\n[GND Clamp]\n-1 -0.1 -0.2\n")
	pts := write("bad.points", "vc 9V @ 5A\n")
	snap := write("snap.csv", "v,i\n1,0.001\n9,0.05\n5,0.5\n6,1\n")
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"fit", "clamp", "--tlp", tlp}, "bad.csv:3:3: column \"i\": \"x\" is not a number"},
		{[]string{"fit", "bead", "--touchstone", s2p}, "bad.s2p:2:1: the record of frequency 1 has 7 numbers"},
		{[]string{"fit", "pin", "--ibis", ibs, "--model", "m"}, "bad.ibs:3:1: a clamp table row has a voltage and 1 or 3 currents"},
		{[]string{"fit", "clamp", "--datasheet", pts}, "bad.points:1:1: vc needs the pulse it was measured with"},
		{[]string{"fit", "clamp", "--point", "vbr 6.8V", "--point", "vc 9V@5A 8/20"}, "--point:1:1: vbr needs its condition"},
		{[]string{"fit", "pin", "--tlp", snap}, "snap.csv:4:1: 5 V at 0.5 A is not above 9 V at 0.05 A"},
		// A data file is read as a deck is: a regular file of bounded size
		// (a pipe or a device would never end).
		{[]string{"fit", "clamp", "--tlp", dir}, "is not a regular file"},
		{[]string{"fit", "bead", "--touchstone", dir}, "is not a regular file"},
	} {
		js := filepath.Join(dir, "out.json")
		figs := filepath.Join(dir, "figs")
		_, errOut, code := zapnet(t, append(c.args, "--json", js, "--plot", figs)...)
		if code != exitUnusable || !strings.Contains(errOut, c.want) {
			t.Errorf("%v: exit %d, stderr %q; want 2 and %q", c.args, code, errOut, c.want)
		}
		if _, err := os.Stat(js); err == nil {
			t.Errorf("%v: wrote %s on error", c.args, js)
		}
		if _, err := os.Stat(figs); err == nil {
			t.Errorf("%v: made %s on error", c.args, figs)
		}
	}
	// A TLP curve that snaps back draws a warning when fitted as a clamp.
	out, _, code := zapnet(t, "fit", "clamp", "--tlp", snap, "--polarity", "uni")
	if code == exitPass && !strings.Contains(out, "snap.csv:4:1: warning: the voltage falls from 9 V to 5 V") {
		t.Errorf("no snapback warning:\n%s", out)
	}
}

func TestFittedPartsDeckRuns(t *testing.T) {
	// README's deck of fitted parts: a table-path pin found beside the
	// deck, and a clamp whose 18 A ipp (an 8/20 rating) an 8 kV strike's
	// 30 A exceeds, which the verdict says.
	out, errOut, code := zapnet(t, "run", fitData+"fitted-parts.zap")
	if code != exitFail || !strings.Contains(out, "D1: peak current") || !strings.Contains(out, "above ipp 18 A") {
		t.Errorf("exit %d\n%s%s", code, out, errOut)
	}
}

func TestFitNeverWritesOverItsInput(t *testing.T) {
	// An output that is one of the data files read is refused before the
	// fit, and the file is left as it was.
	dir := t.TempDir()
	src, _ := os.ReadFile(fitData + "pinA-tlp.csv")
	tlp := filepath.Join(dir, "pin.csv")
	os.WriteFile(tlp, src, 0o644)
	for _, args := range [][]string{
		{"fit", "pin", "--tlp", tlp, "--table", tlp, "--leak", "3.3V@2nA"},
		{"fit", "clamp", "--tlp", tlp, "--json", tlp},
	} {
		_, errOut, code := zapnet(t, args...)
		if code != exitUnusable || !strings.Contains(errOut, "that is an input of this command") {
			t.Errorf("%v: exit %d, %s", args, code, errOut)
		}
		if b, _ := os.ReadFile(tlp); string(b) != string(src) {
			t.Fatalf("%v: the input was changed", args)
		}
	}
}

// A data file of a thousand bad rows is reported as a deck is: the first
// hundred problems, a line counting the rest, and the true count in the
// summary [calc: 1000 bad fields and no good row, 1001 problems].
func TestFitProblemsBounded(t *testing.T) {
	var b strings.Builder
	b.WriteString("v [V],i [A]\n")
	for i := range 1000 {
		fmt.Fprintf(&b, "%d,x\n", i)
	}
	p := filepath.Join(t.TempDir(), "many.csv")
	if err := os.WriteFile(p, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errOut, code := zapnet(t, "fit", "clamp", "--tlp", p)
	if code != exitUnusable || !strings.Contains(errOut, ": 1001 problem(s):") ||
		!strings.Contains(errOut, "\n... and 901 more problems (the first 100 are shown)") {
		t.Errorf("exit %d, stderr:\n%s", code, errOut)
	}
	if n := strings.Count(errOut, "\n"); n > 110 {
		t.Errorf("%d lines for a capped list", n)
	}
}

// A fitted part's name passes the rule the deck reads names by, no more
// and no less (LANGUAGE.md: a letter or _ first, then letters, digits, _,
// - and .; letters are Unicode letters).
func TestFitPartNameIsADeckName(t *testing.T) {
	for name, ok := range map[string]bool{"tvs5u": true, "_a.b-1": true, "Ωx": true, "1x": false, "a b": false, "": false} {
		if err := checkPartName(name); (err == nil) != ok {
			t.Errorf("checkPartName(%q) = %v, want accepted %v", name, err, ok)
		}
	}
}
