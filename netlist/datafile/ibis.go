package datafile

import (
	"math"
	"strings"

	"zapnet/devices/spec"
	"zapnet/netlist/textpos"
)

// IBIS holds what zapnet reads of an IBIS file (I/O Buffer Information
// Specification, ANSI/EIA-656): the component's package parasitics, its pin
// list, and per model the input capacitance C_comp, the supply voltage and
// the two clamp tables. Drivers' pull-up, pull-down and ramp data, and every
// other keyword, are skipped. IBIS carries no failure data.
type IBIS struct {
	Version   string
	Component string
	Package   [3]Corners // R_pkg (Ω), L_pkg (H), C_pkg (F)
	Pins      []IBISPin
	Models    []*IBISModel
}

// Corners are the typ, min and max columns of an IBIS value; NaN where the
// file says NA (a caller falls back to typ).
type Corners [3]float64

// Corner indices.
const (
	Typ = 0
	Min = 1
	Max = 2
)

// CornerIndex maps "typ", "min", "max" to Typ, Min, Max; −1 otherwise.
func CornerIndex(s string) int {
	switch strings.ToLower(s) {
	case "typ":
		return Typ
	case "min":
		return Min
	case "max":
		return Max
	}
	return -1
}

// At returns the corner k, falling back to typ where the file says NA.
func (c Corners) At(k int) float64 {
	if math.IsNaN(c[k]) {
		return c[Typ]
	}
	return c[k]
}

// IBISPin is one row of [Pin].
type IBISPin struct {
	Name, Signal, Model string
	R, L, C             float64 // R_pin, L_pin, C_pin; NaN when the row has none
	Pos                 Pos
}

// IVRow is one row of a clamp table: voltage and the current into the
// component at the typ, min and max corners.
type IVRow struct {
	V   float64
	I   Corners
	Pos Pos
}

// IBISModel is one [Model].
type IBISModel struct {
	Name, Type   string
	CComp        Corners // F
	VoltageRange Corners // V
	PowerRef     Corners // [POWER Clamp Reference], V; NaN when absent
	GNDRef       Corners // [GND Clamp Reference], V; NaN when absent
	GNDClamp     []IVRow // voltage of the pad relative to the GND clamp reference
	PowerClamp   []IVRow // voltage of the POWER clamp reference minus the pad's
	Pos          Pos
}

// ReadIBIS reads an IBIS file. Keywords are matched without regard to case,
// spaces and underscores; the comment character is '|' unless [Comment
// Char] changes it. Numbers take IBIS's scaling letters (T G M k m u n p f;
// M is mega) and ignore any letters after them (5pF, 2.2nH); NA stands for
// a missing min or max.
func ReadIBIS(name string, src []byte) (*IBIS, error) {
	r := &ibisReader{
		name:    name,
		ib:      &IBIS{Package: [3]Corners{nanCorners(), nanCorners(), nanCorners()}},
		comment: '|',
	}
	// The comment character can change from one line to the next: each
	// line drops its comment as it is read.
	for _, ln := range lines(src, 0) {
		if !r.line(ln) {
			break
		}
	}
	for _, m := range r.ib.Models {
		for _, tab := range []*[]IVRow{&m.GNDClamp, &m.PowerClamp} {
			sortRows(*tab, &r.errs)
		}
	}
	r.errs.RemoveMultiples()
	if err := r.errs.Err(); err != nil {
		return nil, err
	}
	return r.ib, nil
}

// ibisReader is what an IBIS file has said so far, line by line.
type ibisReader struct {
	name    string
	ib      *IBIS
	errs    ErrorList
	comment rune   // [Comment Char] changes it for the lines after
	section string // the keyword whose rows follow
	// model is the [Model] whose keywords and rows follow; nil before the
	// first, and after one without a name, so that its rows are skipped.
	model     *IBISModel
	pinHasRLC bool // [Pin] names R_pin, L_pin and C_pin columns
	ended     bool
}

// at returns the positions of the words of line no.
func (r *ibisReader) at(no int) func(field) Pos {
	return func(f field) Pos { return Pos{File: r.name, Line: no, Col: f.col} }
}

// line reads one line; false stops the reading.
func (r *ibisReader) line(ln line) bool {
	s := ln.text
	if k := strings.IndexRune(s, r.comment); k >= 0 {
		s = s[:k]
	}
	if strings.TrimSpace(s) == "" {
		return true
	}
	ws := words(s)
	at := r.at(ln.no)
	if r.ended {
		r.errs.Add(at(ws[0]), ErrSyntax, "text after [End]")
		return false
	}
	if strings.HasPrefix(strings.TrimSpace(s), "[") {
		r.keyword(s, ws, at)
		return true
	}
	switch r.section {
	case "package":
		r.packageRow(ws, at)
	case "pin":
		r.pinRow(ws, at)
	case "model":
		r.modelRow(ws, at)
	case "gnd clamp", "power clamp":
		r.clampRow(ws, at)
	}
	return true
}

