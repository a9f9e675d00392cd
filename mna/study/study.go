package study

import (
	"context"
	"errors"
	"zapnet/devices"
	"zapnet/devices/spec"
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
	// default: the span of DefaultStop, the engine's accuracy, no step
	// bound). Pos is ignored.
	Window netlist.Window
	// Settings tunes the engine beyond the window (MinStep, Gmin, MaxIter,
	// ChargeTol, Context). Nil: engine defaults. Stop, Accuracy, Resolve,
	// Record and Observe are set by the study and ignored here.
	Settings *mna.Settings
}

// WithContext returns a copy of o whose solves stop once ctx is done (the
// engine looks at it every few steps, mna.Settings.Context): a solve cut
// short returns an error wrapping mna.ErrInterrupted, which Interrupted
// recognises.
func (o *Options) WithContext(ctx context.Context) *Options {
	var x Options
	if o != nil {
		x = *o
	}
	var set mna.Settings
	if x.Settings != nil {
		set = *x.Settings
	}
	set.Context = ctx
	x.Settings = &set
	return &x
}

// Interrupted reports whether err is a solve cut short by its context: its
// run did not finish, and is no result.
func Interrupted(err error) bool { return errors.Is(err, mna.ErrInterrupted) }

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

// Run is one solved (or failed) job and everything measured in it. Its JSON
// is the run of OUTPUT.md; a Run read back from that JSON (a shard to merge)
// holds every field the JSON carries.
type Run struct {
	// Index is the run's place in plan order, for merging shards.
	Index int `json:"index"`
	// VariantIndex is the variant's place in the plan's variants (not in
	// the JSON: a merge ranks variants by their settings).
	VariantIndex int             `json:"-"`
	Variant      netlist.Variant `json:"variant"`
	Waveform     string          `json:"waveform"`
	Level        float64         `json:"level"` // in LevelUnit
	LevelUnit    spec.Unit       `json:"level_unit"`
	Polarity     string          `json:"polarity"` // "pos" or "neg"

	Verdict Verdict `json:"verdict"`
	// Failures are sentences, one per limit exceeded, for example
	// "U1: residual peak 7.9 V above vmax 5.5 V".
	Failures []string `json:"failures"`
	// Error is why an Error run could not be solved, as a sentence; Err
	// is the same failure as an error value (nil in a Run read from JSON).
	Error string `json:"error,omitempty"`
	Err   error  `json:"-"`
	// Worst is the limit with the smallest percentage margin, nil when the
	// circuit has no limits.
	Worst *Limit `json:"worst_margin,omitempty"`
	// Limits are every rating checked, in deck order.
	Limits []Limit `json:"limits"`

	Nodes    NodeResults    `json:"nodes"`    // every circuit node, in circuit order
	Elements ElementResults `json:"elements"` // every element but the strike, in deck order
	Ledger   Ledger         `json:"ledger"`

	// Burst is, for a burst of identical pulses, each protector's energy
	// and average power over a burst and over a minute of bursts; nil
	// otherwise.
	Burst *BurstReport `json:"burst,omitempty"`
	// Window is the span simulated and how it was chosen.
	Window WindowInfo `json:"window"`
	// Notes are remarks the user should read: an extreme near the end of
	// the window, a default window extended, a run without limits.
	Notes []string `json:"notes"`
	// Stats are the engine's counts, summed over re-runs of the window.
	Stats Stats `json:"stats"`
	// Verify is the run's error bar when asked for (Verify): its headline
	// numbers against a solution at a tenth of its accuracy; nil otherwise.
	Verify *Verification `json:"verify,omitempty"`

	// Waves are the sampled waveforms when Options.Record is set, else nil.
	Waves *Waves `json:"-"`
}

// Job is the job the run solved.
func (r *Run) Job() Job {
	return Job{Index: r.Index, VariantIndex: r.VariantIndex, Variant: r.Variant, Level: r.Level, Polarity: r.Polarity}
}

