package netlist

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

// tail completes a test deck so that each case shows only its own problems:
// a strike on node tst with a resistor to gnd. It comes after the case so that
// the case's positions are those of its own lines.
const tail = "\nstrike zap tst gnd waveform=hbm level=1k\nresistor Rt tst gnd 1k\n"

// problemsOf parses src+tail and returns the errors and the warnings as
// "line:col: message", without the file name.
func problemsOf(t *testing.T, src string) (errs, warns []string) {
	t.Helper()
	c, err := Parse("t.zap", []byte(src+tail))
	var list ErrorList
	if err != nil {
		if !errors.As(err, &list) {
			t.Fatalf("error is %T, not an ErrorList", err)
		}
	} else {
		list = c.Warnings
	}
	for _, e := range list {
		s := strings.TrimPrefix(e.Pos.String(), "t.zap:") + ": " + e.Msg
		if e.Warning {
			warns = append(warns, s)
		} else {
			errs = append(errs, s)
		}
	}
	return errs, warns
}

// The messages below are the contract of LANGUAGE.md's "Behaviour on bad
// input": file:line:col of the token at fault, every problem of a deck in one
// pass, a suggestion where one is obvious.
func TestErrors(t *testing.T) {
	tests := []struct {
		name string
		src  string
		want []string
	}{
		// Statements and keys.
		{"unknown statement", "resistr R1 tst gnd 1k",
			[]string{"1:1: unknown statement resistr (did you mean resistor?)"}},
		{"dot directive", ".include \"x\"",
			[]string{"1:1: unknown statement .include: statements have no leading dot (did you mean include?)"}},
		{"plus continuation", "resistor R1 tst gnd\n+ 1k",
			[]string{"1:10: resistor R1 needs a value in ohms", "2:1: a line cannot continue with +; end the previous line with \\ instead"}},
		{"unknown key", "clamp D1 tst gnd vbrr=6",
			[]string{"1:18: unknown parameter vbrr for a clamp (did you mean vbr?)"}},
		{"unknown key no hint", "clamp D1 tst gnd vbr=6 zzzz=1",
			[]string{"1:24: unknown parameter zzzz for a clamp"}},
		{"missing required", "clamp D1 tst gnd rdyn=1",
			[]string{"1:7: clamp D1 needs vbr (volts)"}},
		{"missing value", "capacitor C1 tst gnd esr=1",
			[]string{"1:11: capacitor C1 needs a value in farads"}},
		{"missing node", "resistor R1 tst",
			[]string{"1:10: resistor R1 needs two nodes: resistor NAME A B VALUE [key=value ...]"}},
		{"bead needs l", "bead FB tst gnd rdc=1",
			[]string{"1:6: bead FB needs l (henries)"}},
		{"line needs z0 and delay", "line T1 tst gnd",
			[]string{"1:6: line T1 needs delay (seconds)", "1:6: line T1 needs z0 (ohms)"}},
		{"positional on clamp", "clamp D1 tst gnd 6.8V",
			[]string{"1:7: clamp D1 needs vbr (volts)", "1:18: unexpected 6.8V: clamp takes no positional value, only key=value parameters"}},
		{"two values", "resistor R1 tst gnd 1k 2k",
			[]string{"1:24: unexpected 2k: resistor takes one value, then key=value parameters"}},
		{"value twice", "resistor R1 tst gnd 1k value=2k",
			[]string{"1:24: value given twice: once after the nodes and once as value="}},
		{"key twice", "clamp D1 tst gnd vbr=6 vbr=7",
			[]string{"1:24: vbr given twice (first at 1:18)"}},
		{"spaces around =", "clamp D1 tst gnd vbr = 6",
			[]string{"1:22: no spaces around = in key=value"}},
		{"space after =", "clamp D1 tst gnd vbr= 6",
			[]string{"1:23: no spaces around = in key=value"}},
		{"spaces in list", "strike s2 tst gnd waveform=hbm level=1k, 2k",
			[]string{"1:42: no spaces in a list: write level=2k,4k", "2:8: second strike zap; a deck has exactly one (the first is s2 at t.zap:1:8)"}},
		{"empty list item", "vary Rt.value=1k,,2k",
			[]string{"1:18: empty item in a list (lists are comma-separated, no spaces)"}},
		{"bad name", "resistor 1R tst gnd 1k",
			[]string{"1:10: element name 1R must start with a letter or _"}},
		{"numeric nodes", "resistor R1 1 0 1k",
			[]string{"1:13: node name 1 must start with a letter or _", "1:15: node name 0 must start with a letter or _; the reference node is gnd"}},
		{"bad char", "resistor R/1 tst gnd 1k",
			[]string{"1:10: element name R/1 may hold only letters, digits, _, - and . (not '/')"}},
		{"unterminated string", "title \"abc",
			[]string{"1:7: string not closed: a quote \" is missing before the end of the line"}},
		{"unquoted title", "title abc",
			[]string{"1:1: title takes one quoted text: title \"...\""}},
		{"second title", "title \"a\"\ntitle \"b\"",
			[]string{"2:1: second title; the first is at t.zap:1:1"}},

		// Numbers and units.
		{"negative capacitance", "capacitor C1 tst gnd -1n",
			[]string{"1:22: the value of a capacitor must be positive (got -1n)"}},
		{"zero inductance", "inductor L1 tst x 0\nresistor Rx x gnd 1",
			[]string{"1:19: the value of an inductor must be positive (got 0)"}},
		{"wrong unit", "capacitor C1 tst gnd 1nH",
			[]string{"1:22: 1nH is in henries, but the value of a capacitor is in farads"}},
		{"unit on a plain number", "clamp D1 tst gnd vbr=6 nbr=2V",
			[]string{"1:28: 2V is in volts, but nbr of a clamp is in a plain number"}},
		{"mega", "resistor R1 tst gnd 1MEG",
			[]string{"1:21: \"1MEG\": the prefixes are f, p, n, u (µ), m, k, M, G and T; mega is M (1M) and milli is m"}},
		{"case of prefix", "resistor R1 tst gnd 10K",
			[]string{"1:21: \"10K\": unknown prefix or unit \"K\" (did you mean k?)"}},
		{"percent outside tolerance", "resistor R1 tst gnd 5%",
			[]string{"1:21: \"5%\": percentages are only for tolerance lines"}},
		{"not a number", "resistor R1 tst gnd abc",
			[]string{"1:21: \"abc\" is not a number"}},
		{"quoted number", "clamp D1 tst gnd vbr=\"6\"",
			[]string{"1:22: vbr takes a number, not a quoted text"}},
		{"m out of range", "clamp D1 tst gnd vbr=6 m=1",
			[]string{"1:26: m of a clamp must be at least 0 and below 1 (got 1)"}},
		{"negative esr", "capacitor C1 tst gnd 1n esr=-1",
			[]string{"1:29: esr of a capacitor must not be negative (got -1)"}},
		{"zero resistor", "resistor R1 tst gnd 0",
			[]string{"1:21: the value of a resistor must be positive (got 0)"}},
		{"clamp polarity", "clamp D1 tst gnd vbr=6 polarity=bipolar",
			[]string{"1:33: clamp polarity is uni or bi, not bipolar"}},
		{"clamp polarity hint", "clamp D1 tst gnd vbr=6 polarity=bii",
			[]string{"1:33: clamp polarity is uni or bi, not bii (did you mean bi?)"}},
		{"pin window", "pin U1 tst gnd vmax=1 vmin=2",
			[]string{"1:5: pin U1: vmin 2 V is not below vmax 1 V"}},

		{"columns count runes", "resistor Rµ tst gnd 1Ω zz=1",
			[]string{"1:24: unknown parameter zz for a resistor"}},
		{"columns after a tab", "resistor\tR1 tst gnd 1k zz=1",
			[]string{"1:24: unknown parameter zz for a resistor"}},
		{"quote inside a word", "resistor R\"1 tst gnd 1k",
			[]string{"1:11: unexpected quote inside R\"1 (quote the whole text)", "1:10: element name R\"1 may hold only letters, digits, _, - and . (not '\"')"}},
		{"key with no value", "clamp D1 tst gnd vbr=",
			[]string{"1:18: vbr= has no value"}},
		{"strike keys with no value", "strike s2 tst gnd waveform= level=",
			[]string{"1:19: waveform= has no value", "1:29: level= has no value", "2:8: second strike zap; a deck has exactly one (the first is s2 at t.zap:1:8)"}},
		{"statement starting with a key", "vbr=6",
			[]string{"1:1: a statement starts with a keyword such as resistor, not vbr=6"}},
		{"include a folder", "include \".\"",
			[]string{"1:9: . is not a regular file"}},
		{"tolerance of a word", "clamp D1 tst gnd vbr=6\ntolerance D1.polarity=5%",
			[]string{"2:14: tolerance: D1.polarity is not a number to spread"}},

		// Parts.
		{"unknown part", "part tvs clamp vbr=6\nclamp D1 tst gnd part=tsv",
			[]string{"2:23: no part tsv (did you mean tvs?)"}},
		{"part of another kind", "part fb bead l=1u\nclamp D1 tst gnd part=fb",
			[]string{"2:23: part fb is a bead, not a clamp (defined at t.zap:1:6)"}},
		{"part kind", "part x clmp vbr=6",
			[]string{"1:8: unknown element kind clmp (did you mean clamp?)"}},
		{"part key", "part x clamp vbrr=6",
			[]string{"1:14: unknown parameter vbrr for a clamp (did you mean vbr?)"}},
		{"part twice", "part x clamp vbr=6\npart x clamp vbr=7",
			[]string{"2:6: part x already defined at t.zap:1:6"}},
		{"part misses required", "part x clamp rdyn=1\nclamp D1 tst gnd part=x",
			[]string{"2:7: clamp D1 needs vbr (volts); neither it nor part x gives it"}},

		// The strike.
		{"strike on gnd", "strike s2 gnd gnd waveform=hbm level=1k",
			[]string{"1:11: strike s2 is on gnd and gnd: it must hit a node of the circuit"}},
		{"level unit", "window stop=1u\n#\n" + "strike s2 tst gnd waveform=iec61000-4-2 level=8A",
			[]string{"3:47: 8A is in amperes, but the levels of waveform iec61000-4-2 are in volts", "4:8: second strike zap; a deck has exactly one (the first is s2 at t.zap:3:8)"}},
		{"level not positive", "strike s2 tst gnd waveform=tlp level=0",
			[]string{"1:38: level 0 must be positive (polarity= gives the sign)", "2:8: second strike zap; a deck has exactly one (the first is s2 at t.zap:1:8)"}},
		{"waveform key of another", "strike s2 tst gnd waveform=iec61000-4-2 level=8k r=330",
			[]string{"1:50: r is a parameter of waveform iso10605, surge-1.2-50, step, not of iec61000-4-2", "2:8: second strike zap; a deck has exactly one (the first is s2 at t.zap:1:8)"}},
		{"unknown waveform", "strike s2 tst gnd waveform=iec61000-4-3 level=8k",
			[]string{"1:28: unknown waveform iec61000-4-3 (did you mean iec61000-4-2?); the waveforms are iec61000-4-2, iec61000-4-2-network, iec61000-4-2-air, hbm, iso10605, surge-8-20, surge-1.2-50, surge-cwg, tlp, eft, pwl, step", "2:8: second strike zap; a deck has exactly one (the first is s2 at t.zap:1:8)"}},
		{"strike polarity", "strike s2 tst gnd waveform=hbm level=1k polarity=both2",
			[]string{"1:50: strike polarity is pos, neg or both, not both2 (did you mean both?)", "2:8: second strike zap; a deck has exactly one (the first is s2 at t.zap:1:8)"}},
		{"strike needs waveform and level", "strike s2 tst gnd",
			[]string{"1:8: strike s2 needs level= (a list such as level=2k,4k,8k)", "1:8: strike s2 needs waveform= (one of iec61000-4-2, iec61000-4-2-network, iec61000-4-2-air, hbm, iso10605, surge-8-20, surge-1.2-50, surge-cwg, tlp, eft, pwl, step)", "2:8: second strike zap; a deck has exactly one (the first is s2 at t.zap:1:8)"}},
		{"pwl needs file", "strike s2 tst gnd waveform=pwl level=1",
			[]string{"1:8: strike s2: waveform pwl needs file=\"path\" (a CSV of time and value)", "2:8: second strike zap; a deck has exactly one (the first is s2 at t.zap:1:8)"}},
		{"pwl file missing", "strike s2 tst gnd waveform=pwl level=1 file=\"nowhere.csv\"",
			[]string{"1:45: waveform file nowhere.csv: no such file", "2:8: second strike zap; a deck has exactly one (the first is s2 at t.zap:1:8)"}},
		{"eft count", "strike s2 tst gnd waveform=eft level=1k count=1.5",
			[]string{"1:47: count of waveform eft must be a whole number from 1 to 1000000 (got 1.5)", "2:8: second strike zap; a deck has exactly one (the first is s2 at t.zap:1:8)"}},

		// Electrical checks.
		{"one connection", "resistor R1 tst dangling 1k",
			[]string{"1:17: node dangling has only one connection (R1); connect it to something else or remove it"}},
		{"rail not driven", "pin U1 tst gnd rail=vcc",
			[]string{"1:21: node vcc has only one connection (U1); connect it to something else or remove it"}},
		{"rail on the pin", "pin U1 tst gnd rail=tst",
			[]string{"1:21: pin U1: rail tst is the pin's own node"}},
		{"self loop", "resistor R1 tst tst 1k",
			[]string{"1:17: resistor R1 connects node tst to itself"}},
		{"duplicate element", "resistor R1 tst gnd 1k\nresistor R1 tst gnd 2k",
			[]string{"2:10: element R1 already defined at t.zap:1:10"}},
		{"supply and inductor loop", "supply V1 a gnd 5\ninductor L1 a gnd 1u",
			[]string{"2:10: loop of supplies and inductors with no resistance: V1 → L1; at DC it is a short circuit (give one of them a series resistance, r= or rdc=)"}},
		{"loop through a bead", "supply V1 a gnd 5\ninductor L1 a b 1u\nbead B1 b gnd l=1u",
			[]string{"3:6: loop of supplies and inductors with no resistance: V1 → L1 → B1; at DC it is a short circuit (give one of them a series resistance, r= or rdc=)"}},
		{"two supplies in parallel", "supply V1 a gnd 5\nsupply V2 a gnd 5",
			[]string{"2:8: loop of supplies and inductors with no resistance: V1 → V2; at DC it is a short circuit (give one of them a series resistance, r= or rdc=)"}},

		// Study statements.
		{"watch unknown node", "watch tsst",
			[]string{"1:7: watch: no node tsst in the deck (did you mean tst?)"}},
		{"watch gnd", "watch gnd",
			[]string{"1:7: gnd is the reference: it is always 0 V"}},
		{"watch key", "watch tst mx=5",
			[]string{"1:11: unknown parameter mx for a watch (did you mean max?)"}},
		{"watch limits", "watch tst max=1 min=2",
			[]string{"1:7: watch tst: min 2 V is not below max 1 V"}},
		{"watch twice", "watch tst\nwatch tst",
			[]string{"2:7: node tst is already watched at t.zap:1:7"}},
		{"vary unknown element", "vary R9.value=1,2",
			[]string{"1:6: vary: no element R9 (did you mean Rt?)"}},
		{"vary unknown param", "vary Rt.valu=1,2",
			[]string{"1:9: vary: a resistor has no parameter valu (did you mean value?)"}},
		{"vary bad value", "vary Rt.value=1,2H",
			[]string{"1:17: vary Rt.value: 2H is in henries, but the value of a resistor is in ohms"}},
		{"vary level", "vary zap.level=1k,2k",
			[]string{"1:10: vary: levels and polarities are already axes of the study; list them on the strike"}},
		{"vary part kind", "part x clamp vbr=6\nvary Rt.part=x",
			[]string{"2:14: vary Rt.part: part x is a clamp, not a resistor (defined at t.zap:1:6)"}},
		{"vary twice", "vary Rt.value=1,2\nvary Rt.value=3",
			[]string{"2:6: Rt.value is already varied at t.zap:1:6"}},
		{"vary two on a line", "vary Rt.value=1,2 zap.l=1n",
			[]string{"1:19: one ELEMENT.PARAM a vary line; put zap.l on a line of its own"}},
		{"tolerance not percent", "tolerance Rt.value=5",
			[]string{"1:20: a tolerance is a percentage such as 5%, not 5"}},
		{"tolerance range", "tolerance Rt.value=150%",
			[]string{"1:20: a tolerance must be above 0% and below 100% (got 150%)"}},
		{"tolerance dist", "tolerance Rt.value=5% dist=gauss",
			[]string{"1:28: dist is uniform or normal, not gauss"}},
		{"tolerance absent param", "clamp D1 tst gnd vbr=6\ntolerance D1.ipp=5%",
			[]string{"2:14: tolerance: D1 has no ipp to spread (give it a value first)"}},
		{"tolerance unknown", "tolerance Rx.value=5% Rt.vlue=5%",
			[]string{"1:11: tolerance: no element Rx (did you mean Rt?)", "1:26: tolerance: a resistor has no parameter vlue (did you mean value?)"}},
		{"window key", "window stp=1u",
			[]string{"1:8: unknown parameter stp for a window (did you mean stop?)"}},
		{"window values", "window stop=1n resolve=1u accuracy=2",
			[]string{"1:1: window: resolve 1 µs is longer than stop 1 ns", "1:36: accuracy 2 is outside 0.0001 % to 10 %"}},
		{"second window", "window stop=1u\nwindow stop=2u",
			[]string{"2:1: second window; the first is at t.zap:1:1"}},
		{"include missing", "include \"nowhere.zap\"",
			[]string{"1:9: cannot read nowhere.zap: no such file or directory"}},
		{"include unquoted", "include nowhere.zap",
			[]string{"1:1: include takes one quoted path: include \"parts/tvs.zap\""}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			errs, _ := problemsOf(t, tt.src)
			if len(errs) == 0 {
				errs = []string{}
			}
			if !reflect.DeepEqual(errs, sortedLike(tt.want)) {
				t.Errorf("deck:\n%s\ngot:\n  %s\nwant:\n  %s", tt.src, strings.Join(errs, "\n  "), strings.Join(sortedLike(tt.want), "\n  "))
			}
		})
	}
}

