// Package netlist reads protection-network decks (files ending .zap) and turns
// them into a checked Circuit and a study Plan. It does no numerics: every
// parameter leaves here as a checked SI value of its kind's table (package
// devices describes every kind, package waveforms every stimulus) with the
// defaults filled in, and every problem found carries its file:line:col.
package netlist

import (
	"encoding/json"
	"fmt"
	"sort"
	"strings"

	"zapnet/devices"
	"zapnet/devices/spec"
	"zapnet/waveforms"
)

// Ground is the name of the reference node. A deck never declares it.
const Ground = "gnd"

// Element is one checked element statement.
//
// Values holds every parameter of the kind's table after the part and the
// element's own overrides are merged and the defaults of the models filled
// in; the positional value is the parameter "value". A parameter is absent
// only when it is optional and has no default (a bead's isat, a pin's vbr).
// A strike's Values are of its waveform's table (a file path resolved
// against the deck's folder).
type Element struct {
	Kind   *devices.Kind
	Name   string
	Nodes  [2]string
	Values spec.Values
	Part   string // the part used, "" for none
	Pos    Pos

	// The strike's own: its waveform, the levels to run (in the
	// waveform's unit) and its polarity word ("pos", "neg" or "both").
	Waveform *waveforms.Waveform
	Levels   []float64
	Polarity string
}

// IsStrike reports whether the element is the strike.
func (e *Element) IsStrike() bool { return e.Kind.Role == spec.Stimulus }

// Param describes the numeric parameter key of the element (of its
// waveform, for the strike), or nil.
func (e *Element) Param(key string) *spec.Param { return e.Values.Table().Param(key) }

// Unit is the unit of the element's parameter key ("" when dimensionless or
// unknown).
func (e *Element) Unit(key string) spec.Unit {
	if p := e.Param(key); p != nil {
		return p.Unit
	}
	return ""
}

// Watch asks for a node to be reported, with optional limits for a verdict.
// Peaking (dB), CMax (F) and Rise (s) are the signal side's limits, judged
// by the small-signal study and the edge check; zero means none.
type Watch struct {
	Node                string
	Max, Min            float64
	HasMax, HasMin      bool
	Peaking, CMax, Rise float64
	Pos                 Pos
}

// Window is the simulated span and its accuracy. A zero field means "choose
// the default" (the span from the waveform and the circuit).
type Window struct {
	Stop float64 // s
	// Accuracy is the relative accuracy wanted on every reported number,
	// a fraction (0.002 is 0.2 %); 0: the engine's default.
	Accuracy float64
	// Resolve is the finest time detail the run must show, s: no step is
	// longer; 0: none.
	Resolve float64
	Pos     Pos
}

// Vary is one what-if line: the settings of one parameter, each value
// checked and kept with its spelling in the deck.
type Vary struct {
	Element string
	Param   string
	Values  []Setting
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

// Part is a named parameter set for elements of one kind: the values it
// states, without defaults.
type Part struct {
	Name   string
	Kind   *devices.Kind
	Values spec.Values
	Pos    Pos
}

// Setting changes one parameter of one element. Text is the value as the
// user wrote it ("100n", "4.7uF", or a part or word when Param is "part" or
// a word parameter), kept for reports; Num is the checked number of a
// numeric parameter. Circuit.Setting makes one from text; a program may
// also fill Num itself (and a Text to show).
type Setting struct {
	Element string
	Param   string
	Text    string
	Num     float64
}

// Target is ELEMENT.PARAM.
func (s Setting) Target() string { return s.Element + "." + s.Param }

// String renders ELEMENT.PARAM=VALUE.
func (s Setting) String() string { return s.Target() + "=" + s.Text }

// Variant is one combination of vary settings; the empty variant is the deck
// as written.
type Variant []Setting

// Plan is the study a deck describes: every level × polarity × variant.
type Plan struct {
	Waveform   *waveforms.Waveform
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
	// Unknowns is how many unknowns the engine will solve for: every node
	// but gnd, and each device's internal nodes and branch currents;
	// bounded by devices.MaxUnknowns.
	Unknowns int
	// Included lists the absolute paths of every file the deck read,
	// itself first.
	Included []string

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
		if e.IsStrike() {
			return e
		}
	}
	return nil
}

// MarshalJSON writes the variant as OUTPUT.md's JSON does: an object of
// "ELEMENT.PARAM": "value as written", {} for the deck as written.
func (v Variant) MarshalJSON() ([]byte, error) {
	m := make(map[string]string, len(v))
	for _, s := range v {
		m[s.Target()] = s.Text
	}
	return json.Marshal(m)
}

// UnmarshalJSON reads that object back, settings in the order of their
// targets; each keeps its text (Num is not filled: the text is read against
// a circuit by Circuit.Setting).
func (v *Variant) UnmarshalJSON(b []byte) error {
	var m map[string]string
	if err := json.Unmarshal(b, &m); err != nil {
		return err
	}
	targets := make([]string, 0, len(m))
	for t := range m {
		targets = append(targets, t)
	}
	sort.Strings(targets)
	*v = (*v)[:0]
	for _, t := range targets {
		elem, param, ok := SplitTarget(t)
		if !ok {
			return fmt.Errorf("variant %q: want ELEMENT.PARAM", t)
		}
		*v = append(*v, Setting{Element: elem, Param: param, Text: m[t]})
	}
	return nil
}

// String renders a variant as "C1.value=1u D1.part=fast", or "deck" for the
// deck as written.
func (v Variant) String() string {
	if len(v) == 0 {
		return "deck"
	}
	s := make([]string, len(v))
	for i, st := range v {
		s[i] = st.String()
	}
	return strings.Join(s, " ")
}

// Rating returns the element's rating judged against measure m and its
// value; ok is false when its kind has no such rating or the element gives
// it no value.
func (e *Element) Rating(m spec.Measure) (p *spec.Param, v float64, ok bool) {
	for _, r := range e.Kind.Ratings() {
		if r.Rates.Measure == m {
			if v, ok := e.Values.Lookup(r.Key); ok {
				return &r, v, true
			}
		}
	}
	return nil, 0, false
}
