package netlist

import (
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"zapnet/devices/spec"
)

func mustParse(t *testing.T, src string) *Circuit {
	t.Helper()
	c, err := Parse("t.zap", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	return c
}

const planDeck = `part tvsA clamp vbr=6.8 rdyn=0.3
part tvsB clamp vbr=5.6 cj=20p polarity=bi
strike zap tip gnd waveform=iec61000-4-2 level=2k,4k,6k,8k polarity=both
inductor Lpad tip n1 1.5n
clamp D1 n1 gnd part=tvsA ls=0.4n
capacitor C1 n1 gnd 100n esr=20m
pin U1 n1 gnd cin=6p vmax=5.5 vmin=-0.5
vary C1.value=10n,100n,1u
vary D1.part=tvsA,tvsB
`

// Plan counts runs as levels × polarities × variants (LANGUAGE.md: several
// vary lines form their cartesian product).
func TestPlan(t *testing.T) {
	c := mustParse(t, planDeck)
	pl := c.Plan()
	if pl.Waveform.Name != "iec61000-4-2" || !reflect.DeepEqual(pl.Levels, []float64{2000, 4000, 6000, 8000}) ||
		!reflect.DeepEqual(pl.Polarities, []string{"pos", "neg"}) {
		t.Fatalf("plan %+v", pl)
	}
	if got, want := pl.Runs(), 4*2*3*2; got != want {
		t.Errorf("Runs() = %d, want %d", got, want)
	}
	var got []string
	for _, v := range pl.Variants {
		var s []string
		for _, x := range v {
			s = append(s, x.String())
		}
		got = append(got, strings.Join(s, " "))
	}
	want := []string{
		"C1.value=10n D1.part=tvsA", "C1.value=10n D1.part=tvsB",
		"C1.value=100n D1.part=tvsA", "C1.value=100n D1.part=tvsB",
		"C1.value=1u D1.part=tvsA", "C1.value=1u D1.part=tvsB",
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("variants\n%q\nwant\n%q", got, want)
	}

	one := mustParse(t, "strike s a gnd waveform=tlp level=8A,16A polarity=neg\nresistor R a gnd 1\n").Plan()
	if one.Runs() != 2 || len(one.Variants) != 1 || len(one.Variants[0]) != 0 || !reflect.DeepEqual(one.Polarities, []string{"neg"}) {
		t.Errorf("plan without vary: %+v", one)
	}
	pos := mustParse(t, "strike s a gnd waveform=tlp level=8A\nresistor R a gnd 1\n").Plan()
	if !reflect.DeepEqual(pos.Polarities, []string{"pos"}) {
		t.Errorf("default polarity %v", pos.Polarities)
	}
}

func TestWith(t *testing.T) {
	c := mustParse(t, planDeck)
	before := c.Element("D1").clone()
	x, err := c.With(setting(t, c, "C1.value", "4.7uF"), setting(t, c, "C1.esl", "0.5n"), setting(t, c, "D1.part", "tvsB"))
	if err != nil {
		t.Fatal(err)
	}
	if got := nums(x.Element("C1")); got["value"] != 4.7e-6 || got["esl"] != 0.5e-9 || got["esr"] != 0.02 {
		t.Errorf("C1 %v", got)
	}
	// The new part's values, the element's own override (ls) kept, the
	// old part's values (rdyn) gone back to the default.
	d := x.Element("D1")
	if n, w := nums(d), words(d); n["vbr"] != 5.6 || n["cj"] != 20e-12 || n["ls"] != 0.4e-9 || n["rdyn"] != 0 ||
		w["polarity"] != "bi" || w["part"] != "tvsB" {
		t.Errorf("D1 after part swap: %v %v", n, w)
	}
	// c is untouched.
	if !reflect.DeepEqual(c.Element("D1"), before) || c.Element("C1").Values.Num("value") != 100e-9 {
		t.Errorf("With modified its receiver")
	}
	// Settings build on each other; a program gives a number as a number.
	v := 1.1 * 6.8
	y, err := x.With(Setting{Element: "D1", Param: "vbr", Num: v, Text: strconv.FormatFloat(v, 'g', -1, 64)})
	if err != nil {
		t.Fatal(err)
	}
	if n := nums(y.Element("D1")); n["vbr"] != v || words(y.Element("D1"))["part"] != "tvsB" || n["ls"] != 0.4e-9 {
		t.Errorf("D1 %v %v", n, words(y.Element("D1")))
	}
	// A pin given vbr by a setting gets the internal clamp's defaults.
	z, err := c.With(setting(t, c, "U1.vbr", "7"))
	if err != nil {
		t.Fatal(err)
	}
	if u := nums(z.Element("U1")); u["it"] != 1e-3 || u["nbr"] != 1 || !z.Element("U1").Values.Has("rdyn") {
		t.Errorf("pin with vbr %v", u)
	}
	if w, err := c.With(); err != nil || w == c || w.Element("C1") == c.Element("C1") {
		t.Errorf("With() must copy")
	}
}

func TestWithErrors(t *testing.T) {
	c := mustParse(t, planDeck)
	// A setting read from text is refused when it names nothing or does
	// not fit its parameter: the error names it, without a deck position.
	for _, tt := range []struct{ target, text, want string }{
		{"C9.value", "1n", "C9.value: no element C9 (did you mean C1?)"},
		{"C1.valu", "1n", "C1.valu: a capacitor has no parameter valu (did you mean value?)"},
		{"C1.value", "1nH", "C1.value=1nH: 1nH is in henries, but the value of a capacitor is in farads"},
		{"C1.value", "-1n", "C1.value=-1n: the value of a capacitor must be positive (got -1n)"},
		{"C1.value", "x", "C1.value=x: \"x\" is not a number"},
		{"D1.part", "tvsC", "D1.part=tvsC: no part tvsC (did you mean tvsA?)"},
		{"C1.part", "tvsA", "C1.part=tvsA: part tvsA is a clamp, not a capacitor (defined at t.zap:1:6)"},
		{"D1.polarity", "both", "D1.polarity=both: clamp polarity is uni or bi, not both"},
		{"zap.level", "1k", "zap.level: levels and polarities are already axes of the study; list them on the strike"},
		{"zap.r", "330", "zap.r: r is a parameter of waveform iso10605, surge-1.2-50, step, not of iec61000-4-2"},
		{"C1value", "1n", "C1value: write ELEMENT.PARAM"},
	} {
		if s, err := c.Setting(tt.target, tt.text); err == nil || err.Error() != tt.want {
			t.Errorf("Setting(%s, %s) = %v, %v; want error %q", tt.target, tt.text, s, err, tt.want)
		}
	}
	// Settings that fit alone but not in the circuit are errors at the
	// element's statement.
	for _, tt := range []struct {
		s    Setting
		want string
	}{
		{setting(t, c, "U1.vmin", "6"), "t.zap:7:1: U1.vmin=6: pin U1: vmin 6 V is not below vmax 5.5 V"},
		{Setting{Element: "C9", Param: "value", Num: 1e-9, Text: "1n"}, "t.zap: C9.value=1n: no element C9 (did you mean C1?)"},
		{Setting{Element: "C1", Param: "value", Num: -1e-9, Text: "-1n"}, "t.zap:6:1: C1.value=-1n: the value of a capacitor must be positive"},
	} {
		x, err := c.With(tt.s)
		var l ErrorList
		if x != nil || !errors.As(err, &l) || err.Error() != tt.want {
			t.Errorf("With(%s) = %v, %v; want error %q", tt.s, x, err, tt.want)
		}
	}
	if x, err := c.With(setting(t, c, "D1.polarity", "bi")); err != nil || x.Element("D1").Values.Word("polarity") != "bi" {
		t.Errorf("polarity setting: %v", err)
	}
}

func BenchmarkWith(b *testing.B) {
	c, err := Parse("t.zap", []byte(planDeck))
	if err != nil {
		b.Fatal(err)
	}
	s := Setting{Element: "D1", Param: "ls", Num: 0.44e-9, Text: "0.44n"}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := c.With(s); err != nil {
			b.Fatal(err)
		}
	}
}

