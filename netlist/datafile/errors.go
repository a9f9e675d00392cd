package datafile

import (
	"errors"
	"fmt"
	"sort"
	"strings"
)

// Pos is a position in a data file. Line and Col count from 1; Col counts
// runes, as the deck reader's positions do.
type Pos struct {
	File string
	Line int
	Col  int
}

// String renders file:line:col, dropping the parts that are unknown.
func (p Pos) String() string {
	switch {
	case p.Line <= 0 && p.File == "":
		return "-"
	case p.Line <= 0:
		return p.File
	case p.File == "":
		return fmt.Sprintf("%d:%d", p.Line, p.Col)
	case p.Col <= 0:
		return fmt.Sprintf("%s:%d", p.File, p.Line)
	}
	return fmt.Sprintf("%s:%d:%d", p.File, p.Line, p.Col)
}

// Sentinel errors, for callers that act on the kind of a problem
// (errors.Is on an *Error or on an ErrorList).
var (
	// ErrSyntax: a line that does not have the form the format asks for.
	ErrSyntax = errors.New("malformed line")
	// ErrNumber: a field that should be a number is not one, or its unit
	// does not fit.
	ErrNumber = errors.New("bad number")
	// ErrRange: a number outside what it can mean (a negative frequency, a
	// zero reference resistance).
	ErrRange = errors.New("value out of range")
	// ErrOrder: rows out of order (frequencies not rising, a table's
	// voltages not rising, a TLP curve that is not monotone).
	ErrOrder = errors.New("rows out of order")
	// ErrMissing: something the format requires is absent (a column, a
	// keyword, the model asked for).
	ErrMissing = errors.New("missing data")
	// ErrUnsupported: legal in the format, but not something zapnet can use
	// (H- or G-parameters, a mixed-mode Touchstone file).
	ErrUnsupported = errors.New("not supported")
)

// Error is one problem in a data file.
type Error struct {
	Pos     Pos
	Msg     string
	Err     error // one of the sentinels, or nil
	Warning bool  // legal but doubtful: reported, never fatal
}

func (e *Error) Error() string {
	if e.Warning {
		return e.Pos.String() + ": warning: " + e.Msg
	}
	return e.Pos.String() + ": " + e.Msg
}

// Unwrap returns the sentinel.
func (e *Error) Unwrap() error { return e.Err }

// ErrorList collects every problem of a file.
type ErrorList []*Error

// add appends an error of kind err at pos.
func (l *ErrorList) add(pos Pos, err error, format string, args ...any) {
	*l = append(*l, &Error{Pos: pos, Msg: fmt.Sprintf(format, args...), Err: err})
}

// warn appends a warning of kind err at pos.
func (l *ErrorList) warn(pos Pos, err error, format string, args ...any) {
	*l = append(*l, &Error{Pos: pos, Msg: fmt.Sprintf(format, args...), Err: err, Warning: true})
}

// sort orders the list by position, then message, and drops exact repeats.
func (l *ErrorList) sort() {
	s := *l
	sort.SliceStable(s, func(i, j int) bool {
		a, b := s[i].Pos, s[j].Pos
		if a.File != b.File {
			return a.File < b.File
		}
		if a.Line != b.Line {
			return a.Line < b.Line
		}
		if a.Col != b.Col {
			return a.Col < b.Col
		}
		return s[i].Msg < s[j].Msg
	})
	out := s[:0]
	for i, e := range s {
		if i > 0 && e.Pos == s[i-1].Pos && e.Msg == s[i-1].Msg {
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

// Unwrap lets errors.Is find the sentinel of any problem in the list.
func (l ErrorList) Unwrap() []error {
	out := make([]error, len(l))
	for i, e := range l {
		out[i] = e
	}
	return out
}

// Err returns nil when the list holds no errors (warnings alone do not
// count), and the sorted list otherwise.
func (l ErrorList) Err() error {
	for _, e := range l {
		if !e.Warning {
			return l
		}
	}
	return nil
}

// Warnings returns the warnings of the list.
func (l ErrorList) Warnings() ErrorList {
	var w ErrorList
	for _, e := range l {
		if e.Warning {
			w = append(w, e)
		}
	}
	return w
}
