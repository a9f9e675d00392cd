package fit

import (
	"math"
	"math/cmplx"

	"zapnet/devices"
	"zapnet/netlist/datafile"
)

// Document is the machine-readable result of a fit (`zapnet fit ... --json`,
// OUTPUT.md): the parameters by the deck's names, the part line, every
// point with its measured and fitted value, and the notes. Fields are only
// ever added, never renamed.
type Document struct {
	Tool    string   `json:"tool"`
	Version string   `json:"version"`
	Kind    string   `json:"kind"` // the deck's kind: clamp, snapback, bead, pin
	Name    string   `json:"name"`
	Sources []string `json:"sources"`
	// Params are the part's numeric parameters, SI units, by the deck's
	// names; Words its word parameters.
	Params map[string]float64 `json:"params"`
	Units  map[string]string  `json:"units"`
	Words  map[string]string  `json:"words,omitempty"`
	// Order lists the numeric parameters in the part line's order.
	Order []string `json:"order"`
	// Fitted lists the parameters the fit adjusted; Sigma their relative
	// standard errors (absent where the data cannot tell one). From says
	// where a parameter that was not fitted came from ("datasheet",
	// "leakage", "given").
	Fitted []string           `json:"fitted"`
	From   map[string]string  `json:"from,omitempty"`
	Sigma  map[string]float64 `json:"sigma,omitempty"`
	Part   string             `json:"part"`
	Points []Point            `json:"points"`
	// Bead is set for a bead: its self-resonance, |Z| at 100 MHz and the
	// band where the fit holds within 10 %.
	Bead  *BeadSummary `json:"bead,omitempty"`
	Notes []string     `json:"notes"`
}

// Point is one data point of a Document.
type Point struct {
	Where string `json:"where,omitempty"` // file:line:col
	// What the point is: "tlp" (a TLP row), "vbr", "ir", "vc 8/20",
	// "vc 10/1000", "vc tlp", "c", "vt1", "vh", "z" (complex impedance) or
	// "|z|" (a magnitude).
	What     string  `json:"what"`
	X        float64 `json:"x"` // the current (A), the bias (V) or the frequency (Hz)
	XUnit    string  `json:"x_unit"`
	Measured float64 `json:"measured"`
	Fitted   float64 `json:"fitted"`
	Unit     string  `json:"unit"`
	// Residual is (fitted − measured)/|measured|, or for a complex
	// impedance |Z_fit − Z|/|Z|.
	Residual float64 `json:"residual"`
	// Used is false for a point shown but not fitted; Why says why.
	Used bool   `json:"used"`
	Why  string `json:"why,omitempty"`
	// Bias is a bead point's DC current, A.
	Bias float64 `json:"bias,omitempty"`
	// For a complex impedance, its parts, Ω.
	MeasuredRe float64 `json:"measured_re,omitempty"`
	MeasuredIm float64 `json:"measured_im,omitempty"`
	FittedRe   float64 `json:"fitted_re,omitempty"`
	FittedIm   float64 `json:"fitted_im,omitempty"`
}

// BeadSummary are the figures a bead's datasheet is read by.
type BeadSummary struct {
	SRF     float64 `json:"srf"`      // Hz
	Z100MHz float64 `json:"z_100mhz"` // |Z| at 100 MHz, Ω
	BandLo  float64 `json:"band_lo"`  // Hz
	BandHi  float64 `json:"band_hi"`  // Hz
	Complex bool    `json:"complex"`  // the data gave phase (or R and X)
	Within  float64 `json:"band_tol"` // the band's tolerance, 0.1
}

// SetFrom records where a parameter that was not fitted came from.
func (d *Document) SetFrom(key, from string) {
	if d.From == nil {
		d.From = map[string]string{}
	}
	d.From[key] = from
}

func newDocument(kind string, p Part, sources []string) Document {
	d := Document{Kind: kind, Name: p.Name, Sources: sources, Params: map[string]float64{}, Units: map[string]string{},
		Part: p.Line(), Points: []Point{}, Notes: []string{}, Fitted: []string{}, Order: []string{}}
	for _, n := range p.Num {
		d.Params[n.Key] = n.Value
		d.Units[n.Key] = n.Unit
		d.Order = append(d.Order, n.Key)
	}
	if len(p.Words) > 0 {
		d.Words = map[string]string{}
		for _, w := range p.Words {
			d.Words[w.Key] = w.Value
		}
	}
	return d
}

func (d *Document) sigma(fitted []string, s map[string]float64) {
	d.Fitted = append(d.Fitted, fitted...)
	for k, v := range s {
		if !math.IsNaN(v) && !math.IsInf(v, 0) {
			if d.Sigma == nil {
				d.Sigma = map[string]float64{}
			}
			d.Sigma[k] = v
		}
	}
}

