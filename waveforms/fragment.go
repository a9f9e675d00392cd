package waveforms

import (
	"errors"
	"fmt"
	"math"
	"strings"
)

// Generator networks as circuit fragments.
//
// A real test generator is a circuit, not a current: a charged capacitor
// behind its resistor, the parasitic paths of its tip and cable, a relay or
// a spark that closes at t = 0, and for surges and fast transients the
// coupling network between the generator and the line. A Fragment lists such
// a circuit's parts between internal nodes of its own and the strike's two
// terminals (Out, the struck node, and Ref). The strike device stamps any
// fragment the same way; nothing in it knows which standard a fragment
// comes from.
//
// The state before t = 0 (the operating point): a node marked Held belongs
// to the charged side of a switch and is held at V0 (times the polarity's
// sign) relative to Ref, and the parts between held nodes (or a held node
// and Ref) carry no current then, so each capacitor there starts with the
// charge of its held voltages. Every other part takes part in the operating
// point like any element of the circuit: a coupling capacitor charges to the
// line's DC voltage, a generator's output resistor loads the line. Switches
// are open at the operating point and closed from t = 0 on.

// Out and Ref are the strike's terminals as node indices of a Part; internal
// nodes count from 0.
const (
	Out = -1 // the struck node
	Ref = -2 // the strike's reference node
)

// PartKind is what a Part of a fragment is.
type PartKind int

const (
	// PartResistor is Value ohms between A and B.
	PartResistor PartKind = iota
	// PartCapacitor is Value farads between A and B; its initial charge is
	// that of the operating point (held nodes: their V0).
	PartCapacitor
	// PartInductor is Value henries in series with R ohms, from A to B, with
	// its current as a branch unknown.
	PartInductor
	// PartSwitch is open at the operating point and closed from t = 0 on: a
	// series R–L branch from A to B (either may be zero), and with Spark a
	// spark gap in series whose resistance follows the spark law.
	PartSwitch
	// PartSource is an open-circuit voltage F(t) (A positive with respect
	// to B) behind Value ohms; F is 0 at the operating point.
	PartSource
)

var partKindNames = [...]string{"resistor", "capacitor", "inductor", "switch", "source"}

func (k PartKind) String() string {
	if k >= 0 && int(k) < len(partKindNames) {
		return partKindNames[k]
	}
	return "unknown part"
}

// Node is an internal node of a fragment.
type Node struct {
	Name string
	// Held: the node is on the charged side of a switch and sits at V0
	// volts relative to Ref before t = 0 (positive polarity; the strike
	// applies the sign).
	Held bool
	V0   float64
}

// Part is one element of a fragment.
type Part struct {
	Kind PartKind
	Name string // for messages and for the strike's unknowns: "Cs", "Rd", ...
	A, B int    // node indices: 0, 1, ... internal; Out or Ref
	// Value is the resistance (Ω) of a resistor or a source, the
	// capacitance (F) of a capacitor, the inductance (H) of an inductor.
	Value float64
	// R is the series resistance (Ω) of an inductor or a switch; L the
	// series inductance (H) of a switch.
	R, L float64
	// Spark makes a switch a spark gap; nil for a plain switch.
	Spark *Spark
	// F is a source's open-circuit voltage at time t, V; F(t) = 0 for t <= 0.
	F func(t float64) float64
}

// Fragment is a generator's circuit between the strike's node and ref.
type Fragment struct {
	Nodes []Node
	Parts []Part
}

// Spark is the resistance law of a spark gap after Rompe and Weizel (1944):
//
//	R(t) = d / √(2a·∫₀ᵗ i² dt)
//
// with d the gap length and a a constant of the gas, here in SI units
// (m²/(V²·s); air at atmospheric pressure about 1e-4, i.e.
// 1 cm²/(V²·s)) [mem: the law's form; the constant, see sparkA]. The law
// starts from an infinite resistance; the spark forms with a finite one,
// R0, which the law then continues: R = d/√(2a·∫i²dt + (d/R0)²).
//
// In the strike the spark is carried by its conductance G scaled by R0,
// g = G·R0 (1 when the spark forms, growing as it heats), with
// d(g²)/dt = (2a/d²)·R0²·i²: a state of its own that the engine integrates
// like a charge, so its integration rule and step control see it.
type Spark struct {
	Gap float64 // d, m
	A   float64 // the gas constant a, m²/(V²·s)
	R0  float64 // resistance when the spark forms, Ω
}

