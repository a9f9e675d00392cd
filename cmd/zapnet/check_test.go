package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func runCheckMain(t *testing.T, args ...string) (stdout, stderr string, code int) {
	t.Helper()
	return zapnet(t, append([]string{"check"}, args...)...)
}

// The listing of every demo deck is a golden file: a change in what the
// parser understands shows up as a diff to review.
func TestCheckDemoDecks(t *testing.T) {
	decks, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "*.zap"))
	if len(decks) < 4 {
		t.Fatalf("demo decks: %v", decks)
	}
	for _, d := range decks {
		name := strings.TrimSuffix(filepath.Base(d), ".zap")
		t.Run(name, func(t *testing.T) {
			out, errs, code := runCheckMain(t, filepath.ToSlash(d))
			if code != exitPass || errs != "" {
				t.Fatalf("exit %d, stderr:\n%s", code, errs)
			}
			golden(t, "check-"+name+".txt", []byte(out))
		})
	}
}

// The five-mistakes deck has exactly five mistakes of five sorts, each
// reported at its own line and column in one pass, and exit status 2
// (LANGUAGE.md, OUTPUT.md).
func TestCheckFiveMistakes(t *testing.T) {
	out, errs, code := runCheckMain(t, "../../testdata/bad/five-mistakes.zap")
	if code != exitUnusable {
		t.Errorf("exit %d, want %d", code, exitUnusable)
	}
	if out != "" {
		t.Errorf("stdout not empty:\n%s", out)
	}
	lines := strings.Split(strings.TrimSpace(errs), "\n")
	var at []string
	for _, l := range lines[:len(lines)-1] {
		// file:line:col: message
		parts := strings.SplitN(strings.TrimPrefix(l, "../../testdata/bad/five-mistakes.zap:"), ":", 3)
		at = append(at, parts[0]+":"+parts[1])
	}
	// Line and column of each mistake, counted by hand in the deck.
	want := []string{"7:61", "9:40", "10:27", "11:22", "13:11"}
	if strings.Join(at, " ") != strings.Join(want, " ") {
		t.Errorf("positions %v, want %v\n%s", at, want, errs)
	}
	if last := lines[len(lines)-1]; last != "zapnet: ../../testdata/bad/five-mistakes.zap: 5 problems" {
		t.Errorf("last line %q", last)
	}
	golden(t, "check-five-mistakes.stderr", []byte(errs))
}

func TestCheckBadDecks(t *testing.T) {
	tests := []struct {
		deck string
		code int
		want []string // substrings of stderr
	}{
		{"bad/include-cycle.zap", exitUnusable, []string{
			"include-cycle-lib.zap:2:9: include cycle: ../../testdata/bad/include-cycle.zap → ../../testdata/bad/include-cycle-lib.zap → ../../testdata/bad/include-cycle.zap",
			"1 problem\n"}},
		{"bad/no-strike.zap", exitUnusable, []string{"no-strike.zap:1:1: deck has no strike"}},
		{"bad/short-loop.zap", exitUnusable, []string{
			"short-loop.zap:5:10: loop of supplies and inductors with no resistance: V1 → L1 → FB1",
			"short-loop.zap:6:18: node open has only one connection (R9)",
			"short-loop.zap:7:14: strike zap is on gnd and gnd",
			"3 problems\n"}},
		{"bad/none.zap", exitUnusable, []string{"none.zap: cannot read ../../testdata/bad/none.zap: no such file or directory"}},
		{"bad/warnings-only.zap", exitPass, nil},
	}
	for _, tt := range tests {
		_, errs, code := runCheckMain(t, "../../testdata/"+tt.deck)
		if code != tt.code {
			t.Errorf("%s: exit %d, want %d\n%s", tt.deck, code, tt.code, errs)
		}
		for _, w := range tt.want {
			if !strings.Contains(errs, w) {
				t.Errorf("%s: stderr lacks %q:\n%s", tt.deck, w, errs)
			}
		}
	}
	out, _, _ := runCheckMain(t, "../../testdata/bad/warnings-only.zap")
	golden(t, "check-warnings-only.txt", []byte(out))

	// --quiet prints the warnings on stderr and one line saying the deck
	// is usable, so that a clean deck is not met with silence.
	out, errs, code := runCheckMain(t, "--quiet", "../../testdata/bad/warnings-only.zap")
	if code != exitPass || !strings.Contains(out, "no problems") || strings.Count(out, "\n") != 1 || strings.Count(errs, "warning:") != 3 {
		t.Errorf("--quiet: exit %d, stdout %q, stderr:\n%s", code, out, errs)
	}
}

