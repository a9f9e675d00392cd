package datafile

import (
	"fmt"
	"math"
	"sort"

	"zapnet/netlist/textpos"
)

// TLPPoint is one pulse of a transmission-line-pulse measurement.
type TLPPoint struct {
	V, I float64 // the pulse's averaged voltage and current, V and A; negative rows are the other polarity
	Leak float64 // leakage current measured after the pulse, A; NaN when not measured
	Pos  Pos     // the row's position
}

// TLP is a TLP curve: one row per pulse, in the order of the file (the order
// the pulses were applied, levels rising).
type TLP struct {
	Points  []TLPPoint
	HasLeak bool      // the file has a leak column
	Ignored []string  // header columns zapnet does not use
	Notes   ErrorList // warnings: rows out of order, a voltage that falls as the current rises
	file    string
}

// Side returns the rows of one polarity, s = 1 positive (current > 0, or
// voltage ≥ 0 at zero current) or −1 negative, in file order, with their
// indices in Points.
func (t *TLP) Side(s float64) (idx []int, rows []TLPPoint) {
	for k, p := range t.Points {
		if tlpSign(p) == s {
			idx, rows = append(idx, k), append(rows, p)
		}
	}
	return idx, rows
}

func tlpSign(p TLPPoint) float64 {
	switch {
	case p.I > 0, p.I == 0 && p.V >= 0:
		return 1
	}
	return -1
}

// tlpColumns are the columns of a TLP CSV.
var tlpColumns = []column{
	{names: []string{"v", "voltage"}, unit: "V", required: true},
	{names: []string{"i", "current"}, unit: "A", required: true},
	{names: []string{"leak", "leakage"}, unit: "A", blank: true},
}

// ReadTLP reads a TLP curve from CSV: a header naming the columns v and i
// (a unit in brackets allowed, `v [V]`, `i [mA]`; a prefixed unit scales the
// column), optionally leak (the leakage current measured after each pulse,
// blank where not measured), then one row per pulse. Rows with a negative
// current belong to the other polarity.
//
// The curve is checked per polarity in file order: a current that falls
// from one pulse to the next (pulses out of order) and a voltage that falls
// as the current rises (snapback, or a noisy row) are flagged as warnings
// in Notes; a table model of the curve must reject them, a snapback fit
// expects the second.
func ReadTLP(name string, src []byte) (*TLP, error) {
	var errs ErrorList
	tab := readCSV(name, src, tlpColumns, &errs)
	t := &TLP{HasLeak: tab.idx[2] >= 0, Ignored: tab.ignored, file: name}
	for _, r := range tab.rows {
		p := TLPPoint{V: r.val[0], I: r.val[1], Leak: r.val[2], Pos: Pos{File: name, Line: r.line, Col: r.col[0]}}
		if t.HasLeak && !math.IsNaN(p.Leak) && p.Leak < 0 {
			// A leakage reading is a magnitude at a small bias; its sign
			// follows the bias, not the pulse.
			p.Leak = -p.Leak
		}
		t.Points = append(t.Points, p)
	}
	if len(t.Points) == 0 && tab.header > 0 {
		errs.Add(Pos{File: name, Line: tab.header, Col: 1}, ErrMissing, "no data rows after the header")
	}
	for _, s := range []float64{1, -1} {
		var prev *TLPPoint
		for k := range t.Points {
			p := &t.Points[k]
			if tlpSign(*p) != s {
				continue
			}
			if prev != nil {
				switch {
				case math.Abs(p.I) < math.Abs(prev.I):
					errs.WarnKind(p.Pos, ErrOrder, "the current falls from %.4g A to %.4g A: TLP rows should follow rising pulse levels", prev.I, p.I)
				case math.Abs(p.V) < math.Abs(prev.V):
					errs.WarnKind(p.Pos, ErrOrder, "the voltage falls from %.4g V to %.4g V as the current rises: snapback, or a noisy row", prev.V, p.V)
				}
			}
			prev = p
		}
	}
	errs.RemoveMultiples()
	if err := errs.Err(); err != nil {
		return nil, err
	}
	t.Notes = errs.Warnings()
	return t, nil
}