// sortedLike orders expected messages as ErrorList.Sort does.
func sortedLike(want []string) []string {
	var l ErrorList
	for _, w := range want {
		var line, col int
		var msg string
		k := strings.Index(w, ": ")
		if _, err := fmt.Sscanf(w[:k], "%d:%d", &line, &col); err != nil {
			panic(w)
		}
		msg = w[k+2:]
		l = append(l, &Error{Pos: Pos{File: "t.zap", Line: line, Col: col}, Msg: msg})
	}
	l.Sort()
	out := []string{}
	for _, e := range l {
		out = append(out, strings.TrimPrefix(e.Pos.String(), "t.zap:")+": "+e.Msg)
	}
	return out
}

func TestWarnings(t *testing.T) {
	tests := []struct {
		name string
		src  string
		want []string
	}{
		{"floating node", "capacitor C1 tst x 1n\ncapacitor C2 x gnd 1n",
			[]string{"1:18: node x has no DC path to gnd (only capacitors or the strike reach it); the solver ties it to gnd through a tiny conductance"}},
		{"line ports reach gnd", "capacitor C1 tst x 1n\nline T1 x y z0=50 delay=1n\ncapacitor C2 y gnd 1n", nil},
		{"pin reaches gnd", "capacitor C1 tst x 1n\npin U1 x gnd", nil},
		{"huge capacitor", "capacitor C1 tst gnd 0.22F",
			[]string{"1:22: capacitor C1 is 220 mF: unusually large for a capacitor on a protected line"}},
		{"high vbr", "clamp D1 tst gnd vbr=5kV",
			[]string{"1:22: clamp D1 breaks down at 5 kV: unusually high for a clamp"}},
		{"big inductor", "inductor L1 tst x 2m\nresistor R2 x gnd 1",
			[]string{"1:19: inductor L1 is 2 mH: unusually large for a protection path (nanohenries are usual)"}},
		{"rdyn", "clamp D1 tst gnd vbr=6 rdyn=200",
			[]string{"1:29: clamp D1 has rdyn 200 Ω: a clamp's dynamic resistance is usually below 1 Ω"}},
		{"pin rdyn without vbr", "pin U1 tst gnd rdyn=1",
			[]string{"1:21: pin U1: rdyn has no effect without vbr (the internal clamp)"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			errs, warns := problemsOf(t, tt.src)
			if tt.want == nil {
				tt.want = []string{}
			}
			if warns == nil {
				warns = []string{}
			}
			if len(errs) > 0 {
				t.Fatalf("unexpected errors: %v", errs)
			}
			if !reflect.DeepEqual(warns, tt.want) {
				t.Errorf("got %q, want %q", warns, tt.want)
			}
		})
	}
}

