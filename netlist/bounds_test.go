package netlist

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
)

const boundsDeck = `title "bounds"
strike zap a gnd waveform=iec61000-4-2 level=2k
resistor R1 a gnd 1k
`

// A byte-order mark some editors write first in a UTF-8 file is not text
// [pub: Unicode 15, 23.8 "Specials": U+FEFF at the start of a stream is a
// signature]: the deck reads as without it, positions included.
func TestByteOrderMark(t *testing.T) {
	c, err := Parse("bom.zap", []byte("\uFEFF"+boundsDeck))
	if err != nil {
		t.Fatal(err)
	}
	if c.Title != "bounds" {
		t.Errorf("title %q", c.Title)
	}
	_, err = Parse("bom.zap", []byte("\uFEFF"+boundsDeck+"bogus\n"))
	if err == nil || !strings.Contains(err.Error(), "bom.zap:4:1: unknown statement bogus") {
		t.Errorf("a mistake after the mark: %v", err)
	}
}

// A control or invisible character is refused where it stands, and every
// message shows it as an escape, never as the byte that would act on a
// terminal [pub: ECMA-48, 5.3: ESC starts a control sequence].
func TestHiddenCharacters(t *testing.T) {
	for _, c := range []struct{ src, want string }{
		{"watch a label=\"a\x1b[31mred\"\n", `4:17: character \x1b is not text`},
		{"resistor R2\u200b a gnd 1\n", `4:12: character \u200b is not text`},
		{"resistor R2 a gnd 1\rresistor R3 a gnd 1\n", `4:20: character \x0d is not text`},
		{"foo\x07 bar\n", `unknown statement foo\x07`},
	} {
		_, err := Parse("hidden.zap", []byte(boundsDeck+c.src))
		if err == nil {
			t.Errorf("%q accepted", c.src)
			continue
		}
		msg := err.Error()
		if !strings.Contains(msg, c.want) {
			t.Errorf("%q: %s\nwant %s", c.src, msg, c.want)
		}
		if strings.ContainsAny(msg, "\x1b\x07\r\u200b") {
			t.Errorf("%q: the message holds the character itself: %q", c.src, msg)
		}
	}
	if got := Printable("a\x1bb\xffc\u00a0d\te\nf"); got != `a\x1bb\xffc\xa0d`+"\te\nf" {
		t.Errorf("Printable: %q", got)
	}
}

// A deck of a thousand mistakes reports the first MaxProblems and counts
// the rest; a statement of a million words is read to its limit only, in
// bounded memory [practice].
func TestProblemsBounded(t *testing.T) {
	var b strings.Builder
	b.WriteString(boundsDeck)
	for i := 0; i < 1000; i++ {
		b.WriteString("bogus\n")
	}
	_, err := Parse("many.zap", []byte(b.String()))
	var l ErrorList
	if !errors.As(err, &l) {
		t.Fatalf("%v", err)
	}
	if len(l) != MaxProblems+1 || l.Problems() != 1000 {
		t.Errorf("%d entries for %d problems, want %d for 1000", len(l), l.Problems(), MaxProblems+1)
	}
	last := l[len(l)-1].Error()
	if last != "... and 900 more problems (the first 100 are shown)" {
		t.Errorf("last line %q", last)
	}
	if !errors.Is(err, ErrUnknown) {
		t.Error("the list does not carry its kind")
	}

	line := "resistor R2 a gnd 1" + strings.Repeat(" value=1", 1_000_000) + "\n"
	_, err = Parse("long.zap", []byte(boundsDeck+line))
	if err == nil || !strings.Contains(err.Error(), "a statement holds at most 1000 words") {
		t.Fatalf("a million words: %v", err)
	}
	if !errors.As(err, &l) || len(l) > MaxProblems+1 {
		t.Errorf("%d entries", len(l))
	}
}

// Vary lines whose product passes MaxVariants are refused at the first,
// naming the product, before any variant is built [calc: 60⁴ = 12 960 000].
func TestVaryProductBounded(t *testing.T) {
	src := boundsDeck + "resistor R2 a gnd 1k\nresistor R3 a gnd 1k\nresistor R4 a gnd 1k\n"
	for _, r := range []string{"R1", "R2", "R3", "R4"} {
		src += "vary " + r + ".value=" + strings.Join(uniq(60), ",") + "\n"
	}
	_, err := Parse("vary.zap", []byte(src))
	if err == nil || !strings.Contains(err.Error(), "vary.zap:7:6: the vary lines make 60 × 60 × 60 × 60 = 12960000 variants; a study runs at most 10000") {
		t.Errorf("%v", err)
	}
}

// uniq is n distinct resistances.
func uniq(n int) []string {
	s := make([]string, n)
	for i := range s {
		s[i] = fmt.Sprintf("%dk", i+1)
	}
	return s
}

// The window takes accuracy= as a fraction or a percentage and resolve= as
// a time; the older keys still read, each with a warning naming its new
// name [practice: one release of grace for a renamed key].
func TestWindowKeys(t *testing.T) {
	c, err := Parse("w.zap", []byte(boundsDeck+"window stop=2u accuracy=0.05% resolve=10p\n"))
	if err != nil {
		t.Fatal(err)
	}
	if w := c.Window; w.Stop != 2e-6 || math.Abs(w.Accuracy-5e-4) > 1e-18 || w.Resolve != 10e-12 {
		t.Errorf("window %+v", w)
	}
	c, err = Parse("w.zap", []byte(boundsDeck+"window maxstep=10p reltol=1e-3 abstol=1u\n"))
	if err != nil {
		t.Fatal(err)
	}
	if w := c.Window; w.Resolve != 10e-12 || w.Accuracy != 1e-3 {
		t.Errorf("old keys read as %+v", w)
	}
	var said []string
	for _, w := range c.Warnings {
		said = append(said, w.Error())
	}
	for _, want := range []string{"w.zap:4:8: warning: maxstep is now called resolve", "w.zap:4:20: warning: reltol is now accuracy", "w.zap:4:32: warning: abstol is no longer needed"} {
		if !strings.Contains(strings.Join(said, "\n"), want) {
			t.Errorf("warnings %q lack %q", said, want)
		}
	}
	for _, bad := range []string{"accuracy=20%", "accuracy=1e-9", "accuracy=1mV", "resolve=1V"} {
		if _, err := Parse("w.zap", []byte(boundsDeck+"window "+bad+"\n")); err == nil {
			t.Errorf("window %s accepted", bad)
		}
	}
}