func writeFiles(t *testing.T, files map[string]string) string {
	t.Helper()
	dir := t.TempDir()
	for name, text := range files {
		p := filepath.Join(dir, name)
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

func TestInclude(t *testing.T) {
	dir := writeFiles(t, map[string]string{
		"deck.zap":      "include \"lib/parts.zap\"\ninclude \"lib/parts.zap\"\nstrike s a gnd waveform=hbm level=1k\nclamp D a gnd part=tvs\n",
		"lib/parts.zap": "title \"library\"\ninclude \"more.zap\"\npart tvs clamp vbr=6 rdyn=fast\n",
		"lib/more.zap":  "part tvs2 clamp vbr=7 cj=1nH\n",
	})
	_, err := ParseFile(filepath.Join(dir, "deck.zap"))
	// Errors in included files carry those files' paths, relative to the
	// including file's folder.
	want := filepath.Join(dir, "lib/more.zap") + ":1:26: 1nH is in henries, but cj of a clamp is in farads\n" +
		filepath.Join(dir, "lib/parts.zap") + ":3:27: \"fast\" is not a number"
	if err == nil || err.Error() != want {
		t.Errorf("got\n%v\nwant\n%s", err, want)
	}
}

func TestIncludeCycle(t *testing.T) {
	dir := writeFiles(t, map[string]string{
		"a.zap": "include \"b.zap\"\nstrike s x gnd waveform=hbm level=1k\nresistor R x gnd 1\n",
		"b.zap": "# library\ninclude \"a.zap\"\n",
	})
	a := filepath.Join(dir, "a.zap")
	_, err := ParseFile(a)
	want := filepath.Join(dir, "b.zap") + ":2:9: include cycle: " + a + " → " + filepath.Join(dir, "b.zap") + " → " + a
	if err == nil || err.Error() != want {
		t.Errorf("got\n%v\nwant\n%s", err, want)
	}
	self := writeFiles(t, map[string]string{"s.zap": "include \"s.zap\"\n"})
	_, err = ParseFile(filepath.Join(self, "s.zap"))
	if err == nil || !strings.Contains(err.Error(), "include cycle: "+filepath.Join(self, "s.zap")+" → "+filepath.Join(self, "s.zap")) {
		t.Errorf("self include: %v", err)
	}
}

func TestParseFileMissing(t *testing.T) {
	_, err := ParseFile(filepath.Join(t.TempDir(), "none.zap"))
	var l ErrorList
	if !errors.As(err, &l) || len(l) != 1 || !strings.Contains(err.Error(), "no such file") {
		t.Errorf("got %v", err)
	}
}

func TestDemoDecks(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join("..", "testdata", "*.zap"))
	if len(files) < 4 {
		t.Fatalf("demo decks: %v", files)
	}
	for _, f := range files {
		c, err := ParseFile(f)
		if err != nil {
			t.Errorf("%s: %v", f, err)
			continue
		}
		if len(c.Warnings) > 0 {
			t.Errorf("%s: warnings %v", f, c.Warnings)
		}
		for _, v := range c.Plan().Variants {
			if _, err := c.With(v...); err != nil {
				t.Errorf("%s: %v", f, err)
			}
		}
	}
}

func TestSuggest(t *testing.T) {
	for _, tt := range []struct {
		s    string
		want string
	}{
		{"vbrr", "vbr"}, {"tsv", "tvs"}, {"capacitr", "capacitor"}, {"xyz", ""}, {"rdyn", "rdyn"}, {"q", ""},
	} {
		if got := suggest(tt.s, []string{"vbr", "tvs", "capacitor", "rdyn", "ls"}); got != tt.want {
			t.Errorf("suggest(%q) = %q, want %q", tt.s, got, tt.want)
		}
	}
	// Known distances [calc: by hand, optimal string alignment].
	for _, tt := range []struct {
		a, b string
		d    int
	}{{"kitten", "sitting", 3}, {"ab", "ba", 1}, {"", "abc", 3}, {"µF", "uF", 1}} {
		if got := spec.EditDistance(tt.a, tt.b); got != tt.d {
			t.Errorf("spec.EditDistance(%q, %q) = %d, want %d", tt.a, tt.b, got, tt.d)
		}
	}
}

func TestVariantsHoldTogether(t *testing.T) {
	_, err := Parse("t.zap", []byte("strike s a gnd waveform=hbm level=1k\npin U a gnd vmax=5 vmin=-1\nvary U.vmin=-1,0\nvary U.vmax=3,-0.5\n"))
	want := "t.zap:4:6: the variant U.vmin=0 U.vmax=-0.5 does not hold together: U.vmax=-0.5: pin U: vmin 0 V is not below vmax -500 mV"
	if err == nil || err.Error() != want {
		t.Errorf("got\n%v\nwant\n%s", err, want)
	}
}

// The example of the language reference in README.md must stay a valid deck
// with the run count it claims.
func TestReadmeExample(t *testing.T) {
	text, err := os.ReadFile(filepath.Join("..", "README.md"))
	if err != nil {
		t.Skip("no README.md")
	}
	var lib, deck string
	for _, b := range strings.Split(string(text), "```") {
		b = strings.TrimPrefix(b, "\n")
		switch {
		case strings.HasPrefix(b, "# parts/protect.zap"):
			lib = b
		case strings.HasPrefix(b, `title "Sensor input`):
			deck = b
		}
	}
	if lib == "" || deck == "" {
		t.Fatal("README.md: the example deck or its library is missing")
	}
	dir := writeFiles(t, map[string]string{"parts/protect.zap": lib, "deck.zap": deck})
	c, err := ParseFile(filepath.Join(dir, "deck.zap"))
	if err != nil {
		t.Fatal(err)
	}
	if n := c.Plan().Runs(); !strings.Contains(string(text), "= "+strconv.Itoa(n)+" runs") || n != 24 {
		t.Errorf("the example plans %d runs", n)
	}
}

func BenchmarkParseDemo(b *testing.B) {
	path := filepath.Join("..", "testdata", "demo-weak.zap")
	b.ReportAllocs()
	for b.Loop() {
		if _, err := ParseFile(path); err != nil {
			b.Fatal(err)
		}
	}
}
