package datafile

import (
	"math"
	"path/filepath"
	"strings"
	"unicode/utf8"

	"zapnet/devices/spec"
)

// Datasheet is what a datasheet-points file says about a protection part:
// the published points a fit reproduces and the few facts it passes on.
//
// The format is zapnet's own. One statement a line, '#' starts a comment:
//
//	KEY VALUE [@ CONDITION] [PULSE]
//
// VALUE and CONDITION are numbers with an optional SI prefix and unit, as
// in a deck (6.8V, 1mA, 45p, 0.4nH); the '@' may touch its neighbours
// (6.8V@1mA). PULSE names how a clamping point was measured: 8/20 (the
// IEC 61000-4-5 8/20 µs current), 10/1000 (the 10/1000 µs current) or tlp
// (a 100 ns transmission-line pulse, the voltage and current averaged over
// its flat top). The keys:
//
//	name      WORD          the part's name in the part line (default: the file's base name)
//	model     clamp|snapback which model to fit (default clamp)
//	polarity  uni|bi        uni (default): the other polarity conducts forward; bi: symmetric
//	vrwm      V             stand-off voltage (reported against the fitted leakage)
//	ir        A [@ V]       leakage current at a voltage (vrwm when @ is left out)
//	vbr       V @ A         breakdown voltage at its test current
//	vc        V @ A PULSE   clamping voltage at a peak current, measured with PULSE (repeatable)
//	c         F [@ V]       capacitance at a bias (0 V when @ is left out; repeatable)
//	ipp       A [PULSE]     peak pulse current rating (8/20 when no pulse is named)
//	ls        H             lead inductance, copied into the part (no static data can fit it)
//	vt1       V @ A         snapback trigger point
//	vh        V [@ A]       snapback holding point (voltage, and current if given)
//	ron       Ω             snapback on-resistance above holding (the TLP slope)
//	it2       A             TLP failure current (second breakdown)
//
// Every key but vc and c is given at most once.
type Datasheet struct {
	Name     string
	Model    string // "clamp" or "snapback"
	Polarity string // "uni" or "bi"
	Points   []Spec
	NamePos  Pos
}

// Spec is one numeric statement of a datasheet-points file.
type Spec struct {
	Key   string  // vrwm, ir, vbr, vc, c, ipp, ls, vt1, vh, ron, it2
	Value float64 // SI, in the key's unit
	At    float64 // the condition, SI; NaN when none was given
	Pulse string  // "8/20", "10/1000", "tlp" or ""
	Pos   Pos
}

// HasAt reports whether the statement gave a condition.
func (s Spec) HasAt() bool { return s.At == s.At }

// Get returns the statements of key, in file order.
func (d *Datasheet) Get(key string) []Spec {
	var out []Spec
	for _, p := range d.Points {
		if p.Key == key {
			out = append(out, p)
		}
	}
	return out
}

// One returns the only statement of key and whether there is one.
func (d *Datasheet) One(key string) (Spec, bool) {
	s := d.Get(key)
	if len(s) == 0 {
		return Spec{}, false
	}
	return s[0], true
}

// dsKey says what a key takes.
type dsKey struct {
	unit    string // the value's unit
	atUnit  string // the condition's unit, "" when the key takes none
	atNeed  bool   // the condition is required
	pulse   int    // 0: no pulse; 1: optional; 2: required
	repeats bool
}

var dsKeys = map[string]dsKey{
	"vrwm": {unit: "V"},
	"ir":   {unit: "A", atUnit: "V"},
	"vbr":  {unit: "V", atUnit: "A", atNeed: true},
	"vc":   {unit: "V", atUnit: "A", atNeed: true, pulse: 2, repeats: true},
	"c":    {unit: "F", atUnit: "V", repeats: true},
	"ipp":  {unit: "A", pulse: 1},
	"ls":   {unit: "H"},
	"vt1":  {unit: "V", atUnit: "A", atNeed: true},
	"vh":   {unit: "V", atUnit: "A"},
	"ron":  {unit: "Ω"},
	"it2":  {unit: "A"},
}

// Pulses are the pulse names a datasheet point may carry.
var Pulses = []string{"8/20", "10/1000", "tlp"}

// ReadDatasheet reads a datasheet-points file (see Datasheet).
func ReadDatasheet(name string, src []byte) (*Datasheet, error) {
	var errs ErrorList
	d := &Datasheet{Model: "clamp", Polarity: "uni"}
	base := filepath.Base(name)
	d.Name = strings.TrimSuffix(base, filepath.Ext(base))
	seen := map[string]Pos{}
	for _, ln := range lines(src, '#') {
		ws := dsWords(ln.text)
		if len(ws) == 0 {
			continue
		}
		at := func(f field) Pos { return Pos{File: name, Line: ln.no, Col: f.col} }
		key := strings.ToLower(ws[0].text)
		if prev, ok := seen[key]; ok && !(dsKeys[key].repeats) {
			errs.Add(at(ws[0]), ErrSyntax, "%s given twice (first at line %d)", key, prev.Line)
			continue
		}
		seen[key] = at(ws[0])
		switch key {
		case "name", "model", "polarity":
			d.word(key, ws, at, &errs)
			continue
		}
		k, ok := dsKeys[key]
		if !ok {
			errs.Add(at(ws[0]), ErrSyntax, "unknown key %q (keys: name model polarity vrwm ir vbr vc c ipp ls vt1 vh ron it2)", ws[0].text)
			continue
		}
		if s, ok := dsStatement(key, k, ws, at, &errs); ok {
			d.Points = append(d.Points, s)
		}
	}
	if len(d.Points) == 0 && len(errs) == 0 {
		errs.Add(Pos{File: name}, ErrMissing, "no datasheet points")
	}
	errs.RemoveMultiples()
	if err := errs.Err(); err != nil {
		return nil, err
	}
	return d, nil
}

