// Package signal is the signal's side of a protection network: what the
// protection does to the line it protects. It linearises a deck at its DC
// operating point (strike off, supplies on) with mna's small-signal engine
// and reports, over a log frequency sweep:
//
//   - the transfer v(node)/v(strike node) to every watched node and
//     protected pin, as gain (dB) and phase: the strike's node is driven by
//     an ideal source, so the transfer is what the network does to a
//     signal or to noise arriving there;
//   - the impedance the strike's node sees into the network, and each bead
//     and capacitor's own impedance;
//   - the largest peaking of each transfer above its gain at the sweep's
//     lowest frequency, with its frequency and Q, against a limit (3 dB by
//     default), and for a peaking over its limit the series resistance or
//     capacitor esr that brings it under, found by solving again (bisection
//     on the value), not by a rule of thumb;
//   - the capacitance each watched node and protected pin sees at 1 MHz
//     (the frequency datasheets quote junction capacitance at [practice]),
//     element by element, against an optional limit;
//   - with two ports, the two-port's S-parameters.
//
// The package knows no report format; its result types carry the JSON names
// of the design notes (OUTPUT.md: nodes.NODE.{freq, gain_db, phase_deg},
// peaking[]).
package signal

import (
	"zapnet/mna"
	"zapnet/mna/study"
	"zapnet/waveforms"
)

// Document is the JSON of `zapnet ac` (OUTPUT.md): the tool and the deck,
// then the result's own fields.
type Document struct {
	study.Meta
	*Result
}

// Defaults of Options.
const (
	DefaultFrom      = 10e3 // Hz
	DefaultTo        = 6e9  // Hz
	DefaultPerDecade = 20
	// DefaultPeakingDB is the peaking above which a transfer is flagged, dB:
	// 3 dB is where a resonance starts to amplify noticeably [practice].
	DefaultPeakingDB = 3
	// DefaultLoadingFreq is where node capacitances are evaluated, Hz:
	// junction capacitances are commonly specified at 1 MHz [practice].
	DefaultLoadingFreq = 1e6
)

// Options tune an analysis. A nil *Options means every default; a zero
// field means that field's default.
type Options struct {
	From, To    float64 // sweep ends, Hz; zero: DefaultFrom, DefaultTo
	PerDecade   int     // points a decade; zero: DefaultPerDecade
	LoadingFreq float64 // Hz; zero: DefaultLoadingFreq
	// NoDamping skips the search for damping values (it solves the circuit
	// again a few dozen times per flagged transfer).
	NoDamping bool
	// StepLevel is the edge check's step, its open-circuit amplitude, V;
	// zero: DefaultStepLevel. StepRise is its linear ramp (0 → 100 %), s;
	// zero: waveforms.StepRise, an ideal edge beside any network.
	StepLevel, StepRise float64
	// Interface, when set, adds an interface's budgets: its capacitance
	// budget on what the protection and the layout add to every target
	// (the protected pins' own share left out), its rise-time budget on
	// what the network adds to the edge reaching every other port.
	Interface *Budget
	// Settings are the engine's for the operating point; nil: defaults.
	Settings *mna.Settings
}

// options are Options with the defaults filled in.
type options struct {
	Options
	RiseBudget, CBudget float64 // from Interface; zero: none
}

func (o *Options) withDefaults() options {
	var x options
	if o != nil {
		x.Options = *o
	}
	if x.From <= 0 {
		x.From = DefaultFrom
	}
	if x.To <= 0 {
		x.To = DefaultTo
	}
	if x.PerDecade <= 0 {
		x.PerDecade = DefaultPerDecade
	}
	if x.LoadingFreq <= 0 {
		x.LoadingFreq = DefaultLoadingFreq
	}
	if x.StepLevel == 0 {
		x.StepLevel = DefaultStepLevel
	}
	if x.StepRise <= 0 {
		x.StepRise = waveforms.StepRise
	}
	if x.Interface != nil {
		x.RiseBudget, x.CBudget = x.Interface.Rise, x.Interface.CMax
	}
	return x
}

// Target is a node whose transfer, peaking and loading are reported.
type Target struct {
	Name string   // the node's name (a pin's node for a pin)
	Pair mna.Pair // the voltage: the node against gnd, or a pin's node against its ref
	Pin  string   // the protected pin's element, when the target is a pin
	// PeakingDB is the peaking limit, dB; zero: DefaultPeakingDB.
	PeakingDB float64
	// CMax is the capacitance limit, F; zero: none.
	CMax float64
	// Rise is the limit on the 10–90 % rise of the edge check's step
	// reaching the target, s; zero: none.
	Rise float64
}

// Knob is a resistance that may damp a resonance: a capacitor's esr, a
// bead's rdc or an inductor's r, with its present value.
type Knob struct {
	Element, Param string
	Value          float64 // Ω
}

// Request is what to analyse: the drive, the targets and the rest. FromCircuit
// builds one from a deck.
type Request struct {
	Drive    mna.Pair   // the strike's node and reference
	Targets  []Target   // watched nodes and protected pins
	Ports    []mna.Port // terminations; two of them make the two-port
	Elements []string   // beads and capacitors whose own impedance is reported
	Knobs    []Knob     // candidates for damping
}

// Result is one analysis. Frequencies in Hz, gains in dB, phases in
// degrees, impedances in Ω, capacitances in F.
type Result struct {
	Drive     Drive                 `json:"drive"`
	Freq      []float64             `json:"freq"`
	Nodes     map[string]*Transfer  `json:"nodes"`
	Impedance *Impedance            `json:"impedance"`
	Elements  map[string]*Impedance `json:"elements"`
	Peaking   []Peaking             `json:"peaking"`
	Loading   []Loading             `json:"loading"`
	TwoPort   *TwoPort              `json:"two_port,omitempty"`
	Edges     []Edge                `json:"edges"`
	// Order lists the targets in request order, ElementOrder the
	// elements (maps have none).
	Order        []string `json:"-"`
	ElementOrder []string `json:"-"`
}

