package netlist

import (
	"fmt"
	"sort"
	"strings"
)

// Error is one problem found in a deck.
type Error struct {
	Pos     Pos
	Msg     string
	Warning bool // legal but doubtful: reported, never fatal
}

func (e *Error) Error() string {
	if e.Warning {
		return e.Pos.String() + ": warning: " + e.Msg
	}
	return e.Pos.String() + ": " + e.Msg
}

// ErrorList collects the problems of a deck so that all of them are reported
// in one pass.
type ErrorList []*Error

// Add appends a problem at pos.
func (l *ErrorList) Add(pos Pos, format string, args ...any) {
	*l = append(*l, &Error{Pos: pos, Msg: fmt.Sprintf(format, args...)})
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
