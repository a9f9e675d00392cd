package datafile

import (
	"math"
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
}

// Positive returns the rows of the positive polarity (current > 0, or
// voltage > 0 at zero current), in file order.
func (t *TLP) Positive() []TLPPoint { return t.side(1) }

// Negative returns the rows of the negative polarity, in file order.
func (t *TLP) Negative() []TLPPoint { return t.side(-1) }

func (t *TLP) side(s float64) []TLPPoint {
	var out []TLPPoint
	for _, p := range t.Points {
		if tlpSign(p) == s {
			out = append(out, p)
		}
	}
	return out
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
	t := &TLP{HasLeak: tab.idx[2] >= 0, Ignored: tab.ignored}
	for _, r := range tab.rows {
		p := TLPPoint{V: r.val[0], I: r.val[1], Leak: r.val[2], Pos: Pos{name, r.line, r.col[0]}}
		if t.HasLeak && !math.IsNaN(p.Leak) && p.Leak < 0 {
			// A leakage reading is a magnitude at a small bias; its sign
			// follows the bias, not the pulse.
			p.Leak = -p.Leak
		}
		t.Points = append(t.Points, p)
	}
	if len(t.Points) == 0 && tab.header > 0 {
		errs.add(Pos{name, tab.header, 1}, ErrMissing, "no data rows after the header")
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
					errs.warn(p.Pos, ErrOrder, "the current falls from %.4g A to %.4g A: TLP rows should follow rising pulse levels", prev.I, p.I)
				case math.Abs(p.V) < math.Abs(prev.V):
					errs.warn(p.Pos, ErrOrder, "the voltage falls from %.4g V to %.4g V as the current rises: snapback, or a noisy row", prev.V, p.V)
				}
			}
			prev = p
		}
	}
	errs.sort()
	if err := errs.Err(); err != nil {
		return nil, err
	}
	t.Notes = errs.Warnings()
	return t, nil
}