// Exceeded reports whether any limit was exceeded: a peaking, a
// capacitance or an edge's rise.
func (r *Result) Exceeded() bool {
	for _, p := range r.Peaking {
		if p.Exceeds {
			return true
		}
	}
	for _, l := range r.Loading {
		if l.Exceeds {
			return true
		}
	}
	for _, e := range r.Edges {
		if e.Exceeds {
			return true
		}
	}
	return false
}

// Edge is the edge check: a step from one port through the network to
// another, solved in the transient engine (nonlinear junction charge
// included), and its 10–90 % rise at the far port.
type Edge struct {
	From  string  `json:"from"`  // the driven port
	To    string  `json:"to"`    // the port whose node is measured
	Node  string  `json:"node"`  // that port's node
	Level float64 `json:"level"` // the step's open-circuit amplitude, V
	Step  float64 `json:"step"`  // the step's own 10–90 % rise, s
	// Rise is the 10–90 % rise at the far port, between its operating
	// point and its final value, s.
	Rise float64 `json:"rise"`
	// Added is what the network adds to the step's own rise,
	// √(Rise² − Step²) [practice: rise times of cascaded stages add
	// roughly as the root of the sum of squares], s.
	Added float64 `json:"added"`
	// Delay is from the step's 50 % to the far port's 50 %, s.
	Delay   float64 `json:"delay"`
	Limit   float64 `json:"limit,omitempty"`  // rise=, on Rise, s; zero: none
	Budget  float64 `json:"budget,omitempty"` // an interface's, on Added, s
	Exceeds bool    `json:"exceeds"`
	// Note says why a value is missing or doubtful ("no edge arrives").
	Note string `json:"note,omitempty"`
}

// Drive is where the small-signal source sits and its operating point.
type Drive struct {
	Node string  `json:"node"`
	Ref  string  `json:"ref"`
	Bias float64 `json:"bias"` // v(node) − v(ref) at the operating point, V
}

// Transfer is v(node)/v(drive) over the sweep.
type Transfer struct {
	Freq     []float64    `json:"freq"`
	GainDB   []float64    `json:"gain_db"`
	PhaseDeg []float64    `json:"phase_deg"`
	Bias     float64      `json:"bias"` // the node's operating point, V
	H        []complex128 `json:"-"`
}

// Impedance is a complex impedance over the sweep.
type Impedance struct {
	Freq     []float64    `json:"freq"`
	MagOhm   []float64    `json:"mag_ohm"`
	PhaseDeg []float64    `json:"phase_deg"`
	Z        []complex128 `json:"-"`
}

// Peaking is the largest rise of one transfer above its low-frequency gain.
type Peaking struct {
	Node string `json:"node"`
	// GainDB is the rise above the gain at the sweep's lowest frequency.
	GainDB     float64 `json:"gain_db"`
	PeakGainDB float64 `json:"peak_gain_db"` // the transfer's gain at the peak
	Freq       float64 `json:"freq"`
	Q          float64 `json:"q"`
	LimitDB    float64 `json:"limit_db"`
	Exceeds    bool    `json:"exceeds"`
	// AtEnd: the largest gain is at the top of the sweep, and may rise
	// further above it.
	AtEnd bool `json:"at_end,omitempty"`
	// Damping lists, for a peaking over its limit, each resistance that
	// alone brings it under, with the smallest value that does.
	Damping []Damping `json:"damping,omitempty"`
}

// Damping is one way to bring a peaking under its limit.
type Damping struct {
	Element string  `json:"element"`
	Param   string  `json:"param"`
	From    float64 `json:"from"`    // present value, Ω
	Value   float64 `json:"value"`   // the smallest value that brings it under, Ω
	GainDB  float64 `json:"gain_db"` // the peaking with that value
}

// Loading is the capacitance one target sees at the loading frequency.
type Loading struct {
	Node        string  `json:"node"`
	Freq        float64 `json:"freq"`
	Capacitance float64 `json:"capacitance"`
	// Added is what the protection and the layout add: the capacitance
	// less the shares of the protected pins.
	Added    float64      `json:"added"`
	Limit    float64      `json:"limit,omitempty"`  // cmax, on Capacitance
	Budget   float64      `json:"budget,omitempty"` // an interface's, on Added
	Exceeds  bool         `json:"exceeds"`
	Elements []ElementCap `json:"elements"`
}

// ElementCap is one element's share of a node's capacitance.
type ElementCap struct {
	Element     string  `json:"element"`
	Capacitance float64 `json:"capacitance"`
}

// TwoPort is the S-parameters between the request's two ports.
type TwoPort struct {
	Ports [2]string  `json:"ports"`
	Z0    [2]float64 `json:"z0"`
	Freq  []float64  `json:"freq"`
	// Magnitudes in dB and phases in degrees of S11, S21, S12, S22; the
	// return loss is −S11DB, the insertion loss −S21DB.
	S11DB  []float64          `json:"s11_db"`
	S11Deg []float64          `json:"s11_deg"`
	S21DB  []float64          `json:"s21_db"`
	S21Deg []float64          `json:"s21_deg"`
	S12DB  []float64          `json:"s12_db"`
	S12Deg []float64          `json:"s12_deg"`
	S22DB  []float64          `json:"s22_db"`
	S22Deg []float64          `json:"s22_deg"`
	S      [][2][2]complex128 `json:"-"`
}
