package textpos

import (
	"errors"
	"fmt"
	"strings"
	"testing"
)

var errKind = errors.New("a kind")

// The printed forms follow the GNU Coding Standards, section 4.4
// "Formatting Error Messages": sourcefile:lineno:column: message, lines and
// columns counting from 1 [pub]; the parts of an unknown position are left
// out [practice].
func TestPosString(t *testing.T) {
	for _, c := range []struct {
		p    Pos
		want string
	}{
		{Pos{File: "a.zap", Line: 3, Col: 7}, "a.zap:3:7"},
		{Pos{Line: 3, Col: 7}, "3:7"},
		{Pos{File: "a.csv", Line: 3}, "a.csv:3"},
		{Pos{File: "a.csv"}, "a.csv"},
		{Pos{}, "-"},
	} {
		if got := c.p.String(); got != c.want {
			t.Errorf("%#v: %q, want %q", c.p, got, c.want)
		}
	}
	for _, c := range []struct {
		e    *Error
		want string
	}{
		{New(Pos{File: "a.zap", Line: 2, Col: 5}, errKind, "bad %s", "x"), "a.zap:2:5: bad x"},
		{New(Pos{File: "a.ibs"}, errKind, "no model"), "a.ibs: no model"},
		// A value from the command line has no position to print.
		{New(Pos{}, errKind, "--max is negative"), "--max is negative"},
		{&Error{Pos: Pos{File: "t.csv", Line: 4, Col: 1}, Msg: "falls", Warning: true}, "t.csv:4:1: warning: falls"},
	} {
		if got := c.e.Error(); got != c.want {
			t.Errorf("%q, want %q", got, c.want)
		}
	}
}

// A list keeps the first MaxProblems and counts the rest in one last
// entry, a warning only while every one left out is; the counts are
// checked against the number added [calc] and the cap is common practice
// for a reader fed a huge or binary file [practice].
func TestListCap(t *testing.T) {
	var l List
	for i := range 1000 {
		l.Add(Pos{File: "many.csv", Line: 1000 - i, Col: 1}, errKind, "row %d", i)
	}
	if len(l) != MaxProblems+1 || l.Problems() != 1000 {
		t.Fatalf("%d entries for %d problems, want %d for 1000", len(l), l.Problems(), MaxProblems+1)
	}
	l.RemoveMultiples()
	if got := l[len(l)-1].Error(); got != "... and 900 more problems (the first 100 are shown)" {
		t.Errorf("last entry %q", got)
	}
	if l[0].Pos.Line != 901 || l[MaxProblems-1].Pos.Line != 1000 {
		t.Errorf("kept lines %d to %d, want the first 100 added (901 to 1000) in order", l[0].Pos.Line, l[MaxProblems-1].Pos.Line)
	}
	if err := l.Err(); err == nil || !errors.Is(err, errKind) {
		t.Errorf("Err() = %v, not of its kind", err)
	}

	var w List
	for i := range 150 {
		w.WarnKind(Pos{File: "w.csv", Line: i + 1, Col: 1}, errKind, "doubtful")
	}
	if w.Err() != nil || w.Problems() != 0 || len(w.Warnings()) != MaxProblems+1 {
		t.Errorf("150 warnings: Err %v, %d problems, %d warnings", w.Err(), w.Problems(), len(w.Warnings()))
	}
	if got := w[len(w)-1].Error(); got != "... and 50 more warnings (the first 100 are shown)" {
		t.Errorf("last entry %q", got)
	}
	// An error past the cap takes a warning's place: the list fails, with
	// its kind, and shows it.
	w.Add(Pos{File: "w.csv", Line: 200, Col: 1}, errKind, "broken")
	if w.Err() == nil || w.Problems() != 1 || !errors.Is(w, errKind) || !strings.Contains(w.Error(), "w.csv:200:1: broken") {
		t.Errorf("an error past the cap: Err %v, %d problems", w.Err(), w.Problems())
	}
	if got := w[len(w)-1].Error(); got != "... and 51 more warnings (the first 100 are shown)" {
		t.Errorf("last entry %q", got)
	}
}

