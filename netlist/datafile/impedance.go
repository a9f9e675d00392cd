package datafile

import (
	"math"
	"math/cmplx"
	"sort"
)

// ZPoint is one impedance reading.
type ZPoint struct {
	F   float64    // frequency, Hz
	Z   complex128 // impedance, Ω; only its magnitude is meaningful when the curve has no phase
	Pos Pos
}

// ZCurve is an impedance curve at one DC bias current.
type ZCurve struct {
	Bias   float64 // DC bias current through the part, A (0 without a bias column)
	Points []ZPoint
}

// Impedance is what an impedance CSV holds: one curve, or one per bias
// current when the file has an idc column.
type Impedance struct {
	Curves  []ZCurve // in order of rising bias
	Complex bool     // phase, or r and x, were given: Z is complex; otherwise magnitudes only
	Ignored []string
}

var zColumns = []column{
	{names: []string{"f", "freq", "frequency"}, unit: "Hz", required: true},
	{names: []string{"z", "|z|", "zmag"}, unit: "Ω"},
	{names: []string{"phase", "angle"}, angle: true},
	{names: []string{"r"}, unit: "Ω"},
	{names: []string{"x"}, unit: "Ω"},
	{names: []string{"idc", "bias"}, unit: "A"},
}

// ReadImpedance reads impedance curves from CSV: a header naming the column
// f (Hz; `f [MHz]` scales) and either z (|Z|, Ω) with an optional phase
// (degrees), or r and x (Ω); optionally idc, the DC bias current of the row
// (A), which splits the file into one curve per bias. Frequencies must rise
// within each curve.
func ReadImpedance(name string, src []byte) (*Impedance, error) {
	var errs ErrorList
	tab := readCSV(name, src, zColumns, &errs)
	hasZ, hasPh, hasR, hasX := tab.idx[1] >= 0, tab.idx[2] >= 0, tab.idx[3] >= 0, tab.idx[4] >= 0
	hp := Pos{File: name, Line: tab.header, Col: 1}
	switch {
	case tab.header == 0:
	case hasZ && (hasR || hasX):
		errs.Add(hp, ErrSyntax, "give either z (with phase) or r and x, not both")
	case hasZ:
	case hasR && hasX:
	case hasR || hasX:
		errs.Add(hp, ErrMissing, "r and x come together: the impedance is r + jx")
	default:
		errs.Add(hp, ErrMissing, "no impedance columns: give z [ohm] (and phase [deg]), or r [ohm] and x [ohm]")
	}
	if hasPh && !hasZ {
		errs.Add(hp, ErrSyntax, "a phase column needs a z column")
	}
	im := &Impedance{Complex: hasPh || (hasR && hasX), Ignored: tab.ignored}
	byBias := map[float64]int{}
	for _, r := range tab.rows {
		pos := Pos{File: name, Line: r.line, Col: r.col[0]}
		f := r.val[0]
		if !(f > 0) {
			errs.Add(pos, ErrRange, "frequency %g Hz: must be > 0", f)
			continue
		}
		var z complex128
		switch {
		case hasZ:
			mag := r.val[1]
			if !(mag > 0) {
				errs.Add(Pos{File: name, Line: r.line, Col: r.col[1]}, ErrRange, "|Z| = %g Ω: a magnitude must be > 0", mag)
				continue
			}
			ph := 0.0
			if hasPh {
				ph = r.val[2] * math.Pi / 180
			}
			z = cmplx.Rect(mag, ph)
		case hasR && hasX:
			z = complex(r.val[3], r.val[4])
		default:
			continue
		}
		bias := 0.0
		if tab.idx[5] >= 0 {
			bias = r.val[5]
		}
		k, ok := byBias[bias]
		if !ok {
			k = len(im.Curves)
			byBias[bias] = k
			im.Curves = append(im.Curves, ZCurve{Bias: bias})
		}
		c := &im.Curves[k]
		if n := len(c.Points); n > 0 && f <= c.Points[n-1].F {
			errs.Add(pos, ErrOrder, "frequency %g Hz does not rise above the row before (%g Hz, line %d)", f, c.Points[n-1].F, c.Points[n-1].Pos.Line)
			continue
		}
		c.Points = append(c.Points, ZPoint{F: f, Z: z, Pos: pos})
	}
	if len(im.Curves) == 0 && tab.header > 0 && len(errs) == 0 {
		errs.Add(hp, ErrMissing, "no data rows after the header")
	}
	errs.RemoveMultiples()
	if err := errs.Err(); err != nil {
		return nil, err
	}
	sort.SliceStable(im.Curves, func(i, j int) bool { return im.Curves[i].Bias < im.Curves[j].Bias })
	return im, nil
}