// keyword reads a line that starts with a bracket; the keywords zapnet
// does not use only start a section whose rows are skipped.
func (r *ibisReader) keyword(s string, ws []field, at func(field) Pos) {
	ib := r.ib
	kw, rest := ibisKeyword(s)
	if kw == "" {
		r.errs.Add(at(ws[0]), ErrSyntax, "a keyword's bracket is not closed")
		return
	}
	args := rest.words()
	r.section = kw
	switch kw {
	case "ibis ver":
		if len(args) > 0 {
			ib.Version = args[0].text
		}
	case "comment char":
		if len(args) > 0 {
			r.comment = []rune(args[0].text)[0]
		}
	case "component":
		if len(args) > 0 {
			ib.Component = strings.TrimSpace(rest.text)
		}
	case "pin":
		r.pinHasRLC = len(args) >= 5
	case "model":
		if len(args) == 0 {
			r.errs.Add(at(ws[0]), ErrMissing, "[Model] needs a name")
			r.model = nil
			return
		}
		r.model = &IBISModel{Name: args[0].text, Pos: at(args[0]),
			CComp: nanCorners(), VoltageRange: nanCorners(), PowerRef: nanCorners(), GNDRef: nanCorners()}
		if prev := ib.Model(r.model.Name); prev != nil {
			r.errs.Add(at(args[0]), ErrSyntax, "model %s defined twice (first at line %d)", r.model.Name, prev.Pos.Line)
		}
		ib.Models = append(ib.Models, r.model)
	case "voltage range", "power clamp reference", "gnd clamp reference":
		if r.model == nil {
			r.errs.Add(at(ws[0]), ErrSyntax, "[%s] outside a [Model]", kw)
			return
		}
		c := ibisCorners(args, at, at(ws[0]), &r.errs)
		switch kw {
		case "voltage range":
			r.model.VoltageRange = c
		case "power clamp reference":
			r.model.PowerRef = c
		default:
			r.model.GNDRef = c
		}
	case "gnd clamp", "power clamp":
		if r.model == nil {
			r.errs.Add(at(ws[0]), ErrSyntax, "[%s] outside a [Model]", kw)
		}
	case "end":
		r.ended = true
	}
}

// packageRow reads a row of [Package]: R_pkg, L_pkg or C_pkg and its corners.
func (r *ibisReader) packageRow(ws []field, at func(field) Pos) {
	k, ok := map[string]int{"r_pkg": 0, "l_pkg": 1, "c_pkg": 2}[strings.ToLower(ws[0].text)]
	if !ok {
		r.errs.Add(at(ws[0]), ErrSyntax, "unknown [Package] entry %q (R_pkg, L_pkg, C_pkg)", ws[0].text)
		return
	}
	r.ib.Package[k] = ibisCorners(ws[1:], at, at(ws[0]), &r.errs)
}

// pinRow reads a row of [Pin]; its R_pin, L_pin and C_pin count only when
// all three read.
func (r *ibisReader) pinRow(ws []field, at func(field) Pos) {
	if len(ws) < 3 {
		r.errs.Add(at(ws[0]), ErrSyntax, "a [Pin] row is: pin_name signal_name model_name [R_pin L_pin C_pin]")
		return
	}
	p := IBISPin{Name: ws[0].text, Signal: ws[1].text, Model: ws[2].text, R: math.NaN(), L: math.NaN(), C: math.NaN(), Pos: at(ws[0])}
	if r.pinHasRLC && len(ws) >= 6 {
		var bad bool
		vals := [3]float64{}
		for k := range 3 {
			v, msg := ibisNumber(ws[3+k].text)
			if msg != "" {
				r.errs.Add(at(ws[3+k]), ErrNumber, "%s", msg)
				bad = true
			}
			vals[k] = v
		}
		if !bad {
			p.R, p.L, p.C = vals[0], vals[1], vals[2]
		}
	}
	r.ib.Pins = append(r.ib.Pins, p)
}

// modelRow reads a sub-parameter line of a [Model].
func (r *ibisReader) modelRow(ws []field, at func(field) Pos) {
	if r.model == nil {
		return
	}
	switch strings.ToLower(ws[0].text) {
	case "model_type":
		if len(ws) > 1 {
			r.model.Type = ws[1].text
		}
	case "c_comp":
		r.model.CComp = ibisCorners(ws[1:], at, at(ws[0]), &r.errs)
	}
	// Other sub-parameters (Vinl, Vinh, Vmeas, ...) do not concern a
	// clamp model.
}