// clampPoints turns clamp points into document points.
func clampPoints(ps []ClampPoint) []Point {
	var out []Point
	for _, c := range ps {
		p := Point{Where: c.Where, What: c.Kind.String(), X: c.I, XUnit: "A", Measured: c.V, Fitted: c.Model,
			Unit: "V", Residual: c.Residual, Used: c.Used}
		switch c.Kind {
		case Clamping:
			p.What = "vc " + string(c.Pulse)
		case Capacitance:
			p.X, p.XUnit, p.Measured, p.Unit = c.V, "V", c.C, "F"
		}
		if !c.Used {
			switch {
			case c.Aside != "":
				p.Why = c.Aside
			case c.Kind == TLPRow && c.I < 0:
				p.Why = "forward conduction, shown against the model"
			default:
				p.Why = "set aside in a conflict (see the notes)"
			}
		}
		out = append(out, p)
	}
	return out
}

// Document returns the clamp fit's document; name names the part and
// extra holds what the part carries besides the fit (ratings, ls).
func (f *ClampFit) Document(part Part, sources []string) Document {
	d := newDocument("clamp", part, sources)
	d.sigma(f.Fitted, f.Sigma)
	d.Points = clampPoints(f.Points)
	d.Notes = append(d.Notes, f.Notes...)
	return d
}

// Document returns the snapback fit's document.
func (f *SnapbackFit) Document(part Part, sources []string) Document {
	d := newDocument("snapback", part, sources)
	d.sigma(f.Fitted, f.Sigma)
	d.Points = clampPoints(f.Points)
	d.Notes = append(d.Notes, f.Notes...)
	return d
}

// Document returns the bead fit's document.
func (f *BeadFit) Document(part Part, sources []string) Document {
	d := newDocument("bead", part, sources)
	d.sigma(f.Fitted, f.Sigma)
	cplx := true
	for _, p := range f.Points {
		q := Point{Where: p.Where, What: "z", X: p.F, XUnit: "Hz", Measured: cmplx.Abs(p.Measured),
			Fitted: cmplx.Abs(p.Fitted), Unit: "Ω", Residual: p.Residual, Used: true, Bias: p.Bias}
		if p.Complex {
			q.MeasuredRe, q.MeasuredIm = real(p.Measured), imag(p.Measured)
			q.FittedRe, q.FittedIm = real(p.Fitted), imag(p.Fitted)
		} else {
			q.What = "|z|"
			cplx = false
		}
		d.Points = append(d.Points, q)
	}
	d.Bead = &BeadSummary{SRF: f.SRF, Z100MHz: cmplx.Abs(f.Z100M), BandLo: f.BandLo, BandHi: f.BandHi, Complex: cplx, Within: 0.1}
	d.Notes = append(d.Notes, f.Notes...)
	return d
}

// Document returns a table-path pin's document: every TLP row with the
// table's voltage at its current beside it (the table passes through the
// intact rows; rows after a failure are shown against its extension).
func (f *PinTableFit) Document(part Part, sources []string, t *datafile.TLP) (Document, error) {
	d := newDocument("pin", part, sources)
	tab, err := devices.NewIVTable(f.V, f.I)
	if err != nil {
		return d, err
	}
	intact := t.Intact()
	for k, p := range t.Points {
		v := tableVoltage(tab, p.I)
		q := Point{Where: p.Pos.String(), What: "tlp", X: p.I, XUnit: "A", Measured: p.V, Fitted: v,
			Unit: "V", Residual: (v - p.V) / math.Abs(p.V), Used: intact[k]}
		if !intact[k] {
			q.Why = "after the failure"
		}
		d.Points = append(d.Points, q)
	}
	d.Notes = append(d.Notes, f.Notes...)
	return d, nil
}

// tableVoltage inverts a monotone table: the voltage where it carries i.
func tableVoltage(t *devices.IVTable, i float64) float64 {
	lo, hi := t.Range()
	span := hi - lo
	for {
		a, _ := t.Eval(lo)
		b, _ := t.Eval(hi)
		if a <= i && b >= i {
			break
		}
		lo, hi = lo-span, hi+span
		span *= 2
		if span > 1e9 {
			return math.NaN()
		}
	}
	for range 200 {
		mid := (lo + hi) / 2
		if c, _ := t.Eval(mid); c < i {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

// IBISDocument is the document of an IBIS pin import: each clamp table's
// rows beside the table path's current at that row (the same table,
// interpolated: they differ only where a dip was filled). The pin conducts
// both tables at once; the notes say so.
func IBISDocument(part Part, sources []string, pm *datafile.PinModel, s devices.TableSpec) Document {
	d := newDocument("pin", part, sources)
	add := func(what string, pos datafile.Pos, u, i float64, tab *devices.IVTable, at float64) {
		m, _ := tab.Eval(at)
		d.Points = append(d.Points, Point{Where: pos.String(), What: what, X: u, XUnit: "V", Measured: i, Fitted: m,
			Unit: "A", Residual: (m - i) / math.Max(math.Abs(i), 1e-9), Used: true})
	}
	for k, u := range pm.GNDV {
		add("gnd clamp", pm.GNDRows[k], u+pm.GNDRef, pm.GNDI[k], s.Low, u+pm.GNDRef)
	}
	for k, w := range pm.PowerV {
		if s.Up != nil {
			add("power clamp", pm.PowerRows[k], w+pm.PowerRef, pm.PowerI[k], s.Up, w)
		}
	}
	return d
}
