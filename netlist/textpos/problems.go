package textpos

import (
	"fmt"
	"sort"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Error is one problem found in a file. Pos is unset for a problem of a
// value that came from no file (a command-line setting).
type Error struct {
	Pos     Pos
	Msg     string
	Warning bool  // legal but doubtful: reported, never fatal
	Err     error // the kind of problem, a sentinel of its reader; nil for a warning of no kind
	// More and MoreWarnings count the problems and the warnings left out
	// after the first MaxProblems of a list; an Error with either set
	// stands for them (Summary) and has no Msg. It is a warning only when
	// every one left out is.
	More, MoreWarnings int
}

// Summary says whether e stands for the problems a list left out.
func (e *Error) Summary() bool { return e.More > 0 || e.MoreWarnings > 0 }

// MaxProblems is how many problems a list keeps: past it a file of a
// million repeated mistakes (or a binary file read as text) is reported in
// a page, and in bounded memory, with the count of the rest.
const MaxProblems = 100

// New returns a problem of kind at pos, its message made safe to print
// (Printable): a message quotes the file, and the file may hold anything.
func New(pos Pos, kind error, format string, args ...any) *Error {
	return &Error{Pos: pos, Msg: Printable(fmt.Sprintf(format, args...)), Err: kind}
}

func (e *Error) Error() string {
	if e.Summary() {
		var parts []string
		if e.More > 0 {
			parts = append(parts, fmt.Sprintf("%d more problems", e.More))
		}
		if e.MoreWarnings > 0 {
			parts = append(parts, fmt.Sprintf("%d more warnings", e.MoreWarnings))
		}
		return fmt.Sprintf("... and %s (the first %d are shown)", strings.Join(parts, " and "), MaxProblems)
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

// List collects the problems of a file so that all of them are reported in
// one pass.
type List []*Error

// Add appends a problem of kind at pos.
func (l *List) Add(pos Pos, kind error, format string, args ...any) {
	l.push(New(pos, kind, format, args...))
}

// Warn appends a warning at pos.
func (l *List) Warn(pos Pos, format string, args ...any) {
	l.WarnKind(pos, nil, format, args...)
}

// WarnKind appends a warning of kind at pos, for a reader whose callers
// tell its warnings apart with errors.Is.
func (l *List) WarnKind(pos Pos, kind error, format string, args ...any) {
	e := New(pos, kind, format, args...)
	e.Warning = true
	l.push(e)
}

// push appends e while the list holds fewer than MaxProblems, and then
// counts it in the entry that stands for those left out. A problem takes
// the place of a warning kept before it, so that a file of many warnings
// still shows why it was refused.
func (l *List) push(e *Error) {
	var more *Error
	for i := len(*l) - 1; i >= 0; i-- {
		if (*l)[i].Summary() {
			more = (*l)[i]
			break
		}
	}
	if more == nil {
		if len(*l) < MaxProblems {
			*l = append(*l, e)
			return
		}
		more = &Error{Warning: true}
		*l = append(*l, more)
	}
	if !e.Warning {
		for i := len(*l) - 1; i >= 0; i-- {
			if w := (*l)[i]; w != more && w.Warning {
				(*l)[i] = e
				e = w
				break
			}
		}
	}
	if e.Warning {
		more.MoreWarnings++
		return
	}
	more.More++
	if more.Warning {
		more.Warning, more.Err = false, e.Err
	}
}

// Problems counts the problems of the list that are not warnings, those
// left out included.
func (l List) Problems() int {
	n := 0
	for _, e := range l {
		switch {
		case e.Summary():
			n += e.More
		case !e.Warning:
			n++
		}
	}
	return n
}

// Warnings returns the warnings of the list.
func (l List) Warnings() List {
	var w List
	for _, e := range l {
		if e.Warning {
			w = append(w, e)
		}
	}
	return w
}

// Printable returns s with every character a terminal would not show as
// itself (control characters such as the escape that starts a terminal
// command, bytes that are not UTF-8, invisible formatting characters)
// written as a Go escape: \x1b, \xff, \u200b. New lines and tabs stay.
func Printable(s string) string {
	clean := true
	for _, r := range s {
		if !Shown(r) {
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
		case Shown(r):
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

// Shown says whether a terminal shows r as itself.
func Shown(r rune) bool {
	return r == '\n' || r == '\t' || r == ' ' || r != utf8.RuneError && unicode.IsPrint(r)
}

func (l List) Len() int      { return len(l) }
func (l List) Swap(i, j int) { l[i], l[j] = l[j], l[i] }
func (l List) Less(i, j int) bool {
	// What was left out comes after what is shown.
	if l[i].Summary() != l[j].Summary() {
		return l[j].Summary()
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

// Sort orders the list by position, then message; problems alike in both
// keep the order in which they were found.
func (l List) Sort() { sort.Stable(l) }

// RemoveMultiples sorts the list and drops exact repeats.
func (l *List) RemoveMultiples() {
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
func (l List) Error() string {
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
func (l List) Unwrap() []error {
	out := make([]error, len(l))
	for i, e := range l {
		out[i] = e
	}
	return out
}

// Err returns nil when the list holds no errors (warnings alone do not
// count), and the list otherwise.
func (l List) Err() error {
	for _, e := range l {
		if !e.Warning {
			return l
		}
	}
	return nil
}
