package fit

import (
	"fmt"
	"math"

	"zapnet/devices/spec"
	"zapnet/netlist/datafile"
)

// FailureCurrent reads the failure current It2 of one polarity's TLP rows
// (in pulse order) from the leakage measured after each pulse
// (datafile.FirstFailure: the first tenfold jump over the median before
// it): that pulse's |current| and its index, or ok = false when the
// leakage never jumps (or was not measured).
func FailureCurrent(rows []datafile.TLPPoint) (it2 float64, k int, ok bool) {
	k, ok = datafile.FirstFailure(rows)
	if !ok {
		return 0, -1, false
	}
	return math.Abs(rows[k].I), k, true
}

// TLPData turns a TLP curve into clamp data. Rows from a failure on (see
// FailureCurrent) describe a damaged part: they are returned set aside
// (Datum.Aside), and It2 is the lower failure current of the two
// polarities (0 when neither failed).
func TLPData(t *datafile.TLP) (data []Datum, it2 float64, notes []string) {
	for _, p := range t.Points {
		data = append(data, Datum{Kind: TLPRow, V: p.V, I: p.I, Where: p.Pos.String()})
	}
	for _, side := range []struct {
		name string
		sign float64
	}{{"positive", 1}, {"negative", -1}} {
		idx, rows := t.Side(side.sign)
		c, k, ok := FailureCurrent(rows)
		if !ok {
			continue
		}
		for j := k; j < len(rows); j++ {
			data[idx[j]].Aside = "after the failure"
		}
		after := "that row describes a damaged part and is not fitted"
		if n := len(rows) - k - 1; n > 0 {
			after = fmt.Sprintf("that row and the %d after it describe a damaged part and are not fitted", n)
		}
		notes = append(notes, fmt.Sprintf("%s: the leakage jumps to %s after the %s pulse (%s polarity): It2 = %s; %s",
			rows[k].Pos, spec.FormatSI(rows[k].Leak, "A"), spec.FormatSI(rows[k].I, "A"), side.name, spec.FormatSI(c, "A"), after))
		if it2 == 0 || c < it2 {
			it2 = c
		}
	}
	if t.HasLeak && it2 == 0 {
		notes = append(notes, "the leakage never jumps: the part survived every pulse, so It2 lies above the highest current measured")
	}
	return data, it2, notes
}

// Published is what a datasheet-points file says besides its points.
type Published struct {
	Name, Model, Polarity string
	Vrwm                  float64 // stand-off voltage, V (0: not given)
	Ipp                   float64 // peak pulse current rating, A (0: not given)
	IppPulse              Pulse
	Ls, Ron, It2          float64
}

// DatasheetData turns a datasheet-points file into fit data.
func DatasheetData(d *datafile.Datasheet) ([]Datum, Published, error) {
	pub := Published{Name: d.Name, Model: d.Model, Polarity: d.Polarity}
	var data []Datum
	if v, ok := d.One("vrwm"); ok {
		pub.Vrwm = v.Value
	}
	for _, s := range d.Points {
		w := s.Pos.String()
		switch s.Key {
		case "vbr":
			data = append(data, Datum{Kind: Breakdown, V: s.Value, I: s.At, Where: w})
		case "ir":
			v := s.At
			if !s.HasAt() {
				if pub.Vrwm == 0 {
					return nil, pub, fmt.Errorf("%s: ir has no voltage: write ir VALUE @ VOLTS, or give vrwm", w)
				}
				v = pub.Vrwm
			}
			data = append(data, Datum{Kind: Leakage, V: v, I: s.Value, Where: w})
		case "vc":
			data = append(data, Datum{Kind: Clamping, V: s.Value, I: s.At, Pulse: Pulse(s.Pulse), Where: w})
		case "c":
			v := 0.0
			if s.HasAt() {
				v = s.At
			}
			data = append(data, Datum{Kind: Capacitance, V: v, C: s.Value, Where: w})
		case "vt1":
			data = append(data, Datum{Kind: Trigger, V: s.Value, I: s.At, Where: w})
		case "vh":
			i := 0.0
			if s.HasAt() {
				i = s.At
			}
			data = append(data, Datum{Kind: Holding, V: s.Value, I: i, Where: w})
		case "ipp":
			pub.Ipp, pub.IppPulse = s.Value, Pulse(s.Pulse)
		case "ls":
			pub.Ls = s.Value
		case "ron":
			pub.Ron = s.Value
		case "it2":
			pub.It2 = s.Value
		}
	}
	return data, pub, nil
}

// PinTableFit is a table-path pin made from a pin's TLP curve.
type PinTableFit struct {
	// V and I are the table, voltages rising, both polarities, with the
	// origin added where the curve does not hold it.
	V, I []float64
	// It2 is the failure current (ifail), 0 when unknown.
	It2   float64
	Notes []string
}

// PinTable makes a table-path pin from a pin's TLP curve: every row up to
// the failure (FailureCurrent) of each polarity, ordered by voltage, the
// origin added, and the extra points (typically the pin's leakage at its
// supply voltage: below its first TLP row the table otherwise runs
// straight from the origin to that row). Its failure current is the lower
// of the two polarities' (or it2 when > 0, which wins). A curve whose
// voltage does not rise with its current (snapback) cannot be a table
// path: every such row is reported at its position.
func PinTable(t *datafile.TLP, it2 float64, extra ...[2]float64) (*PinTableFit, error) {
	_, found, notes := TLPData(t)
	f := &PinTableFit{Notes: notes, It2: found}
	if it2 > 0 {
		if found > 0 && math.Abs(found-it2) > 0.01*it2 {
			f.Notes = append(f.Notes, fmt.Sprintf("It2 given as %.4g A; the leakage says %.4g A: the given value is used", it2, found))
		}
		f.It2 = it2
	}
	v, i, err := t.Table(extra...)
	if err != nil {
		return nil, err
	}
	f.V, f.I = v, i
	var neg bool
	for _, x := range f.I {
		neg = neg || x < 0
	}
	if !neg {
		f.Notes = append(f.Notes, "no negative rows: below 0 V the table's straight extension stands for the pin's lower diode, which the data do not show")
	}
	return f, nil
}

// BeadCurveOf turns an impedance file's curves into bead curves.
func BeadCurveOf(im *datafile.Impedance) []BeadCurve {
	var out []BeadCurve
	for _, c := range im.Curves {
		bc := BeadCurve{Bias: c.Bias, Complex: im.Complex}
		for _, p := range c.Points {
			bc.F = append(bc.F, p.F)
			bc.Z = append(bc.Z, p.Z)
			bc.Where = append(bc.Where, p.Pos.String())
		}
		out = append(out, bc)
	}
	return out
}

// BeadCurveOfTouchstone turns a Touchstone file into a bead curve at the
// given DC bias (see Touchstone.Impedance for how each kind of file is
// read), and says how the impedance was read.
func BeadCurveOfTouchstone(t *datafile.Touchstone, bias float64) (BeadCurve, string, error) {
	z, how, err := t.Impedance()
	if err != nil {
		return BeadCurve{}, "", err
	}
	bc := BeadCurve{Bias: bias, Complex: true}
	for k, f := range t.Freq {
		if f <= 0 {
			continue // a DC point carries no reactance to fit
		}
		bc.F = append(bc.F, f)
		bc.Z = append(bc.Z, z[k])
		bc.Where = append(bc.Where, t.Pos[k].String())
	}
	return bc, how, nil
}