// The failure criterion of FirstFailure: a leakage reading counts as the
// part's failure when it exceeds FailureFactor times the median of the
// readings before it and rises by more than FailureFloor above it, so that
// noise at picoamperes does not count [practice: a tenfold leakage shift is
// a common TLP failure criterion].
const (
	FailureFactor = 10
	FailureFloor  = 10e-9 // A
)

// FirstFailure returns the index of the first of rows (one polarity, in
// pulse order) after whose pulse the leakage jumped (see FailureFactor), or
// ok = false when it never did or was not measured.
func FirstFailure(rows []TLPPoint) (k int, ok bool) {
	var seen []float64
	for k, p := range rows {
		if math.IsNaN(p.Leak) {
			continue
		}
		if len(seen) > 0 {
			base := median(seen)
			if p.Leak > FailureFactor*base && p.Leak-base > FailureFloor {
				return k, true
			}
		}
		seen = append(seen, p.Leak)
	}
	return -1, false
}

func median(x []float64) float64 {
	s := append([]float64(nil), x...)
	sort.Float64s(s)
	n := len(s)
	if n%2 == 1 {
		return s[n/2]
	}
	return (s[n/2-1] + s[n/2]) / 2
}

// Intact reports, for each row, whether it was measured before its
// polarity's failure (FirstFailure): rows from the failing pulse on
// describe a damaged part.
func (t *TLP) Intact() []bool {
	ok := make([]bool, len(t.Points))
	for _, s := range []float64{1, -1} {
		idx, rows := t.Side(s)
		end := len(rows)
		if k, failed := FirstFailure(rows); failed {
			end = k
		}
		for j := range end {
			ok[idx[j]] = true
		}
	}
	return ok
}

// Table returns the curve as the points of a table path: the intact rows
// (Intact) of both polarities and the extra points, ordered by current,
// with the origin added when no row holds it. A table path's voltage must
// rise with its current; every row where it does not (snapback, a noisy
// row) is an error at its position.
func (t *TLP) Table(extra ...[2]float64) (v, i []float64, err error) {
	type row struct {
		v, i float64
		pos  Pos
		what string
	}
	var rows []row
	zero := false
	for k, ok := range t.Intact() {
		if !ok {
			continue
		}
		p := t.Points[k]
		rows = append(rows, row{p.V, p.I, p.Pos, ""})
		zero = zero || (p.V == 0 && p.I == 0)
	}
	if !zero {
		rows = append(rows, row{0, 0, Pos{}, "the origin"})
	}
	for _, x := range extra {
		rows = append(rows, row{x[0], x[1], Pos{}, fmt.Sprintf("the point %g V, %g A", x[0], x[1])})
	}
	sort.SliceStable(rows, func(a, b int) bool { return rows[a].i < rows[b].i })
	var errs ErrorList
	name := func(r row) string {
		if r.what != "" {
			return r.what
		}
		return r.pos.String()
	}
	for k := 1; k < len(rows); k++ {
		a, b := rows[k-1], rows[k]
		if b.v <= a.v {
			pos := b.pos
			if b.what != "" {
				pos = a.pos
			}
			errs.Add(pos, ErrOrder, "%.4g V at %.4g A is not above %.4g V at %.4g A (%s): a table path needs a voltage that rises with the current; a curve that snaps back wants a snapback clamp", b.v, b.i, a.v, a.i, name(a))
		}
	}
	if err := errs.Err(); err != nil {
		return nil, nil, err
	}
	if len(rows) < 3 {
		return nil, nil, textpos.New(Pos{File: t.file}, ErrMissing, "a table path needs at least two TLP rows besides the origin, got %d", len(rows)-1)
	}
	for _, r := range rows {
		v, i = append(v, r.v), append(i, r.i)
	}
	return v, i, nil
}