// clampRow reads a row of a [GND Clamp] or [POWER Clamp] table.
func (r *ibisReader) clampRow(ws []field, at func(field) Pos) {
	if r.model == nil {
		return
	}
	if len(ws) < 2 {
		r.errs.Add(at(ws[0]), ErrSyntax, "a clamp table row is: voltage I(typ) [I(min) I(max)]")
		return
	}
	v, msg := ibisNumber(ws[0].text)
	if msg != "" || math.IsNaN(v) {
		if msg == "" {
			msg = "a table voltage cannot be NA"
		}
		r.errs.Add(at(ws[0]), ErrNumber, "%s", msg)
		return
	}
	if len(ws) != 2 && len(ws) != 4 {
		r.errs.Add(at(ws[0]), ErrSyntax, "a clamp table row has a voltage and 1 or 3 currents (typ min max), not %d", len(ws)-1)
		return
	}
	row := IVRow{V: v, I: nanCorners(), Pos: at(ws[0])}
	row.I = ibisCorners(ws[1:], at, at(ws[0]), &r.errs)
	if math.IsNaN(row.I[Typ]) {
		r.errs.Add(at(ws[1]), ErrNumber, "the typ current cannot be NA")
		return
	}
	tab := &r.model.GNDClamp
	if r.section == "power clamp" {
		tab = &r.model.PowerClamp
	}
	if n := len(*tab); n > 0 && v == (*tab)[n-1].V {
		r.errs.Add(at(ws[0]), ErrOrder, "voltage %g V repeats the row before", v)
		return
	}
	*tab = append(*tab, row)
}

// sortRows puts a clamp table in rising voltage (IBIS tables are written
// either way) and reports a table whose voltages go both ways.
func sortRows(t []IVRow, errs *ErrorList) {
	if len(t) < 2 {
		return
	}
	up := t[1].V > t[0].V
	for k := 1; k < len(t); k++ {
		if (t[k].V > t[k-1].V) != up {
			errs.Add(t[k].Pos, ErrOrder, "voltage %g V breaks the table's order (rising or falling throughout)", t[k].V)
			return
		}
	}
	if !up {
		for i, j := 0, len(t)-1; i < j; i, j = i+1, j-1 {
			t[i], t[j] = t[j], t[i]
		}
	}
}

// Model returns the model of that name (case-insensitive), nil if none.
func (ib *IBIS) Model(name string) *IBISModel {
	for _, m := range ib.Models {
		if strings.EqualFold(m.Name, name) {
			return m
		}
	}
	return nil
}

// Pin returns the [Pin] row of that pin name, nil if none.
func (ib *IBIS) Pin(name string) *IBISPin {
	for k := range ib.Pins {
		if strings.EqualFold(ib.Pins[k].Name, name) {
			return &ib.Pins[k]
		}
	}
	return nil
}

// PinModel is an input as a table model needs it, at one corner.
type PinModel struct {
	Model  string
	Pin    string // the [Pin] row used for the package, "" for [Package]'s values
	Corner int
	// Package: the pin (board side) –Rpkg–Lpkg– die; Cpkg from the pin to
	// the reference.
	Rpkg, Lpkg, Cpkg float64
	CComp            float64 // die to reference, F
	// GND clamp: current into the pad against u = v(pad) − v(GND clamp
	// reference), rising u.
	GNDV, GNDI []float64
	// POWER clamp: current into the pad against u = v(pad) − v(POWER clamp
	// reference), rising u (the table's voltage, reference minus pad,
	// turned round).
	PowerV, PowerI []float64
	// PowerRef and GNDRef are the references' voltages above the
	// component's ground, V ([POWER Clamp Reference] or [Voltage Range];
	// [GND Clamp Reference] or 0).
	PowerRef, GNDRef float64
	GNDPos, PowerPos Pos   // where the tables start
	GNDRows          []Pos // where each row of GNDV is
	PowerRows        []Pos // where each row of PowerV is
}

