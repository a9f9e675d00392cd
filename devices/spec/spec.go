// Package spec is the vocabulary in which zapnet's device kinds and stimuli
// describe themselves: the units of their parameters, the rules a value must
// keep, defaults, which parameters are ratings and what measurement each
// rating is judged against, and the role an element plays in a protection
// network. It is a leaf: every package of zapnet may read it, it reads none
// of them.
//
// A kind (package devices) or a waveform (package waveforms) writes its Table
// once, beside its model; the deck checker, the study, the what-if analyses
// and the reports all read that table, so a new kind is one file.
package spec

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Unit is the SI symbol of a quantity; Dimensionless is a plain number.
type Unit string

// The units of the deck language.
const (
	Dimensionless Unit = ""
	Volt          Unit = "V"
	Ampere        Unit = "A"
	Farad         Unit = "F"
	Henry         Unit = "H"
	Ohm           Unit = "Ω"
	Second        Unit = "s"
	Hertz         Unit = "Hz"
	Watt          Unit = "W"
	Joule         Unit = "J"
)

// Word names the unit in a sentence: "volts", "a plain number".
func (u Unit) Word() string {
	switch u {
	case Volt:
		return "volts"
	case Ampere:
		return "amperes"
	case Farad:
		return "farads"
	case Henry:
		return "henries"
	case Ohm:
		return "ohms"
	case Second:
		return "seconds"
	case Hertz:
		return "hertz"
	case Watt:
		return "watts"
	case Joule:
		return "joules"
	case Dimensionless:
		return "a plain number"
	}
	return string(u)
}

// Rule says which values of a parameter are legal.
type Rule int

// The rules. Every rule also refuses values that are not finite or whose
// magnitude exceeds Largest.
const (
	Any         Rule = iota // any finite value
	Positive                // > 0
	NonNegative             // >= 0
	Fraction                // 0 <= x < 1
	Count                   // a whole number from 1 to MaxCount
)

// Largest bounds the magnitude of every value: beyond it no electrical
// quantity of a protection network has a meaning, and the arithmetic of the
// engine would lose every digit.
const Largest = 1e30

// DefaultAccuracy is the relative accuracy wanted on every reported number
// when a deck asks for none (the window's accuracy=): 0.2 %, the engine's
// default (mna.DefaultAccuracy).
const DefaultAccuracy = 0.002

// MaxCount bounds a Count (pulses in a burst).
const MaxCount = 1e6

// Check returns what is wrong with v under the rule, as the end of a sentence
// ("must be positive"), or "" when v is legal.
func (r Rule) Check(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "must be a finite number"
	}
	switch r {
	case Positive:
		if !(v > 0) {
			return "must be positive"
		}
	case NonNegative:
		if !(v >= 0) {
			return "must not be negative"
		}
	case Fraction:
		if !(v >= 0 && v < 1) {
			return "must be at least 0 and below 1"
		}
	case Count:
		if !(v >= 1) || v != math.Trunc(v) || v > MaxCount {
			return fmt.Sprintf("must be a whole number from 1 to %d", int(MaxCount))
		}
	}
	if math.Abs(v) > Largest {
		// Written as a deck would write it: 1e30.
		return "must be at most " + strings.Replace(strconv.FormatFloat(Largest, 'g', -1, 64), "e+", "e", 1) + " in magnitude"
	}
	return ""
}

// Class says what a numeric parameter is to the designer.
type Class int

const (
	// Design is a value the designer chooses or the layout sets: a part's
	// value, a clamp's breakdown voltage, a trace's inductance.
	Design Class = iota
	// Model is a constant of a model fitted to a part (saturation current,
	// emission coefficient, junction grading): not a design choice.
	Model
	// Rating is a limit a run is judged against; it moves the limit, not
	// the circuit.
	Rating
	// Condition is an operating condition of the product (a supply's
	// voltage), not a part of the protection network.
	Condition
)

// Measure is the measured quantity a rating is compared with.
type Measure int

const (
	// PeakCurrent is the largest |current| through the element.
	PeakCurrent Measure = iota + 1
	// Energy is the energy the element absorbed, ∫ v·i dt over its
	// terminals.
	Energy
	// PeakVoltage is the largest |v(a) − v(b)| across the element.
	PeakVoltage
	// HighVoltage is the highest v(a) − v(b); LowVoltage the lowest.
	HighVoltage
	LowVoltage
	// PeakPower is the largest |v(a) − v(b)|·|i| the element takes.
	PeakPower
	// StandOff is |v(a) − v(b)| at the operating point, before the
	// strike: the working voltage the part stands off.
	StandOff
)

// Rates describes a rating: the measurement it is compared with and on
// which side the measurement must stay.
type Rates struct {
	Measure Measure
	// Upper: the measurement must stay at or below the rating (ipp, vmax);
	// otherwise at or above it (vmin).
	Upper bool
	// Says names the measurement in a failure sentence: "peak current",
	// "residual peak".
	Says string
	// Probe, when set, names the device's probe (devices.Probe) the
	// measure reads instead of the element's terminals: the current in a
	// pin's internal paths, the voltage on a capacitor's dielectric.
	Probe string
}