// Rate is (2a/d²)·R0², the growth of g² per A²·s of ∫i²dt.
func (s *Spark) Rate() float64 { return 2 * s.A / (s.Gap * s.Gap) * s.R0 * s.R0 }

// Resistance is the spark's resistance after ∫i²dt = w (A²·s).
func (s *Spark) Resistance(w float64) float64 {
	return s.Gap / math.Sqrt(2*s.A*w+(s.Gap/s.R0)*(s.Gap/s.R0))
}

// node names an index for messages.
func (f *Fragment) node(k int) string {
	switch k {
	case Out:
		return "the struck node"
	case Ref:
		return "the reference"
	}
	if k >= 0 && k < len(f.Nodes) {
		return "node " + f.Nodes[k].Name
	}
	return fmt.Sprintf("node %d", k)
}

// held reports whether node k is an internal node held before t = 0.
func (f *Fragment) held(k int) bool { return k >= 0 && f.Nodes[k].Held }

// Frozen reports whether part p carries no current before t = 0: a
// resistor, capacitor or inductor between held nodes, or between a held
// node and Ref. Switches are open then anyway.
func (f *Fragment) Frozen(p *Part) bool {
	if p.Kind == PartSwitch {
		return false
	}
	return (f.held(p.A) || p.A == Ref) && (f.held(p.B) || p.B == Ref) && (f.held(p.A) || f.held(p.B))
}

// Check reports what makes a fragment unusable: node indices out of range,
// values that are not positive and finite, a part that joins a held node to
// the rest of the circuit other than through a switch or a capacitor (it
// would discharge the generator before t = 0), or a source without F.
func (f *Fragment) Check() error {
	var errs []error
	n := len(f.Nodes)
	bad := func(k int) bool { return k != Out && k != Ref && (k < 0 || k >= n) }
	pos := func(v float64) bool { return v > 0 && !math.IsInf(v, 0) }
	nonNeg := func(v float64) bool { return v >= 0 && !math.IsInf(v, 0) }
	for i := range f.Parts {
		p := &f.Parts[i]
		if bad(p.A) || bad(p.B) {
			errs = append(errs, fmt.Errorf("%s %s: node index out of range", p.Kind, p.Name))
			continue
		}
		if p.A == p.B {
			errs = append(errs, fmt.Errorf("%s %s joins %s to itself", p.Kind, p.Name, f.node(p.A)))
		}
		switch p.Kind {
		case PartResistor, PartCapacitor, PartSource:
			if !pos(p.Value) {
				errs = append(errs, fmt.Errorf("%s %s: value %g must be positive", p.Kind, p.Name, p.Value))
			}
		case PartInductor:
			if !pos(p.Value) || !nonNeg(p.R) {
				errs = append(errs, fmt.Errorf("inductor %s: %g H must be positive and r %g Ω not negative", p.Name, p.Value, p.R))
			}
		case PartSwitch:
			if !nonNeg(p.R) || !nonNeg(p.L) {
				errs = append(errs, fmt.Errorf("switch %s: r %g Ω and l %g H must not be negative", p.Name, p.R, p.L))
			}
			if s := p.Spark; s != nil && (!pos(s.Gap) || !pos(s.A) || !pos(s.R0)) {
				errs = append(errs, fmt.Errorf("spark %s: gap %g m, constant %g m²/(V²·s) and initial resistance %g Ω must be positive", p.Name, s.Gap, s.A, s.R0))
			}
		default:
			errs = append(errs, fmt.Errorf("part %s: unknown kind %d", p.Name, p.Kind))
		}
		if p.Kind == PartSource && p.F == nil {
			errs = append(errs, fmt.Errorf("source %s has no voltage function", p.Name))
		}
		if p.Kind != PartSwitch && p.Kind != PartCapacitor && (f.held(p.A) || f.held(p.B)) && !f.Frozen(p) {
			errs = append(errs, fmt.Errorf("%s %s joins held %s to %s: only a switch or a capacitor may cross from the charged side", p.Kind, p.Name, f.node(p.A), f.node(p.B)))
		}
	}
	for _, nd := range f.Nodes {
		if math.IsNaN(nd.V0) || math.IsInf(nd.V0, 0) {
			errs = append(errs, fmt.Errorf("node %s: initial voltage %g", nd.Name, nd.V0))
		}
	}
	return errors.Join(errs...)
}