func TestCheckUsage(t *testing.T) {
	_, errs, code := runCheckMain(t)
	if code != exitUnusable || !strings.Contains(errs, "zapnet check testdata/demo.zap") || !strings.Contains(errs, "check needs one deck") {
		t.Errorf("no deck: exit %d\n%s", code, errs)
	}
	_, errs, code = runCheckMain(t, "--help")
	if code != exitPass || !strings.Contains(errs, "Example:") {
		t.Errorf("--help: exit %d\n%s", code, errs)
	}
}

// Each deck of testdata/bad that a campaign of bad input found is refused
// by check and by run alike, with the same message and exit status 2, and
// no message echoes a control character; a byte-order mark is accepted.
func TestBadDecksRefusedAlike(t *testing.T) {
	for _, c := range []struct{ deck, want string }{
		{"escape-bytes.zap", `escape-bytes.zap:3:26: character \x1b is not text`},
		{"tlp-rise-width.zap", "tlp-rise-width.zap:3:8: strike zap: tlp: rise 2 ns must be shorter than width 1 ns"},
		{"supply-too-large.zap", "supply-too-large.zap:5:17: the value of a supply must be at most 1e30 in magnitude (got 1e308)"},
		{"vary-product.zap", "vary-product.zap:8:6: the vary lines make 60 × 60 × 60 × 60 = 12960000 variants"},
	} {
		deck := filepath.Join("..", "..", "testdata", "bad", c.deck)
		_, checkErr, checkCode := runCheckMain(t, deck)
		_, runErr, runCode := runMain(t, deck)
		if checkCode != exitUnusable || runCode != exitUnusable {
			t.Errorf("%s: check exits %d, run %d, want 2 and 2", c.deck, checkCode, runCode)
		}
		for _, out := range []string{checkErr, runErr} {
			if !strings.Contains(out, c.want) {
				t.Errorf("%s: %q lacks %q", c.deck, out, c.want)
			}
			if strings.ContainsRune(out, '\x1b') {
				t.Errorf("%s: a message echoes the escape character", c.deck)
			}
		}
	}
	if _, errs, code := runCheckMain(t, filepath.Join("..", "..", "testdata", "bad", "byte-order-mark.zap")); code != exitPass {
		t.Errorf("a deck with a byte-order mark: exit %d\n%s", code, errs)
	}
}

// check warns of a study that will take long: eight runs each bounded by
// a 10 ps line's delay over 100 µs [calc: 8 × 10⁷ steps, past
// study.LongStudy].
func TestCheckWarnsOfALongStudy(t *testing.T) {
	deck := filepath.Join(t.TempDir(), "long.zap")
	src := `title "long"
strike s in gnd waveform=iec61000-4-2 level=2k,4k,6k,8k polarity=both
window stop=100u
clamp D1 in gnd vbr=15 rdyn=0.2
line T1 in out z0=50 delay=10p
capacitor Cp out gnd 100p
resistor Rl out gnd 1k
`
	if err := os.WriteFile(deck, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errs, code := runCheckMain(t, "-q", deck)
	want := "warning: the study takes 80 000 000 steps or more (T1's step bound of 10 ps over a 100 µs window; 8 runs)"
	if code != exitPass || !strings.Contains(errs, want) {
		t.Errorf("exit %d, stderr %q, want %q", code, errs, want)
	}
}