// Stats are the engine's counts of a run. Wall is the only field that
// differs between identical runs; zero, it is left out of the JSON.
type Stats struct {
	Steps    int     `json:"steps"`
	Rejected int     `json:"rejected"`
	Newton   int     `json:"newton"`
	DCNewton int     `json:"dc_newton"`
	Wall     float64 `json:"wall_s,omitempty"` // s
}

// add sums the counts of one engine solution into s.
func (s *Stats) add(m mna.Stats) {
	s.Steps += m.Steps
	s.Rejected += m.Rejected
	s.Newton += m.Newton
	s.DCNewton += m.DCNewton
	s.Wall += m.Wall.Seconds()
}

// NodeResult is the voltage extremes of one node, V and s.
type NodeResult struct {
	Name    string  `json:"-"`
	Max     float64 `json:"max"`
	TMax    float64 `json:"t_max"`
	Min     float64 `json:"min"`
	TMin    float64 `json:"t_min"`
	Initial float64 `json:"-"` // at t = 0, the operating point
	Watched bool    `json:"-"` // named on a watch line
	Pin     bool    `json:"-"` // the line of a protected pin
}

// ElementResult is one element's stress: largest |current| through it with
// its time, and the energy ∫ v·i dt into it (positive: absorbed); for a
// protected pin the residual pulse, and for an element rated on the voltage
// across it (a capacitor) that voltage's largest magnitude.
type ElementResult struct {
	Name        string    `json:"-"`
	Kind        string    `json:"kind"`
	Role        spec.Role `json:"-"`
	PeakCurrent float64   `json:"peak_current"` // A
	TPeak       float64   `json:"t_peak_current"`
	Energy      float64   `json:"energy"` // J
	// Gross is the energy the strike moved through the element in either
	// direction, ∫ |v·i − v₀·i₀| dt, J (mna.Result.Gross): Energy is
	// accurate relative to the larger of the two.
	Gross    float64   `json:"-"`
	Residual *Residual `json:"residual,omitempty"`
	// PeakVoltage is the largest |voltage| across the element, V, with its
	// time; nil for elements not rated on a voltage.
	PeakVoltage  *float64 `json:"peak_voltage,omitempty"`
	TPeakVoltage *float64 `json:"t_peak_voltage,omitempty"`
	// Probes are the device's internal quantities its ratings read (a
	// capacitor's dielectric voltage "vc", a pin's "ipath").
	Probes ProbeResults `json:"probes,omitempty"`
	// Quiescent is the power the element takes at the operating point,
	// before the strike, W (negative: it delivers, as a supply does). The
	// ledger's entries leave it out.
	Quiescent float64 `json:"quiescent_power,omitempty"`
}

// ProbeResult is the extremes of one device probe.
type ProbeResult struct {
	Name  string    `json:"-"`
	Unit  spec.Unit `json:"unit"`
	Max   float64   `json:"max"`
	TMax  float64   `json:"t_max"`
	Min   float64   `json:"min"`
	TMin  float64   `json:"t_min"`
	Peak  float64   `json:"peak"` // largest magnitude
	TPeak float64   `json:"t_peak"`
}

// Probe returns the element's probe name, or nil.
func (e *ElementResult) Probe(name string) *ProbeResult {
	for i := range e.Probes {
		if e.Probes[i].Name == name {
			return &e.Probes[i]
		}
	}
	return nil
}

// Residual is the pulse that reaches a protected pin: v(pin) − v(ref).
type Residual struct {
	Name      string  `json:"-"`
	Node      string  `json:"-"`
	Peak      float64 `json:"peak"` // highest residual voltage, V
	TPeak     float64 `json:"t_peak"`
	Min       float64 `json:"min"` // lowest residual voltage, V
	TMin      float64 `json:"t_min"`
	AboveVmax float64 `json:"width_above_vmax"` // time spent above vmax, s (0 without vmax)
	BelowVmin float64 `json:"width_below_vmin"` // time spent below vmin, s (0 without vmin)
	Energy    float64 `json:"energy"`           // ∫ v(p,r)·i_pin dt, J
	IPath     float64 `json:"ipath_peak"`       // largest |current| in the internal clamp paths, A
	TIPath    float64 `json:"t_ipath_peak"`
	// The pin's window and failure current, when rated.
	HasVmax, HasVmin, HasIfail bool    `json:"-"`
	Vmax, Vmin, Ifail          float64 `json:"-"`
}

