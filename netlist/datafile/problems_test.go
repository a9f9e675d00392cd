package datafile

import (
	"errors"
	"fmt"
	"strings"
	"testing"
	"unicode/utf8"
)

// hasControl reports a character of the C0 or C1 sets other than a new
// line, or a byte that is not UTF-8: what a terminal would act on rather
// than show (ECMA-48, 5th edition: C0 is 0x00 to 0x1f, C1 0x80 to 0x9f)
// [pub].
func hasControl(s string) bool {
	for _, r := range s {
		if r != '\n' && (r < 0x20 || r == 0x7f || (r >= 0x80 && r < 0xa0) || r == utf8.RuneError) {
			return true
		}
	}
	return false
}

// A file of a thousand bad rows reports the first MaxProblems and counts
// the rest, as a deck does [calc: 1000 rows with one bad field each, and
// no good row after the header: 1001 problems].
func TestProblemsBounded(t *testing.T) {
	var b strings.Builder
	b.WriteString("v [V],i [A]\n")
	for i := range 1000 {
		fmt.Fprintf(&b, "%d,x\n", i)
	}
	_, err := ReadTLP("many.csv", []byte(b.String()))
	var l ErrorList
	if !errors.As(err, &l) {
		t.Fatalf("%v", err)
	}
	if len(l) != 101 || l.Problems() != 1001 || !errors.Is(err, ErrNumber) {
		t.Fatalf("%d entries for %d problems, want 101 for 1001", len(l), l.Problems())
	}
	if got := l[0].Error(); got != `many.csv:2:3: column "i": "x" is not a number` {
		t.Errorf("first %q", got)
	}
	if got := l[len(l)-1].Error(); got != "... and 901 more problems (the first 100 are shown)" {
		t.Errorf("last %q", got)
	}
}

// Text of a file echoed in a message comes out escaped: a binary file, or
// one written to act on a terminal (ESC starts a command, BEL ends a title
// change; ECMA-48, 5th edition) [pub], prints as Go escapes [practice].
func TestProblemsEscaped(t *testing.T) {
	for _, c := range []struct {
		name, src, want string
		read            func(string, []byte) error
	}{
		{"title.csv", "v [\x1b]0;owned\a],i\n1,2\n", `title.csv:1:1: column "v": unknown unit \x1b]0;owned\x07`, readTLP},
		{"clear.s2p", "[Version] 2.0\n# GHz S MA R 50\n[\x1b[2J]\n", `clear.s2p:3:1: unknown keyword [\x1b[2j]`, readTouchstone},
		// The CSV reader takes bytes that are not UTF-8 as U+FFFD.
		{"bytes.csv", "v [\xff\xfe],i\n1,2\n", `bytes.csv:1:1: column "v": unknown unit \ufffd\ufffd`, readTLP},
	} {
		err := c.read(c.name, []byte(c.src))
		if err == nil {
			t.Errorf("%s: accepted", c.name)
			continue
		}
		if hasControl(err.Error()) {
			t.Errorf("%s: the message holds the characters themselves: %q", c.name, err.Error())
		}
		if !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %s\nwant %s", c.name, err, c.want)
		}
	}
	// A problem returned alone is escaped too.
	src := "[IBIS Ver] 5.0\n[Pin] signal_name model_name\n1 IN \x1b[5mblink\n"
	ib, err := ReadIBIS("pin.ibs", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	_, err = ib.PinModel("1", Typ)
	if err == nil || hasControl(err.Error()) || !strings.Contains(err.Error(), `uses model \x1b[5mblink`) {
		t.Errorf("%q", err)
	}
	// A binary file read as a TLP curve: whatever it holds, the report is
	// printable and bounded.
	bin := make([]byte, 8192)
	x := uint32(2463534242)
	for i := range bin {
		x ^= x << 13 // xorshift32 (Marsaglia 2003): bytes of every value
		x ^= x >> 17
		x ^= x << 5
		bin[i] = byte(x)
	}
	_, err = ReadTLP("image.csv", append([]byte("v,i\n"), bin...))
	var l ErrorList
	if !errors.As(err, &l) || len(l) > 101 || hasControl(err.Error()) {
		t.Errorf("binary file: %d entries, control characters %v", len(l), hasControl(err.Error()))
	}
}

func readTLP(name string, src []byte) error {
	_, err := ReadTLP(name, src)
	return err
}

func readTouchstone(name string, src []byte) error {
	_, err := ReadTouchstone(name, src)
	return err
}

// Numbers in data files follow the deck's rules and messages
// (spec.ParseNumber): the same hints, the same bounds [pub: LANGUAGE.md,
// the deck's numbers]. IBIS scales by one ASCII prefix letter and ignores
// what follows, so 2.6pF is 2.6e-12 [pub: the IBIS specification's scaling
// factors T G M k m u n p f].
func TestDataNumbers(t *testing.T) {
	for _, c := range []struct{ src, want string }{
		{"vbr 6.8V @ 1MEG", `"1MEG": the prefixes are f, p, n, u (µ), m, k, M, G and T; mega is M (1M) and milli is m`},
		{"vbr 6.8V @ 1mAmp", `"1mAmp": unknown prefix or unit "mAmp"`},
		{"vbr 6.8V @ 1KA", `"1KA": unknown prefix or unit "KA" (did you mean kA?)`},
		{"ron 2Ohm", `"2Ohm": unknown prefix or unit "Ohm" (did you mean ohm?)`},
		{"ls 1e999H", `"1e999H": exponent out of range`},
		{"c 5% @ 0V", `"5%": percentages are only for tolerance lines`},
	} {
		_, err := ReadDatasheet("p", []byte(c.src))
		if err == nil || !strings.Contains(err.Error(), c.want) || !errors.Is(err, ErrNumber) {
			t.Errorf("%q: %v\nwant %s", c.src, err, c.want)
		}
	}
	_, err := ReadImpedance("o.csv", []byte("f [MHz],z [mho]\n1,50\n"))
	if want := `o.csv:1:9: column "z": unknown unit mho`; err == nil || !strings.Contains(err.Error(), want) {
		t.Errorf("%v\nwant %s", err, want)
	}
	for _, c := range []struct {
		s    string
		want float64
		msg  string
	}{
		{s: "2.6pF", want: 2.6e-12}, {s: "3f", want: 3e-15}, {s: "1.5e3k", want: 1.5e6},
		{s: "5V", want: 5}, {s: "7µ", want: 7}, {s: "1e-3m", want: 1e-6},
		{s: "1e308k", msg: `"1e308k" is too large`},
		{s: "1e999", msg: `"1e999": exponent out of range`},
	} {
		v, msg := ibisNumber(c.s)
		if v != c.want || msg != c.msg {
			t.Errorf("ibisNumber(%q) = %v, %q; want %v, %q", c.s, v, msg, c.want, c.msg)
		}
	}
}
