// Package netlist reads protection-network decks (files ending .zap) and turns
// them into a checked Circuit and a study Plan. It does no numerics: every
// parameter leaves here as a plain SI float64 with the defaults of the device
// models filled in, and every problem found carries its file:line:col.
package netlist

import "fmt"

// Pos is a position in a deck. Line and Col count from 1; Col counts runes.
type Pos struct {
	File string
	Line int
	Col  int
}

// IsValid reports whether the position was set.
func (p Pos) IsValid() bool { return p.Line > 0 }

// String renders file:line:col, dropping the parts that are unknown.
func (p Pos) String() string {
	switch {
	case !p.IsValid() && p.File == "":
		return "-"
	case !p.IsValid():
		return p.File
	case p.File == "":
		return fmt.Sprintf("%d:%d", p.Line, p.Col)
	}
	return fmt.Sprintf("%s:%d:%d", p.File, p.Line, p.Col)
}

// Kind is the kind of an element statement.
type Kind string

// The element kinds of the deck language.
const (
	Resistor  Kind = "resistor"
	Capacitor Kind = "capacitor"
	Inductor  Kind = "inductor"
	Bead      Kind = "bead"
	Clamp     Kind = "clamp"
	Diode     Kind = "diode"
	Pin       Kind = "pin"
	Supply    Kind = "supply"
	Line      Kind = "line"
	Strike    Kind = "strike"
)

// Ground is the name of the reference node. A deck never declares it.
const Ground = "gnd"

// Element is one checked element statement.
//
// Num holds every numeric parameter in SI units after the part and the
// element's own overrides are merged and the defaults of MODELS.md filled in.
// The positional value is stored under "value". A key is absent only when the
// parameter is optional and has no default (a bead's isat, a pin's vbr).
// Str holds word parameters: "polarity" (clamp: uni|bi; strike: pos|neg|both),
// "rail" (pin), "waveform" and "file" (strike; file resolved against the deck's
// folder), "part" (the part used, if any).
type Element struct {
	Kind   Kind
	Name   string
	Nodes  [2]string
	Num    map[string]float64
	Str    map[string]string
	Levels []float64 // strike only: the levels to run, in the waveform's unit
	Pos    Pos
}

// Has reports whether the numeric parameter key is present.
func (e *Element) Has(key string) bool {
	_, ok := e.Num[key]
	return ok
}

// Get returns the numeric parameter key, or 0 when it is absent.
func (e *Element) Get(key string) float64 { return e.Num[key] }

// GetOr returns the numeric parameter key, or def when it is absent.
func (e *Element) GetOr(key string, def float64) float64 {
	if v, ok := e.Num[key]; ok {
		return v
	}
	return def
}

// Watch asks for a node to be reported, with optional limits for a verdict.
type Watch struct {
	Node           string
	Max, Min       float64
	HasMax, HasMin bool
	Pos            Pos
}

// Window is the simulated span and its accuracy. A zero field means "choose
// the default" (the span from the waveform and the circuit).
type Window struct {
	Stop    float64 // s
	MaxStep float64 // s
	RelTol  float64
	AbsTol  float64 // V
	Pos     Pos
}

// Vary is one what-if line: each value is kept as written in the deck (a
// number with its prefix and unit, or a part name when Param is "part").
type Vary struct {
	Element string
	Param   string
	Values  []string
	Pos     Pos
}

// Tolerance is a manufacturing spread for statistical runs. Percent is the
// half-width for a uniform distribution and three standard deviations for a
// normal one.
type Tolerance struct {
	Element string
	Param   string
	Percent float64
	Dist    string // "uniform" or "normal"
	Pos     Pos
}

// Part is a named parameter set for elements of one kind.
type Part struct {
	Name string
	Kind Kind
	Num  map[string]float64
	Str  map[string]string
	Pos  Pos
}

// Setting changes one parameter of one element; Value is deck text ("100n",
// "4.7uF", or a part name when Param is "part").
type Setting struct {
	Element string
	Param   string
	Value   string
}

// String renders ELEMENT.PARAM=VALUE.
func (s Setting) String() string { return s.Element + "." + s.Param + "=" + s.Value }

// Variant is one combination of vary settings; the empty variant is the deck
// as written.
type Variant []Setting

// Plan is the study a deck describes: every level × polarity × variant.
type Plan struct {
	Waveform   string
	Levels     []float64 // in the waveform's unit (V for discharges)
	Polarities []string  // "pos" and/or "neg", in that order
	Variants   []Variant // at least one (the empty variant)
}

// Runs is the number of transient solutions the plan means.
func (p Plan) Runs() int { return len(p.Levels) * len(p.Polarities) * len(p.Variants) }

// Circuit is a checked deck: elements in deck order (the strike included),
// the nodes they connect, and the study statements.
type Circuit struct {
	File       string // path of the top-level deck as given
	Title      string
	Source     []byte     // text of the top-level deck, for listings
	Elements   []*Element // in deck order, includes first in place
	Nodes      []string   // every node but gnd, in order of first appearance
	Watches    []Watch
	Window     Window
	Vary       []Vary
	Tolerances []Tolerance
	Parts      map[string]*Part
	Warnings   ErrorList // legal but doubtful things: shown, never fatal

	// own keeps, per element name, the parameters the element states
	// itself, so that With can merge them again over a swapped part. It is
	// never modified after Parse and is shared between copies.
	own map[string]*ownParams
}

// Element returns the element called name, or nil.
func (c *Circuit) Element(name string) *Element {
	for _, e := range c.Elements {
		if e.Name == name {
			return e
		}
	}
	return nil
}

// Strike returns the deck's strike element, or nil.
func (c *Circuit) Strike() *Element {
	for _, e := range c.Elements {
		if e.Kind == Strike {
			return e
		}
	}
	return nil
}
