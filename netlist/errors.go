package netlist

import (
	"errors"

	"zapnet/netlist/textpos"
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

// Pos is a position in a deck (textpos.Pos).
type Pos = textpos.Pos

// Error is one problem found in a deck (textpos.Error). Pos is unset for a
// problem of a value that did not come from the deck (a command-line
// setting); Err is one of the kinds above, nil for a warning.
type Error = textpos.Error

// ErrorList collects the problems of a deck so that all of them are reported
// in one pass (textpos.List: Add, Warn, Problems, RemoveMultiples, Err).
type ErrorList = textpos.List

// MaxProblems is how many problems a list keeps before it counts the rest.
const MaxProblems = textpos.MaxProblems

// Printable returns s with the characters a terminal would not show as
// themselves written as Go escapes (textpos.Printable).
func Printable(s string) string { return textpos.Printable(s) }
