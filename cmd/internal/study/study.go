package study

import (
	"zapnet/mna"
	"zapnet/netlist"
)

// Verdict is the outcome of one run.
type Verdict string

// The verdicts. Error marks a run whose solve failed (Run.Err says why).
const (
	Pass  Verdict = "PASS"
	Fail  Verdict = "FAIL"
	Error Verdict = "ERROR"
)

// Options choose what runs and how. A nil *Options means every default; a
// zero field means that field's default.
type Options struct {
	// Levels override the strike's levels, in the waveform's unit (V for
	// discharges). Nil: the deck's.
	Levels []float64
	// Polarities override the strike's polarities: "pos" and/or "neg".
	// Nil: the deck's.
	Polarities []string
	// Variants override the deck's vary product. Nil: the deck's (the
	// empty variant when the deck has no vary line).
	Variants []netlist.Variant
	// Workers bounds the goroutines solving runs. Zero: every core
	// (runtime.GOMAXPROCS).
	Workers int
	// Record keeps the sampled waveforms of each run in Run.Waves. False:
	// runs keep only their measurements.
	Record bool
	// Window overrides the deck's window statement field by field: a zero
	// field keeps the deck's value (and, when that is zero too, the
	// default: the span of DefaultStop, the engine's accuracy, MaxStep and
	// AbsTol). Pos is ignored.
	Window netlist.Window
	// Settings tunes the engine beyond the window (MinStep, Gmin, MaxIter,
	// ChargeTol). Nil: engine defaults. Stop, MaxStep, RelTol, AbsTol,
	// Record and Observe are set by the study and ignored here.
	Settings *mna.Settings
}

// Job is one run to solve: a variant, a level and a polarity.
type Job struct {
	// Index is the job's place in plan order (variant-major, then level,
	// then polarity), stable across shards.
	Index int
	// VariantIndex is the variant's place in the plan's variants.
	VariantIndex int
	Variant      netlist.Variant
	Level        float64 // in the waveform's unit
	Polarity     string  // "pos" or "neg"
}

// Run is one solved (or failed) job and everything measured in it.
type Run struct {
	Job
	Waveform  string // the strike's waveform name
	LevelUnit string // unit of Level: "V", "A" or "" (netlist.LevelUnit)

	Verdict Verdict
	// Failures are sentences, one per limit exceeded, for example
	// "U1: residual peak 7.9 V above vmax 5.5 V".
	Failures []string
	// Limits are every rating checked, in deck order.
	Limits []Limit
	// Worst is the limit with the smallest percentage margin, nil when the
	// circuit has no limits.
	Worst *Limit

	Nodes      []NodeResult      // every circuit node, in circuit order
	Elements   []ElementResult   // every element but the strike, in deck order
	Pins       []Residual        // every protected pin, in deck order
	Capacitors []CapacitorResult // every capacitor, in deck order
	Ledger     Ledger

	// Window is the span simulated and how it was chosen.
	Window WindowInfo
	// Notes are remarks the user should read: an extreme near the end of
	// the window, a default window extended, a run without limits.
	Notes []string
	// Stats are the engine's counts, summed over re-runs of the window.
	Stats mna.Stats

	// Waves are the sampled waveforms when Options.Record is set, else nil.
	Waves *Waves

	// Err is the solve failure of an Error run, told as a sentence.
	Err error
}

// NodeResult is the voltage extremes of one node, V and s.
type NodeResult struct {
	Name      string
	Max, TMax float64
	Min, TMin float64
	Initial   float64 // at t = 0, the operating point
	Watched   bool    // named on a watch line
	Pin       bool    // the line of a protected pin
}

// ElementResult is one element's stress: largest |current| through it with
// its time, and the energy ∫ v·i dt into it (positive: absorbed).
type ElementResult struct {
	Name        string
	Kind        netlist.Kind
	PeakCurrent float64 // A
	TPeak       float64 // s
	Energy      float64 // J
}

// Residual is the pulse that reaches a protected pin: v(pin) − v(ref).
type Residual struct {
	Name       string
	Node       string
	Peak       float64 // highest residual voltage, V
	TPeak      float64 // s
	Min        float64 // lowest residual voltage, V
	TMin       float64 // s
	AboveVmax  float64 // time spent above vmax, s (0 without vmax)
	BelowVmin  float64 // time spent below vmin, s (0 without vmin)
	Energy     float64 // ∫ v(p,r)·i_pin dt, J
	IPath      float64 // largest |current| in the internal clamp paths, A
	TIPath     float64 // s
	HasVmax    bool
	HasVmin    bool
	HasIfail   bool
	Vmax, Vmin float64
	Ifail      float64
}

// CapacitorResult is the largest |voltage| across a capacitor.
type CapacitorResult struct {
	Name      string
	Peak      float64 // V, the largest |v(a) − v(b)|
	TPeak     float64 // s
	Rating    float64 // V; 0 without a rating
	HasRating bool
}

// Ledger is where the strike's energy went.
type Ledger struct {
	// Strike is the energy the strike delivered, J: the negative of the
	// engine's ledger entry. Usually positive; a strike drawing current out
	// of a node a supply holds up can take energy instead (negative).
	Strike float64
	// Delivered is all the energy the sources gave the circuit, J: the
	// strike's when positive, plus what every other element gave back
	// (a supply, a charged capacitor discharging). Shares are of this.
	Delivered float64
	// Entries are every other element's energy, deck order.
	Entries []LedgerEntry
	// Balance is the sum of every entry, strike included with its engine
	// sign: what the solution leaves unbalanced (the accepted KCL residual
	// and the current into the engine's tiny Gmin), J; ideally zero.
	Balance float64
}

// LedgerEntry is one element's share of the strike's energy.
type LedgerEntry struct {
	Name    string
	Energy  float64 // J
	Percent float64 // of Ledger.Delivered (0 when nothing was delivered); negative for an element that gave energy
}

// Limit is one rating compared with one measurement. Margin is positive on
// the safe side.
type Limit struct {
	Element  string // element (or node, for a watch) the limit belongs to
	Param    string // "vmax", "vmin", "ifail", "ipp", "emax", "rating", "max", "min"
	Unit     string // "V", "A" or "J"
	Value    float64
	Measured float64
	At       float64 // time of the measured extreme, s (NaN for energies)
	Upper    bool    // the measurement must stay at or below Value
	Margin   float64 // in Unit
	Percent  float64 // of |Value|
}

// WindowInfo says what span was simulated and why.
type WindowInfo struct {
	Stop     float64 // s, the span simulated
	Default  bool    // chosen by the study, not by the deck or the caller
	Extended int     // how many times a default span was doubled
	// Suggest is a longer stop to use when an extreme sits near the end
	// of an explicit window (0: none needed).
	Suggest float64
}

// Waves are the sampled waveforms of a recorded run, on the engine's
// accepted time points.
type Waves struct {
	Time     []float64
	Nodes    []string    // circuit nodes (internal nodes excluded)
	V        [][]float64 // V[node][k], V
	Elements []string    // elements, the strike excluded, in deck order
	I        [][]float64 // I[element][k]: current into its first terminal, A
	Probes   []string    // "ELEMENT.probe"
	P        [][]float64 // P[probe][k]
	Strike   []float64   // current the strike injects into its node, A
}