// word reads a statement of one word: the part's name, the model or the
// polarity.
func (d *Datasheet) word(key string, ws []field, at func(field) Pos, errs *ErrorList) {
	if len(ws) != 2 {
		errs.Add(at(ws[0]), ErrSyntax, "%s takes one word", key)
		return
	}
	w := ws[1].text
	switch key {
	case "name":
		d.Name, d.NamePos = w, at(ws[1])
	case "model":
		if w != "clamp" && w != "snapback" {
			errs.Add(at(ws[1]), ErrSyntax, "model is clamp or snapback, not %q", w)
		}
		d.Model = w
	case "polarity":
		if w != "uni" && w != "bi" {
			errs.Add(at(ws[1]), ErrSyntax, "polarity is uni or bi, not %q", w)
		}
		d.Polarity = w
	}
}

// dsStatement reads a numeric statement, KEY VALUE [@ CONDITION] [PULSE],
// of a key that takes what k says; false when it has a problem.
func dsStatement(key string, k dsKey, ws []field, at func(field) Pos, errs *ErrorList) (Spec, bool) {
	if len(ws) < 2 {
		errs.Add(at(ws[0]), ErrMissing, "%s needs a value in %s", key, spec.Unit(k.unit).Word())
		return Spec{}, false
	}
	s := Spec{Key: key, At: nan(), Pos: at(ws[0])}
	v, msg := quantity(ws[1].text, k.unit)
	if msg != "" {
		errs.Add(at(ws[1]), ErrNumber, "%s", msg)
		return Spec{}, false
	}
	s.Value = v
	rest := ws[2:]
	if len(rest) > 0 && rest[0].text == "@" {
		if k.atUnit == "" {
			errs.Add(at(rest[0]), ErrSyntax, "%s takes no condition", key)
			return Spec{}, false
		}
		if len(rest) < 2 {
			errs.Add(at(rest[0]), ErrMissing, "'@' needs a condition in %s after it", spec.Unit(k.atUnit).Word())
			return Spec{}, false
		}
		c, msg := quantity(rest[1].text, k.atUnit)
		if msg != "" {
			errs.Add(at(rest[1]), ErrNumber, "%s", msg)
			return Spec{}, false
		}
		s.At = c
		rest = rest[2:]
	} else if k.atNeed {
		errs.Add(at(ws[0]), ErrMissing, "%s needs its condition: %s VALUE @ %s", key, key, spec.Unit(k.atUnit).Word())
		return Spec{}, false
	}
	if len(rest) > 0 {
		p := strings.ToLower(rest[0].text)
		switch {
		case k.pulse == 0:
			errs.Add(at(rest[0]), ErrSyntax, "unexpected %q: %s takes no pulse", rest[0].text, key)
			return Spec{}, false
		case p != "8/20" && p != "10/1000" && p != "tlp":
			errs.Add(at(rest[0]), ErrSyntax, "unknown pulse %q (8/20, 10/1000 or tlp)", rest[0].text)
			return Spec{}, false
		}
		s.Pulse = p
		rest = rest[1:]
	} else if k.pulse == 2 {
		errs.Add(at(ws[0]), ErrMissing, "%s needs the pulse it was measured with: 8/20, 10/1000 or tlp", key)
		return Spec{}, false
	}
	if len(rest) > 0 {
		errs.Add(at(rest[0]), ErrSyntax, "unexpected %q after the statement", rest[0].text)
		return Spec{}, false
	}
	if key == "ipp" && s.Pulse == "" {
		s.Pulse = "8/20"
	}
	if msg := dsRange(s); msg != "" {
		errs.Add(at(ws[1]), ErrRange, "%s", msg)
		return Spec{}, false
	}
	return s, true
}

// dsRange checks what a value can mean.
func dsRange(s Spec) string {
	switch s.Key {
	case "c", "ls":
		if s.Value < 0 {
			return s.Key + " must be >= 0"
		}
	default:
		if !(s.Value > 0) {
			return s.Key + " must be > 0 (give magnitudes; polarity says which way the part conducts)"
		}
	}
	if s.HasAt() && s.Key != "c" && !(s.At > 0) {
		return "the condition must be > 0"
	}
	return ""
}

// dsWords splits a statement into its words at white space and around
// every '@', which may touch its neighbours (6.8V@1mA).
func dsWords(s string) []field {
	var out []field
	for _, w := range words(s) {
		for {
			before, after, found := strings.Cut(w.text, "@")
			if before != "" {
				out = append(out, field{before, w.col})
			}
			if !found {
				break
			}
			at := w.col + utf8.RuneCountInString(before)
			out = append(out, field{"@", at})
			w = field{after, at + 1}
		}
	}
	return out
}

func nan() float64 { return math.NaN() }