// Pins lists the residuals of the run's protected pins, in deck order.
func (r *Run) Pins() []*Residual {
	var out []*Residual
	for i := range r.Elements {
		if p := r.Elements[i].Residual; p != nil {
			out = append(out, p)
		}
	}
	return out
}

// Ledger is where the strike's energy went. Every entry is ∫ v·i dt into an
// element over its terminals: positive for what it absorbed, negative for
// what it delivered.
type Ledger struct {
	// Strike is the strike's entry: negative when it delivers (the usual
	// case); a strike drawing current out of a node a supply holds up can
	// take energy instead (positive).
	Strike float64
	// Delivered is all the energy the sources gave the circuit, J: what
	// the strike delivered, plus what every other element gave back (a
	// supply, a charged capacitor discharging). Shares are of this.
	Delivered float64
	// Entries are every other element's energy, deck order.
	Entries []LedgerEntry
	// Balance is the sum of every entry, strike included: what the
	// solution leaves unbalanced (the accepted KCL residual and the
	// current into the engine's tiny shunt conductance), J; ideally zero.
	Balance float64
}

// LedgerEntry is one element's share of the strike's energy.
type LedgerEntry struct {
	Name    string
	Energy  float64 // J
	Percent float64 // of Ledger.Delivered (0 when nothing was delivered); negative for an element that gave energy
}

// Limit is one rating compared with one measurement. Margin is positive on
// the safe side. Its JSON names it "ELEMENT PARAM" and leaves out the time
// of an energy.
type Limit struct {
	Element  string    // element (or node, for a watch) the limit belongs to
	Param    string    // the rating's key: "vmax", "ipp", ..., "max" or "min" for a watch
	Unit     spec.Unit // the rating's unit
	Value    float64
	Measured float64
	At       float64 // time of the measured extreme, s (NaN for energies)
	Upper    bool    // the measurement must stay at or below Value
	Margin   float64 // in Unit
	Percent  float64 // of |Value|
	// Says names the measurement in a failure sentence ("residual peak").
	Says string
	// Measure is what a rating is judged against (zero for a watch).
	Measure spec.Measure
	// Headroom is, for a window limit, the distance from the operating
	// point to the limit that Percent is of (0 for the others, whose
	// percentage is of |Value|); negative when the operating point is
	// beyond the limit already.
	Headroom float64
	// Rest is, for a window limit, the measured quantity at the operating
	// point (0 for the others).
	Rest float64
	// Window says the limit is one side of a voltage window, judged
	// against its headroom from the operating point (NewWindowLimit).
	Window bool
}

// LimitOn returns the limit on element that is judged against measure m,
// or nil.
func (r *Run) LimitOn(element string, m spec.Measure) *Limit {
	for i := range r.Limits {
		if l := &r.Limits[i]; l.Element == element && l.Measure == m {
			return l
		}
	}
	return nil
}

// WindowInfo says what span was simulated and why.
type WindowInfo struct {
	Stop     float64 `json:"stop"`     // s, the span simulated
	Default  bool    `json:"default"`  // chosen by the study, not by the deck or the caller
	Extended int     `json:"extended"` // how many times a default span was doubled
	// Suggest is a longer stop to use when an extreme sits near the end
	// of an explicit window (0: none needed).
	Suggest float64 `json:"suggest_stop,omitempty"`
}

// Waves are the sampled waveforms of a recorded run, on the engine's
// accepted time points.
type Waves struct {
	Time     []float64
	Nodes    []string        // circuit nodes (internal nodes excluded)
	V        [][]float64     // V[node][k], V
	Elements []string        // elements, the strike excluded, in deck order
	I        [][]float64     // I[element][k]: current into its first terminal, A
	Probes   []devices.Probe // named "ELEMENT.probe", with their units
	P        [][]float64     // P[probe][k]
	// Strike is the current the strike injects into its node, A, and
	// StrikeName the strike's name.
	Strike     []float64
	StrikeName string
}
