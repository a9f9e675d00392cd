// Package textpos says where in a text file a problem is and collects the
// problems of one reading: a position as file:line:col, one problem with the
// kind a caller tests with errors.Is, and a list that keeps every problem of
// a pass in bounded memory and prints them in file order with control
// characters escaped. The deck reader (package netlist) and the data-file
// readers (package netlist/datafile) both report through it, so a problem
// reads alike wherever it was found. It imports the standard library only,
// so that every reader of zapnet may use it.
package textpos

import "fmt"

// Pos is a position in a file. Line and Col count from 1; Col counts
// runes, so that Ω and µ are one column each. The zero Pos is unset: a
// value that came from no file (a command-line setting).
type Pos struct {
	File string
	Line int
	Col  int
}

// IsValid reports whether the position names a line.
func (p Pos) IsValid() bool { return p.Line > 0 }

// String renders file:line:col, dropping the parts that are unknown, and
// "-" for an unset position.
func (p Pos) String() string {
	switch {
	case !p.IsValid() && p.File == "":
		return "-"
	case !p.IsValid():
		return p.File
	case p.File == "":
		return fmt.Sprintf("%d:%d", p.Line, p.Col)
	case p.Col <= 0:
		return fmt.Sprintf("%s:%d", p.File, p.Line)
	}
	return fmt.Sprintf("%s:%d:%d", p.File, p.Line, p.Col)
}