// SameShape reports whether g has f's topology: the same nodes (held or
// not) and the same parts in the same order between the same nodes, sparks
// in the same places. Values may differ. A strike compiled for one shape
// runs every fragment of that shape (the levels of a study).
func (f *Fragment) SameShape(g *Fragment) bool {
	if f == nil || g == nil {
		return f == g
	}
	if len(f.Nodes) != len(g.Nodes) || len(f.Parts) != len(g.Parts) {
		return false
	}
	for k := range f.Nodes {
		if f.Nodes[k].Held != g.Nodes[k].Held {
			return false
		}
	}
	for k := range f.Parts {
		a, b := &f.Parts[k], &g.Parts[k]
		if a.Kind != b.Kind || a.A != b.A || a.B != b.B || (a.Spark == nil) != (b.Spark == nil) {
			return false
		}
	}
	return true
}

// Energy is the energy stored in the fragment's held capacitors before
// t = 0, J (the charge voltage of a generator, ½·C·V² summed).
func (f *Fragment) Energy() float64 {
	e := 0.0
	v := func(k int) float64 {
		if k >= 0 {
			return f.Nodes[k].V0
		}
		return 0
	}
	for i := range f.Parts {
		p := &f.Parts[i]
		if p.Kind == PartCapacitor && f.Frozen(p) {
			u := v(p.A) - v(p.B)
			e += 0.5 * p.Value * u * u
		}
	}
	return e
}

// NetworkFragment is the charged-capacitor network of hbm and iso10605 as a
// fragment: C from x (held at v0) to Ref, and the switch with the network's
// R and L from x to the struck node. The strike stamps it exactly as it
// stamped the network before fragments existed (same unknowns, same states
// in the same order).
func NetworkFragment(v0, c, r, l float64) *Fragment {
	return &Fragment{
		Nodes: []Node{{Name: "x", Held: true, V0: v0}},
		Parts: []Part{
			{Kind: PartCapacitor, Name: "c", A: 0, B: Ref, Value: c},
			{Kind: PartSwitch, Name: "i", A: 0, B: Out, R: r, L: l},
		},
	}
}

// String lists the fragment's parts with their values and nodes, for
// reports: "cm 150 pF (m–ref), lm 1.83 µH + 330 Ω (m–t), ...".
func (f *Fragment) String() string {
	name := func(k int) string {
		switch k {
		case Out:
			return "out"
		case Ref:
			return "ref"
		}
		return f.Nodes[k].Name
	}
	var b strings.Builder
	for i := range f.Parts {
		p := &f.Parts[i]
		if i > 0 {
			b.WriteString(", ")
		}
		b.WriteString(p.Name + " ")
		switch p.Kind {
		case PartResistor:
			b.WriteString(FormatValue(p.Value, "Ω"))
		case PartCapacitor:
			b.WriteString(FormatValue(p.Value, "F"))
		case PartInductor:
			b.WriteString(FormatValue(p.Value, "H"))
			if p.R > 0 {
				b.WriteString(" + " + FormatValue(p.R, "Ω"))
			}
		case PartSwitch:
			b.WriteString("switch")
			if p.Spark != nil {
				b.WriteString(" (spark gap " + FormatValue(p.Spark.Gap, "m") + ")")
			}
			if p.R > 0 {
				b.WriteString(" + " + FormatValue(p.R, "Ω"))
			}
			if p.L > 0 {
				b.WriteString(" + " + FormatValue(p.L, "H"))
			}
		case PartSource:
			b.WriteString("source behind " + FormatValue(p.Value, "Ω"))
		}
		fmt.Fprintf(&b, " (%s–%s)", name(p.A), name(p.B))
	}
	return b.String()
}