func TestLevelWarning(t *testing.T) {
	c, err := Parse("t.zap", []byte("strike s tst gnd waveform=iec61000-4-2 level=8k,40k,8k\nresistor R tst gnd 1\n"))
	if err != nil {
		t.Fatal(err)
	}
	got := c.Warnings.Error()
	want := "t.zap:1:49: warning: level 40 kV is above 30 kV, beyond the discharge test standards\n" +
		"t.zap:1:53: warning: level 8k is listed twice"
	if got != want {
		t.Errorf("got\n%s\nwant\n%s", got, want)
	}
}

func TestNoStrike(t *testing.T) {
	_, err := Parse("t.zap", []byte("# nothing\nresistor R1 a gnd 1k\nresistor R2 a gnd 1k\n"))
	if err == nil || err.Error() != "t.zap:1:1: deck has no strike: add one, for example strike zap IN gnd waveform=iec61000-4-2 level=8k" {
		t.Errorf("got %v", err)
	}
}

func TestContinuation(t *testing.T) {
	src := "strike zap a gnd \\   # the strike\n  waveform=iec61000-4-2 \\\n  level=2k,4k\\\n\nresistor R a gnd 1k\n"
	c, err := Parse("t.zap", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	if s := c.Strike(); s == nil || len(s.Levels) != 2 || s.Waveform.Name != "iec61000-4-2" {
		t.Fatalf("strike %+v", s)
	}
	_, err = Parse("t.zap", []byte("strike zap a gnd waveform=hbm level=1k\nresistor R a gnd 1k \\"))
	if err == nil || !strings.Contains(err.Error(), "t.zap:2:21: the last line ends with \\ but no line follows") {
		t.Errorf("got %v", err)
	}
}

// TestElements checks that every kind takes its parameters, the part's values
// under the element's, and the defaults of MODELS.md for the rest.
func TestElements(t *testing.T) {
	src := `title "every kind \"quoted\""   # comment
part tvs clamp vbr=6.8V rdyn=0.35ohm cj=8p polarity=bi ipp=12A
part fb bead rdc=0.15ohm rac=520ohm l=1.1u c=1.3p
strike   zap   tip  gnd  waveform=iso10605 level=2kV,4k polarity=both c=330p
inductor Lpad  tip  n1   1.5n
clamp    D1    n1   gnd  part=tvs ls=0.4n rdyn=0.5
bead     FB1   n1   n2   part=fb
capacitor C1   n2   gnd  100n esr=20m esl=0.5n rating=16V
pin      U1    n2   gnd  cin=6p vmax=5.5V vmin=-0.5V ifail=1.5A rail=vcc vbr=7
supply   V1    vcc  gnd  3.3V r=1
diode    DD    n2   vcc  vbr=40
resistor R1    n2   n3   1k
line     T1    n3   n4   z0=50ohm delay=1ns
resistor R2    n4   gnd  50
`
	c, err := Parse("t.zap", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	if c.Title != `every kind "quoted"` {
		t.Errorf("title %q", c.Title)
	}
	if want := []string{"tip", "n1", "n2", "vcc", "n3", "n4"}; !reflect.DeepEqual(c.Nodes, want) {
		t.Errorf("nodes %v, want %v", c.Nodes, want)
	}
	// Defaults [pub: MODELS.md, the project's model contract].
	want := map[string]map[string]float64{
		"zap":  {"c": 330e-12, "r": 330},
		"Lpad": {"value": 1.5e-9, "r": 0},
		"D1": {"vbr": 6.8, "rdyn": 0.5, "cj": 8e-12, "ipp": 12, "ls": 0.4e-9, "it": 1e-3, "nbr": 1,
			"is": 1e-14, "n": 1, "m": 0, "vj": 0.7},
		"FB1": {"rdc": 0.15, "rac": 520, "l": 1.1e-6, "c": 1.3e-12},
		"C1":  {"value": 100e-9, "esr": 0.02, "esl": 0.5e-9, "rating": 16},
		"U1": {"cin": 6e-12, "vmax": 5.5, "vmin": -0.5, "ifail": 1.5, "vbr": 7, "is": 1e-14, "n": 1, "rs": 1,
			"it": 1e-3, "nbr": 1, "rdyn": 0},
		"V1": {"value": 3.3, "r": 1},
		"DD": {"vbr": 40, "is": 1e-14, "n": 1, "it": 1e-3, "rs": 0, "cj": 0},
		"R1": {"value": 1000},
		"T1": {"z0": 50, "delay": 1e-9},
	}
	for name, num := range want {
		e := c.Element(name)
		if e == nil {
			t.Errorf("no element %s", name)
			continue
		}
		if !reflect.DeepEqual(nums(e), num) {
			t.Errorf("%s: Num %v, want %v", name, nums(e), num)
		}
	}
	if s := words(c.Element("D1")); !reflect.DeepEqual(s, map[string]string{"polarity": "bi", "part": "tvs"}) {
		t.Errorf("D1 Str %v", s)
	}
	if s := words(c.Element("U1")); !reflect.DeepEqual(s, map[string]string{"rail": "vcc"}) {
		t.Errorf("U1 Str %v", s)
	}
	s := c.Strike()
	if !reflect.DeepEqual(s.Levels, []float64{2000, 4000}) || s.Polarity != "both" || s.Waveform.Name != "iso10605" {
		t.Errorf("strike %+v", s)
	}
	if e := c.Element("D1"); e.Pos != (Pos{File: "t.zap", Line: 6, Col: 1}) {
		t.Errorf("D1 at %v", e.Pos)
	}
	// Without a vbr the pin has no internal clamp parameters.
	c2, err := Parse("t.zap", []byte("strike s a gnd waveform=hbm level=1k\npin U a gnd\n"))
	if err != nil {
		t.Fatal(err)
	}
	if got := nums(c2.Element("U")); !reflect.DeepEqual(got, map[string]float64{"cin": 0, "is": 1e-14, "n": 1, "rs": 1}) {
		t.Errorf("pin without vbr: %v", got)
	}
	// A default clamp is unidirectional.
	c3, err := Parse("t.zap", []byte("strike s a gnd waveform=hbm level=1k\nclamp D a gnd vbr=5\n"))
	if err != nil {
		t.Fatal(err)
	}
	if got := c3.Element("D").Values.Word("polarity"); got != "uni" {
		t.Errorf("clamp polarity %q", got)
	}
}

func TestStrikeDefaults(t *testing.T) {
	tests := []struct {
		line string
		num  map[string]float64
		str  map[string]string
	}{
		{"waveform=iec61000-4-2 level=8kV", map[string]float64{}, map[string]string{"waveform": "iec61000-4-2", "polarity": "pos"}},
		{"waveform=iso10605 level=8k", map[string]float64{"c": 150e-12, "r": 330}, nil},
		{"waveform=hbm level=2k l=7.5u", map[string]float64{"l": 7.5e-6}, nil},
		{"waveform=hbm level=2k", map[string]float64{}, nil},
		{"waveform=surge-1.2-50 level=1kV polarity=neg", map[string]float64{"r": 2}, map[string]string{"waveform": "surge-1.2-50", "polarity": "neg"}},
		{"waveform=surge-8-20 level=100A", map[string]float64{}, nil},
		{"waveform=tlp level=8A,16A width=50ns", map[string]float64{"width": 50e-9, "rise": 1e-9}, nil},
		{"waveform=eft level=2kV count=75", map[string]float64{"count": 75, "rate": 5000}, nil},
		{"waveform=pwl level=0.5,1 file=\"wave.csv\"", map[string]float64{}, nil},
	}
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "wave.csv"), []byte("0,0\n1e-9,1\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, tt := range tests {
		c, err := Parse(filepath.Join(dir, "t.zap"), []byte("strike s a gnd "+tt.line+"\nresistor R a gnd 1\n"))
		if err != nil {
			t.Errorf("%s: %v", tt.line, err)
			continue
		}
		s := c.Strike()
		if !reflect.DeepEqual(nums(s), tt.num) {
			t.Errorf("%s: Num %v, want %v", tt.line, nums(s), tt.num)
		}
		if str := map[string]string{"waveform": s.Waveform.Name, "polarity": s.Polarity}; tt.str != nil && !reflect.DeepEqual(str, tt.str) {
			t.Errorf("%s: Str %v, want %v", tt.line, str, tt.str)
		}
		if strings.Contains(tt.line, "pwl") && s.Values.Word("file") != filepath.Join(dir, "wave.csv") {
			t.Errorf("pwl file %q", s.Values.Word("file"))
		}
	}
}

// Every problem carries its kind, which a caller tests with errors.Is on the
// whole list or on one problem (the encoding/csv manner).
func TestErrorKinds(t *testing.T) {
	for _, c := range []struct {
		deck string
		kind error
	}{
		{"strike s a gnd waveform=hbm level=1k\nclamp D1 a gnd vbrr=5\n", ErrUnknown},
		{"strike s a gnd waveform=hbm level=1k\ncapacitor C1 a gnd 1nH\n", ErrValue},
		{"strike s a gnd waveform=hbm level=1k\nclamp D1 a gnd\n", ErrMissing},
		{"strike s a gnd waveform=hbm level=1k\nresistor R a gnd 1\nresistor R a gnd 2\n", ErrDuplicate},
		{"strike s a gnd waveform=hbm level=1k\nresistor R a b 1\n", ErrCircuit},
		{"strike s a gnd waveform=hbm level=1k\nresistor R a gnd 1 \"x\n", ErrSyntax},
		{"include \"nowhere.zap\"\nstrike s a gnd waveform=hbm level=1k\nresistor R a gnd 1\n", ErrFile},
	} {
		_, err := Parse("t.zap", []byte(c.deck))
		if !errors.Is(err, c.kind) {
			t.Errorf("%q: %v is not %v", c.deck, err, c.kind)
		}
		var l ErrorList
		if !errors.As(err, &l) {
			t.Fatalf("%q: %T is not an ErrorList", c.deck, err)
		}
		for _, e := range l {
			if !e.Warning && (e.Err == nil || !errors.Is(e, e.Err)) {
				t.Errorf("%q: problem without a kind: %v", c.deck, e)
			}
		}
	}
	// A setting from the command line names no deck position.
	c := mustParse(t, "strike s a gnd waveform=hbm level=1k\ncapacitor C1 a gnd 1n\n")
	if _, err := c.Setting("C1.value", "1nH"); !errors.Is(err, ErrValue) || strings.Contains(err.Error(), "t.zap") {
		t.Errorf("Setting error %v", err)
	}
}

// The diode's breakdown is spelled as a clamp's, vbr at it; the retired
// spellings are refused with the new name [LANGUAGE.md, second round].
func TestRetiredNames(t *testing.T) {
	_, err := Parse("t.zap", []byte("strike s a gnd waveform=hbm level=1k\ndiode D1 a gnd bv=5 ibv=1m\n"))
	for _, want := range []string{"bv of a diode is now called vbr", "ibv of a diode is now called it"} {
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("error %v lacks %q", err, want)
		}
	}
	c := mustParse(t, "strike s a gnd waveform=hbm level=1k\ndiode D1 a gnd vbr=5 ipp=2 emax=10u\n")
	if n := nums(c.Element("D1")); n["vbr"] != 5 || n["it"] != 1e-3 || n["ipp"] != 2 {
		t.Errorf("diode %v", n)
	}
}