// The escape that starts a terminal command is ESC, 01/11 (0x1b) of the C0
// set, and 0x80 to 0x9f are the C1 set (ECMA-48, 5th edition) [pub]; the
// octets C0, C1 and F5 to
// FF never appear in UTF-8 (RFC 3629, section 1) [pub]; U+200B ZERO WIDTH
// SPACE and U+00A0 NO-BREAK SPACE are a format character (Cf) and a space
// separator (Zs) that print as nothing visible (Unicode Character
// Database, UnicodeData.txt) [pub].
func TestPrintable(t *testing.T) {
	for _, c := range []struct{ in, want string }{
		{"plain 4.7 µF, 20 mΩ", "plain 4.7 µF, 20 mΩ"},
		{"a\x1b[2Jb", `a\x1b[2Jb`},
		{"\xff\xc0", `\xff\xc0`},
		{"zero\u200bwidth", `zero\u200bwidth`},
		{"no\u00a0break", `no\xa0break`},
		{"bell\a cr\r", `bell\x07 cr\x0d`},
		{"tab\tand\nline", "tab\tand\nline"},
	} {
		if got := Printable(c.in); got != c.want {
			t.Errorf("Printable(%q) = %q, want %q", c.in, got, c.want)
		}
		// Escaping twice changes nothing: the escapes are plain text.
		if got := Printable(Printable(c.in)); got != c.want {
			t.Errorf("Printable twice (%q) = %q", c.in, got)
		}
	}
	var l List
	l.Add(Pos{File: "bin.csv", Line: 1, Col: 1}, errKind, "column %s", "v [\x1b]0;owned\a]")
	l.Warn(Pos{File: "bin.csv", Line: 2, Col: 1}, "odd \x9b text")
	for _, e := range l {
		for _, r := range e.Error() {
			if r < 0x20 || r == 0x7f || (r >= 0x80 && r < 0xa0) {
				t.Errorf("%q holds control character %U", e.Error(), r)
			}
		}
	}
	if want := `bin.csv:1:1: column v [\x1b]0;owned\x07]`; l[0].Error() != want {
		t.Errorf("%q, want %q", l[0].Error(), want)
	}
}

// Problems sort by file, line, column, then message, and an exact repeat
// (same place, same message) is shown once, as go/scanner's ErrorList does
// [practice].
func TestSortRepeats(t *testing.T) {
	var l List
	for _, p := range []struct {
		file      string
		line, col int
		msg       string
	}{
		{"b.zap", 1, 1, "z"}, {"a.zap", 2, 3, "y"}, {"a.zap", 2, 1, "x"},
		{"a.zap", 1, 9, "w"}, {"a.zap", 2, 3, "y"}, {"a.zap", 2, 3, "b"},
	} {
		l.Add(Pos{File: p.file, Line: p.line, Col: p.col}, errKind, "%s", p.msg)
	}
	l.RemoveMultiples()
	var got []string
	for _, e := range l {
		got = append(got, e.Error())
	}
	want := "a.zap:1:9: w|a.zap:2:1: x|a.zap:2:3: b|a.zap:2:3: y|b.zap:1:1: z"
	if strings.Join(got, "|") != want {
		t.Errorf("%s\nwant %s", strings.Join(got, "|"), want)
	}
	if got := fmt.Sprint(List(nil).Err()); got != "<nil>" {
		t.Errorf("empty list: %s", got)
	}
}

// Problems found after a full list of warnings take the warnings' places:
// a file refused for one problem among a thousand warnings shows it
// [practice].
func TestProblemsOutrankWarnings(t *testing.T) {
	var l List
	for i := 0; i < 1000; i++ {
		l.Warn(Pos{File: "f", Line: i + 1, Col: 1}, "doubtful %d", i)
	}
	l.Add(Pos{File: "f", Line: 1001, Col: 1}, errKind, "the problem")
	l.Sort()
	if l.Problems() != 1 || l.Err() == nil {
		t.Fatalf("%d problems", l.Problems())
	}
	if !strings.Contains(l.Error(), "f:1001:1: the problem") {
		t.Error("the problem is not shown")
	}
	if last := l[len(l)-1].Error(); last != "... and 901 more warnings (the first 100 are shown)" {
		t.Errorf("summary %q", last)
	}
	if len(l) != MaxProblems+1 {
		t.Errorf("%d entries", len(l))
	}
}
