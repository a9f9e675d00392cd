package netlist

import (
	"errors"
	"fmt"
	"sort"
	"strings"
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
}

func (e *Error) Error() string {
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
	*l = append(*l, &Error{Pos: pos, Msg: fmt.Sprintf(format, args...), Err: kind})
}

// Warn appends a warning at pos.
func (l *ErrorList) Warn(pos Pos, format string, args ...any) {
	*l = append(*l, &Error{Pos: pos, Msg: fmt.Sprintf(format, args...), Warning: true})
}

func (l ErrorList) Len() int      { return len(l) }
func (l ErrorList) Swap(i, j int) { l[i], l[j] = l[j], l[i] }
func (l ErrorList) Less(i, j int) bool {
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