// Unusual flags legal values that are probably slips.
type Unusual struct {
	// Above is the value beyond which a warning is printed; with
	// Inclusive, the value from which one is.
	Above     float64
	Inclusive bool
	// Format is the warning, with the element's name and the formatted
	// value as its two verbs: "capacitor %s is %s: unusually large ...".
	Format string
}

// Param describes one numeric parameter.
type Param struct {
	Key        string
	Unit       Unit
	Rule       Rule
	Default    float64
	HasDefault bool
	// Required: the element is unusable without it.
	Required bool
	// Unless names a word parameter that, given, stands in for a required
	// parameter (a clamp's table for its vbr).
	Unless string
	// OnlyWith names another parameter: the default is filled in only when
	// that one has a value (a pin's internal clamp), and the parameter has
	// no effect without it.
	OnlyWith string
	Class    Class
	// Rates is set for a rating (Class Rating).
	Rates *Rates
	// Unusual, when set, warns about values above a plausible bound.
	Unusual *Unusual
	// Scale marks a value that sets one of the circuit's natural time
	// scales (an inductance, a capacitance, a resistance that meets a
	// capacitance), which the default simulated span covers.
	Scale bool
	// Note says in a few words what the parameter is, where a message
	// needs it ("the internal clamp").
	Note string
}

// Required describes a parameter the element cannot do without.
func Required(key string, u Unit, r Rule) Param {
	return Param{Key: key, Unit: u, Rule: r, Required: true}
}

// Default describes a parameter with a default value.
func Default(key string, u Unit, r Rule, def float64) Param {
	return Param{Key: key, Unit: u, Rule: r, Default: def, HasDefault: true}
}

// Optional describes a parameter that may be absent and has no default.
func Optional(key string, u Unit, r Rule) Param {
	return Param{Key: key, Unit: u, Rule: r}
}

// Limit describes an optional rating judged against measure m; upper says
// the measurement must stay at or below it. says names the measurement in a
// failure sentence.
func Limit(key string, u Unit, r Rule, m Measure, upper bool, says string) Param {
	return Param{Key: key, Unit: u, Rule: r, Class: Rating, Rates: &Rates{Measure: m, Upper: upper, Says: says}}
}

// Of returns the rating p judged on the device's probe instead of its
// terminals.
func (p Param) Of(probe string) Param {
	r := *p.Rates
	r.Probe = probe
	p.Rates = &r
	return p
}

// UnlessWord returns a required p that the word key, when given, makes
// unnecessary.
func (p Param) UnlessWord(key string) Param { p.Unless = key; return p }

// As returns p of class c.
func (p Param) As(c Class) Param { p.Class = c; return p }

// Only returns p whose default applies only when key has a value.
func (p Param) Only(key string) Param { p.OnlyWith = key; return p }

// WarnAbove returns p with a plausibility warning above the bound.
func (p Param) WarnAbove(bound float64, format string) Param {
	p.Unusual = &Unusual{Above: bound, Format: format}
	return p
}

// WarnFrom returns p with a plausibility warning at and above the bound.
func (p Param) WarnFrom(bound float64, format string) Param {
	p.Unusual = &Unusual{Above: bound, Inclusive: true, Format: format}
	return p
}

// Unusually reports whether v is beyond the parameter's plausible bound.
func (p *Param) Unusually(v float64) bool {
	if p.Unusual == nil {
		return false
	}
	if p.Unusual.Inclusive {
		return v >= p.Unusual.Above
	}
	return v > p.Unusual.Above
}

// Scales returns p marked as one of the circuit's natural time scales.
func (p Param) Scales() Param { p.Scale = true; return p }

// Noted returns p with a note.
func (p Param) Noted(note string) Param { p.Note = note; return p }

// Word describes a word parameter: one of a few words, a node name or a
// file path.
type Word struct {
	Key string
	// Choices are the allowed words; nil for a node or a path.
	Choices []string
	// Default is the word used when none is given ("" for none).
	Default string
	// Node: the word names a node, which the element connects to (a pin's
	// rail). Path: the word is a file path, relative to the deck.
	Node, Path bool
	// Fixed: the word shapes the circuit and cannot be varied.
	Fixed bool
	// Caution, when set, is a sentence every run of an element that gives
	// the word reports, with the element's name as its verb ("%s: IBIS
	// carries no failure data ...").
	Caution string
}

// Role is the part an element plays in a protection network; reports and
// studies select elements by role, never by kind.
type Role int

const (
	// Passive conducts (a resistor).
	Passive Role = iota
	// Storage stores energy (a capacitor, an inductor, a bead).
	Storage
	// Protector diverts the strike (a clamp, a diode, a varistor).
	Protector
	// ProtectedPin is the IC input the network protects.
	ProtectedPin
	// Source keeps a rail up (a supply).
	Source
	// Stimulus is the discharge or surge itself.
	Stimulus
	// Carrier carries the signal (a transmission line).
	Carrier
	// Port is where a signal enters or leaves the protected line, with its
	// impedance: no part of a strike's circuit, only of the signal side's
	// small-signal study and edge check.
	Port
)
