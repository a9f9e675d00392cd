package netlist

import (
	"errors"
	"fmt"
	"sort"
	"strings"
	"unicode"
	"unicode/utf8"
)

// The kinds of deck problems. Every *Error of a deck (but a warning) wraps
// one, so that a caller can tell them apart with errors.Is, on one Error
// or on a whole ErrorList.
var (
	// ErrSyntax: the text is not the deck language (a stray token, a
	// space around =, an unclosed quote, a malformed name or list).
	ErrSyntax = errors.New("not the deck language")
	// ErrUnknown: a name that does not exist (a statement, kind,
	// parameter, element, node, part, waveform or file).
	ErrUnknown = errors.New("unknown name")
	// ErrValue: a value the parameter does not take (its unit, its range,
	// its words), or values that contradict each other.
	ErrValue = errors.New("value not taken")
	// ErrMissing: something required is absent (a parameter, a node, the
	// strike, its levels).
	ErrMissing = errors.New("missing")
	// ErrDuplicate: a name, key or statement given twice.
	ErrDuplicate = errors.New("given twice")
	// ErrCircuit: the circuit has no solution as drawn (a node with one
	// connection, a loop of ideal voltage branches, an element on itself).
	ErrCircuit = errors.New("unsolvable circuit")
	// ErrFile: a deck or an included file that cannot be read (not
	// there, too large, a cycle of includes, too deep).
	ErrFile = errors.New("unreadable file")
)

// Error is one problem found in a deck. Pos is unset for a problem of a
// value that did not come from the deck (a command-line setting).
type Error struct {
	Pos     Pos
	Msg     string
	Warning bool  // legal but doubtful: reported, never fatal
	Err     error // the kind of problem (ErrSyntax, ...); nil for a warning
	// More counts the problems left out after the first MaxProblems of a
	// list; an Error with More > 0 stands for them and has no Msg. It is
	// a warning only when every one left out is.
	More int
}

// MaxProblems is how many problems a list keeps: past it a deck of a
// million repeated mistakes is reported in a page, and in bounded memory,
// with the count of the rest.
const MaxProblems = 100

func (e *Error) Error() string {
	if e.More > 0 {
		what := "problems"
		if e.Warning {
			what = "warnings"
		}
		return fmt.Sprintf("... and %d more %s (the first %d are shown)", e.More, what, MaxProblems)
	}
	at := ""
	if e.Pos.IsValid() || e.Pos.File != "" {
		at = e.Pos.String() + ": "
	}
	if e.Warning {
		return at + "warning: " + e.Msg
	}
	return at + e.Msg
}

// Unwrap gives errors.Is the kind of problem.
func (e *Error) Unwrap() error { return e.Err }

// ErrorList collects the problems of a deck so that all of them are reported
// in one pass.
type ErrorList []*Error

// Add appends a problem of kind (ErrSyntax, ...) at pos.
func (l *ErrorList) Add(pos Pos, kind error, format string, args ...any) {
	if !l.full(kind) {
		*l = append(*l, &Error{Pos: pos, Msg: Printable(fmt.Sprintf(format, args...)), Err: kind})
	}
}

// Warn appends a warning at pos.
func (l *ErrorList) Warn(pos Pos, format string, args ...any) {
	if !l.full(nil) {
		*l = append(*l, &Error{Pos: pos, Msg: Printable(fmt.Sprintf(format, args...)), Warning: true})
	}
}

// full reports whether the list holds MaxProblems already, and then
// counts the problem of kind (nil: a warning) among those left out.
func (l *ErrorList) full(kind error) bool {
	var more *Error
	for _, e := range *l {
		if e.More > 0 {
			more = e
		}
	}
	if more == nil {
		if len(*l) < MaxProblems {
			return false
		}
		more = &Error{Warning: true}
		*l = append(*l, more)
	}
	more.More++
	if kind != nil && more.Warning {
		more.Warning, more.Err = false, kind
	}
	return true
}

// Problems counts the problems of the list that are not warnings, those
// left out included.
func (l ErrorList) Problems() int {
	n := 0
	for _, e := range l {
		switch {
		case e.More > 0 && !e.Warning:
			n += e.More
		case e.More == 0 && !e.Warning:
			n++
		}
	}
	return n
}

// Printable returns s with every character a terminal would not show as
// itself (control characters such as the escape that starts a terminal
// command, bytes that are not UTF-8, invisible formatting characters)
// written as a Go escape: \x1b, \xff, \u200b. New lines and tabs stay.
func Printable(s string) string {
	clean := true
	for _, r := range s {
		if !shown(r) {
			clean = false
			break
		}
	}
	if clean {
		return s
	}
	var b strings.Builder
	for i := 0; i < len(s); {
		r, w := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && w == 1:
			fmt.Fprintf(&b, `\x%02x`, s[i])
		case shown(r):
			b.WriteRune(r)
		case r < 0x100:
			fmt.Fprintf(&b, `\x%02x`, r)
		default:
			fmt.Fprintf(&b, `\u%04x`, r)
		}
		i += w
	}
	return b.String()
}

// shown says whether a terminal shows r as itself.
func shown(r rune) bool {
	return r == '\n' || r == '\t' || r == ' ' || r != utf8.RuneError && unicode.IsPrint(r)
}

func (l ErrorList) Len() int      { return len(l) }
func (l ErrorList) Swap(i, j int) { l[i], l[j] = l[j], l[i] }
func (l ErrorList) Less(i, j int) bool {
	// What was left out comes after what is shown.
	if (l[i].More > 0) != (l[j].More > 0) {
		return l[j].More > 0
	}
	a, b := l[i].Pos, l[j].Pos
	if a.File != b.File {
		return a.File < b.File
	}
	if a.Line != b.Line {
		return a.Line < b.Line
	}
	if a.Col != b.Col {
		return a.Col < b.Col
	}
	return l[i].Msg < l[j].Msg
}

// Sort orders the list by position, then message.
func (l ErrorList) Sort() { sort.Sort(l) }

// RemoveMultiples sorts the list and drops exact repeats.
func (l *ErrorList) RemoveMultiples() {
	l.Sort()
	out := (*l)[:0]
	for i, e := range *l {
		if i > 0 && e.Pos == (*l)[i-1].Pos && e.Msg == (*l)[i-1].Msg {
			continue
		}
		out = append(out, e)
	}
	*l = out
}

// Error renders every problem, one a line.
func (l ErrorList) Error() string {
	var b strings.Builder
	for i, e := range l {
		if i > 0 {
			b.WriteByte('\n')
		}
		b.WriteString(e.Error())
	}
	return b.String()
}

// Unwrap gives errors.Is and errors.As every problem of the list.
func (l ErrorList) Unwrap() []error {
	out := make([]error, len(l))
	for i, e := range l {
		out[i] = e
	}
	return out
}

// Err returns nil when the list holds no errors (warnings alone do not
// count), and the list otherwise.
func (l ErrorList) Err() error {
	for _, e := range l {
		if !e.Warning {
			return l
		}
	}
	return nil
}
