package datafile

import (
	"errors"

	"zapnet/netlist/textpos"
)

// Pos is a position in a data file (textpos.Pos). Line and Col count from
// 1; Col counts runes, as the deck reader's positions do.
type Pos = textpos.Pos

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

// Error is one problem in a data file (textpos.Error); Err is one of the
// sentinels above.
type Error = textpos.Error

// ErrorList collects every problem of a file (textpos.List): at most
// textpos.MaxProblems of them and the count of the rest, their messages
// escaped so that a binary file cannot act on the terminal.
type ErrorList = textpos.List
