package datafile

import (
	"fmt"
	"strings"

	"zapnet/devices/spec"
)

// field is one word of a line with the rune column where it starts.
type field struct {
	text string
	col  int
}

// line is one line of a file, split into its number and text, the comment
// already removed.
type line struct {
	no   int
	text string
}

// lines splits src into lines, dropping the text from the first comment
// rune on (comment == 0: no comments) and a trailing carriage return.
func lines(src []byte, comment rune) []line {
	var out []line
	for i, s := range strings.Split(string(src), "\n") {
		s = strings.TrimSuffix(s, "\r")
		if comment != 0 {
			if k := strings.IndexRune(s, comment); k >= 0 {
				s = s[:k]
			}
		}
		out = append(out, line{no: i + 1, text: s})
	}
	return out
}

// words splits a line at white space.
func words(s string) []field {
	var out []field
	col, start, startCol := 1, -1, 0
	for i, r := range s {
		space := r == ' ' || r == '\t'
		switch {
		case space && start >= 0:
			out = append(out, field{s[start:i], startCol})
			start = -1
		case !space && start < 0:
			start, startCol = i, col
		}
		col++
	}
	if start >= 0 {
		out = append(out, field{s[start:], startCol})
	}
	return out
}

// words splits a field at white space, each word at its column in the
// field's line.
func (f field) words() []field {
	ws := words(f.text)
	for k := range ws {
		ws[k].col += f.col - 1
	}
	return ws
}

// keyword reads a "[Key Word] rest" line, as IBIS and Touchstone 2 write
// their keywords: the keyword in lower case with its inner white space
// one space each ("" when the bracket is not closed), and the text after
// the bracket with its column.
func keyword(s string) (string, field) {
	i := strings.IndexByte(s, '[')
	j := strings.IndexByte(s, ']')
	if i < 0 || j < i {
		return "", field{}
	}
	kw := strings.ToLower(strings.Join(strings.Fields(s[i+1:j]), " "))
	return kw, field{s[j+1:], len([]rune(s[:j+1])) + 1}
}

// splitSep splits a line at sep (a comma, semicolon or tab), trimming the
// white space around each field; a field in double quotes may hold sep.
func splitSep(s string, sep rune) []field {
	var out []field
	col := 1
	cur := strings.Builder{}
	curCol, inQuote, started := 1, false, false
	flush := func() {
		out = append(out, field{strings.TrimSpace(cur.String()), curCol})
		cur.Reset()
		started = false
	}
	for _, r := range s {
		switch {
		case r == '"':
			inQuote = !inQuote
		case r == sep && !inQuote:
			flush()
			curCol = col + 1
		default:
			if !started && (r == ' ' || r == '\t') {
				curCol = col + 1
			} else {
				started = true
				cur.WriteRune(r)
			}
		}
		col++
	}
	flush()
	return out
}

// quantity reads a number with an optional SI prefix and unit, such as
// 6.8V, 1mA, 12p, 0.4nH or 25ohm, by the deck's rules (spec.ParseNumber).
// want is the unit the quantity must have when it carries one ("" for a
// plain number). It returns a message fit for a user when the text is not
// such a quantity.
func quantity(s, want string) (float64, string) {
	n, msg := spec.ParseNumber(s, false)
	switch {
	case msg != "":
		return 0, msg
	case n.Unit != "" && want == "":
		return 0, fmt.Sprintf("%q: a plain number takes no unit", s)
	case n.Unit != "" && n.Unit != spec.Unit(want):
		return 0, fmt.Sprintf("%q: %s", s, wantsUnit(want, n.Unit))
	}
	return n.Value, ""
}

// wantsUnit says that a value in unit got should be in want.
func wantsUnit(want string, got spec.Unit) string {
	return fmt.Sprintf("wants %s (%s), not %s", spec.Unit(want).Word(), want, got.Word())
}