// PinModel returns the input named by name — a [Pin] row's pin name, or a
// [Model] name — at corner (Typ, Min or Max). A pin name brings that pin's
// R_pin, L_pin, C_pin (or [Package]'s when the row has none); a model name
// brings [Package]'s. Missing package values count as zero.
func (ib *IBIS) PinModel(name string, corner int) (*PinModel, error) {
	var pin *IBISPin
	m := ib.Model(name)
	if m == nil {
		if pin = ib.Pin(name); pin != nil {
			m = ib.Model(pin.Model)
			if m == nil {
				return nil, textpos.New(pin.Pos, ErrMissing, "pin %s uses model %s, which the file does not define", pin.Name, pin.Model)
			}
		}
	}
	if m == nil {
		var names []string
		for _, mm := range ib.Models {
			names = append(names, mm.Name)
		}
		return nil, textpos.New(Pos{}, ErrMissing, "no model or pin %q (models: %s)", name, strings.Join(names, ", "))
	}
	if len(m.GNDClamp) == 0 && len(m.PowerClamp) == 0 {
		return nil, textpos.New(m.Pos, ErrMissing, "model %s has neither a [GND Clamp] nor a [POWER Clamp] table", m.Name)
	}
	pm := &PinModel{Model: m.Name, Corner: corner}
	zero := func(v float64) float64 {
		if math.IsNaN(v) {
			return 0
		}
		return v
	}
	pm.Rpkg, pm.Lpkg, pm.Cpkg = zero(ib.Package[0].At(corner)), zero(ib.Package[1].At(corner)), zero(ib.Package[2].At(corner))
	if pin != nil {
		pm.Pin = pin.Name
		if !math.IsNaN(pin.R) {
			pm.Rpkg, pm.Lpkg, pm.Cpkg = pin.R, pin.L, pin.C
		}
	}
	pm.CComp = zero(m.CComp.At(corner))
	pm.PowerRef = m.PowerRef.At(corner)
	if math.IsNaN(pm.PowerRef) {
		pm.PowerRef = m.VoltageRange.At(corner)
	}
	pm.GNDRef = zero(m.GNDRef.At(corner))
	if len(m.PowerClamp) > 0 && math.IsNaN(pm.PowerRef) {
		return nil, textpos.New(m.Pos, ErrMissing, "model %s has a [POWER Clamp] table but no [Voltage Range] or [POWER Clamp Reference]", m.Name)
	}
	for _, r := range m.GNDClamp {
		pm.GNDV = append(pm.GNDV, r.V)
		pm.GNDI = append(pm.GNDI, r.I.At(corner))
		pm.GNDRows = append(pm.GNDRows, r.Pos)
	}
	for k := len(m.PowerClamp) - 1; k >= 0; k-- {
		r := m.PowerClamp[k]
		pm.PowerV = append(pm.PowerV, -r.V)
		pm.PowerI = append(pm.PowerI, r.I.At(corner))
		pm.PowerRows = append(pm.PowerRows, r.Pos)
	}
	if len(m.GNDClamp) > 0 {
		pm.GNDPos = m.GNDClamp[0].Pos
	}
	if len(m.PowerClamp) > 0 {
		pm.PowerPos = m.PowerClamp[0].Pos
	}
	return pm, nil
}

// ibisKeyword reads a keyword line as keyword does; IBIS also writes a
// keyword's spaces as underscores ([GND_Clamp]).
func ibisKeyword(s string) (string, field) {
	kw, rest := keyword(s)
	return strings.Join(strings.Fields(strings.ReplaceAll(kw, "_", " ")), " "), rest
}

// ibisCorners reads typ [min max] (NA allowed for min and max).
func ibisCorners(ws []field, at func(field) Pos, key Pos, errs *ErrorList) Corners {
	c := nanCorners()
	if len(ws) == 0 {
		errs.Add(key, ErrMissing, "a value needs its typ column")
		return c
	}
	for k, f := range ws {
		if k > 2 {
			errs.Add(at(f), ErrSyntax, "unexpected %q: a value has typ, min and max columns", f.text)
			break
		}
		v, msg := ibisNumber(f.text)
		if msg != "" {
			errs.Add(at(f), ErrNumber, "%s", msg)
			continue
		}
		c[k] = v
	}
	return c
}

// ibisNumber reads an IBIS number: NaN for NA. IBIS scales a number by the
// letter right after it, one of T G M k m u n p f: the ASCII SI prefixes,
// so spec.Prefixes read one byte at a time (µ is two and not taken). What
// follows, a unit such as the F of 2.6pF, is ignored.
func ibisNumber(s string) (float64, string) {
	if strings.EqualFold(s, "NA") {
		return math.NaN(), ""
	}
	d, msg := spec.ScanDecimal(s)
	if msg != "" {
		return 0, msg
	}
	shift := 0
	if d.Rest != "" {
		shift = spec.Prefixes[d.Rest[:1]] // 0 for a letter that is no prefix
	}
	return d.Value(shift)
}

func nanCorners() Corners { return Corners{math.NaN(), math.NaN(), math.NaN()} }
