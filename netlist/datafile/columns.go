package datafile

import (
	"math"
	"strings"
	"unicode/utf8"

	"zapnet/devices/spec"
)

// column describes a column a CSV reader looks for in the header.
type column struct {
	names    []string // accepted header names, lower case; the first is the canonical one
	unit     string   // SI unit of the values ("" plain); a prefixed unit in brackets scales them
	angle    bool     // an angle in degrees: accepts [deg] or [°] and no other unit
	required bool
	blank    bool // an empty field is allowed (read as NaN)
}

// csvTable is a CSV file read against a list of columns.
type csvTable struct {
	idx     []int     // for each wanted column, its field index, −1 when absent
	scale   []float64 // for each wanted column, the factor of its bracketed unit
	rows    []csvRow
	ignored []string // header names that matched no wanted column
	header  int      // line of the header
}

type csvRow struct {
	line int
	val  []float64 // one per wanted column (NaN when absent or blank)
	col  []int     // rune column of each wanted column's field
}

// readCSV reads a CSV file with a header line naming its columns. Blank
// lines and lines starting with '#' are skipped. The separator is a comma,
// or a semicolon or tab when the header has no comma.
func readCSV(name string, src []byte, want []column, errs *ErrorList) *csvTable {
	return readTable(name, src, want, false, errs)
}

// readTable reads a CSV as readCSV does; with positional, a first line of
// numbers only is no header but the first row, whose fields are the wanted
// columns in order, in their SI units.
func readTable(name string, src []byte, want []column, positional bool, errs *ErrorList) *csvTable {
	t := &csvTable{idx: make([]int, len(want)), scale: make([]float64, len(want))}
	for k := range t.idx {
		t.idx[k], t.scale[k] = -1, 1
	}
	var sep rune
	for _, ln := range lines(src, 0) {
		text := strings.TrimSpace(ln.text)
		if text == "" || strings.HasPrefix(text, "#") {
			continue
		}
		if sep == 0 {
			sep = ','
			if !strings.ContainsRune(ln.text, ',') {
				switch {
				case strings.ContainsRune(ln.text, ';'):
					sep = ';'
				case strings.ContainsRune(ln.text, '\t'):
					sep = '\t'
				}
			}
			if positional && numbersOnly(ln.text, sep) {
				for k := range want {
					t.idx[k] = k
				}
				t.header = -1
			} else {
				t.header = ln.no
				t.readHeader(name, ln, sep, want, errs)
				continue
			}
		}
		t.readRow(name, ln, sep, want, errs)
	}
	if t.header == 0 {
		errs.Add(Pos{File: name}, ErrMissing, "no header line: the first line names the columns, for example %s", example(want))
	}
	return t
}

// numbersOnly says whether every field of a line is a plain number.
func numbersOnly(text string, sep rune) bool {
	for _, f := range splitSep(text, sep) {
		if _, msg := spec.ParsePlain(f.text); msg != "" {
			return false
		}
	}
	return true
}

// example shows a header line with the required columns.
func example(want []column) string {
	var names []string
	for _, c := range want {
		if c.required {
			n := c.names[0]
			if c.unit != "" {
				n += " [" + c.unit + "]"
			}
			names = append(names, n)
		}
	}
	return strings.Join(names, ",")
}

func (t *csvTable) readHeader(name string, ln line, sep rune, want []column, errs *ErrorList) {
	for fi, f := range splitSep(ln.text, sep) {
		pos := Pos{File: name, Line: ln.no, Col: f.col}
		label, unit := f.text, ""
		if k := strings.IndexAny(label, "[("); k >= 0 {
			closer := "]"
			if label[k] == '(' {
				closer = ")"
			}
			end := strings.LastIndex(label, closer)
			if end < k {
				errs.Add(pos, ErrSyntax, "column %q: the unit's bracket is not closed", f.text)
				continue
			}
			unit = strings.TrimSpace(label[k+1 : end])
			label = strings.TrimSpace(label[:k])
		}
		found := -1
		for ci, c := range want {
			for _, n := range c.names {
				if strings.EqualFold(label, n) {
					found = ci
				}
			}
		}
		if found < 0 {
			t.ignored = append(t.ignored, label)
			continue
		}
		if t.idx[found] >= 0 {
			errs.Add(pos, ErrSyntax, "column %q given twice", label)
			continue
		}
		t.idx[found] = fi
		c := want[found]
		if unit == "" {
			continue
		}
		if c.angle {
			if !strings.EqualFold(unit, "deg") && unit != "°" && !strings.EqualFold(unit, "degrees") {
				errs.Add(pos, ErrNumber, "column %q: angles are in degrees, [deg], not [%s]", label, unit)
			}
			continue
		}
		s, msg := unitScale(unit, c.unit)
		if msg != "" {
			errs.Add(pos, ErrNumber, "column %q: %s", label, msg)
			continue
		}
		t.scale[found] = s
	}
	for ci, c := range want {
		if c.required && t.idx[ci] < 0 {
			errs.Add(Pos{File: name, Line: ln.no, Col: 1}, ErrMissing, "no column %q in the header (want %s)", c.names[0], example(want))
		}
	}
}

// unitScale reads a bracketed unit such as V, mA, MHz or ohm
// (spec.ParseUnit) and returns its factor to the SI unit want. A header is
// often written by an instrument, not typed: "Ohm" and "Ohms" there are
// the ohm too.
func unitScale(unit, want string) (float64, string) {
	for _, o := range []string{"Ohms", "ohms", "Ohm"} {
		if p, ok := strings.CutSuffix(unit, o); ok {
			unit = p + "ohm"
			break
		}
	}
	exp, u, ok := spec.ParseUnit(unit)
	switch {
	case !ok:
		msg := "unknown unit " + unit
		if hint := spec.SuffixHint(unit); hint != "" {
			msg += " (did you mean " + hint + "?)"
		}
		return 0, msg
	case u != spec.Unit(want):
		return 0, wantsUnit(want, u)
	}
	return math.Pow10(exp), ""
}

func (t *csvTable) readRow(name string, ln line, sep rune, want []column, errs *ErrorList) {
	fs := splitSep(ln.text, sep)
	r := csvRow{line: ln.no, val: make([]float64, len(want)), col: make([]int, len(want))}
	ok := true
	for ci, c := range want {
		r.val[ci] = math.NaN()
		fi := t.idx[ci]
		if fi < 0 {
			continue
		}
		if fi >= len(fs) {
			errs.Add(Pos{File: name, Line: ln.no, Col: utf8.RuneCountInString(ln.text) + 1}, ErrSyntax,
				"the row ends before column %q (field %d of the header)", c.names[0], fi+1)
			ok = false
			continue
		}
		f := fs[fi]
		r.col[ci] = f.col
		if f.text == "" && c.blank {
			continue
		}
		v, msg := spec.ParsePlain(f.text)
		if msg != "" {
			errs.Add(Pos{File: name, Line: ln.no, Col: f.col}, ErrNumber, "column %q: %s", c.names[0], msg)
			ok = false
			continue
		}
		r.val[ci] = v * t.scale[ci]
	}
	if ok {
		t.rows = append(t.rows, r)
	}
}
