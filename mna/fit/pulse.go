package fit

import (
	"errors"
	"fmt"
	"math"

	"zapnet/devices"
	"zapnet/mna"
	"zapnet/netlist"
	"zapnet/waveforms"
)

// Pulse names the pulse a published clamping voltage was measured with.
type Pulse string

// The pulses of datasheet points.
const (
	// Surge8x20 is IEC 61000-4-5's 8/20 µs short-circuit current.
	Surge8x20 Pulse = "8/20"
	// Surge10x1000 is the 10/1000 µs current of telecom surge ratings.
	Surge10x1000 Pulse = "10/1000"
	// TLPPulse is a 100 ns transmission-line pulse from 50 Ω (ANSI/ESD
	// STM5.5.1), measured as the average over 70–90 % of its width.
	TLPPulse Pulse = "tlp"
)

// IsSurge reports a surge (a peak reading), not a TLP (an average).
func (p Pulse) IsSurge() bool { return p == Surge8x20 || p == Surge10x1000 }

// The 10/1000 µs current as a double exponential
// i = A·Ip·(e^(−t/τ2) − e^(−t/τ1)) whose front time 1.25·(t90 − t10) is
// 10 µs and whose time to half value, from the virtual origin, is 1000 µs
// [calc: the constants solved for those two definitions (front and
// virtual origin as IEC 61000-4-5 defines them for the 8/20 current);
// checked by the tests]. Its peak, Ip, comes at 22.61 µs.
const (
	s10Tau1 = 3.8164054401991805e-06
	s10Tau2 = 0.001403694234915241
	s10A    = 1.0190063158818756
	// s10Stop is the simulated span: past the peak by a tenth of the
	// half-value time, where a clamp's voltage has long peaked.
	s10Stop = 120e-6
)

// Stimulus returns the pulse at level (the peak current of a surge, the
// current into a short of a TLP), positive.
func (p Pulse) Stimulus(level float64) (*waveforms.Stimulus, error) {
	switch p {
	case Surge8x20:
		return waveforms.Lookup("surge-8-20").New(level, nil)
	case TLPPulse:
		return waveforms.Lookup("tlp").New(level, nil)
	case Surge10x1000:
		a := s10A * level
		return &waveforms.Stimulus{Name: "surge-10-1000", Level: level, Unit: "A", Form: waveforms.Current,
			F: func(t float64) float64 {
				if t <= 0 {
					return 0
				}
				return a * (math.Exp(-t/s10Tau2) - math.Exp(-t/s10Tau1))
			},
			Breakpoints: []float64{0}, Stop: s10Stop}, nil
	}
	return nil, fmt.Errorf("unknown pulse %q (8/20, 10/1000 or tlp)", p)
}

// Shot is what one simulated pulse shows of a part: for a surge the peak
// voltage across it and the peak current through it, for a TLP their
// averages over 70–90 % of the pulse width.
type Shot struct{ V, I float64 }

// A Runner solves one pulse into one part through the engine.
type Runner func(p Part, pulse Pulse, level float64) (Shot, error)

// Engine is the Runner the fits use unless told otherwise.
var Engine Runner = RunDeck

// ErrNoKind is returned by RunDeck for a part whose kind the deck language
// does not have.
var ErrNoKind = errors.New("the deck language has no such kind")

// RunDeck builds a deck of the pulse into the part and solves it: the
// strike into the part's line terminal, the part to gnd.
func RunDeck(p Part, pulse Pulse, level float64) (Shot, error) {
	if !knownKind(p.Kind) {
		return Shot{}, fmt.Errorf("%s: %w", p.Kind, ErrNoKind)
	}
	// The strike line is there for the deck's sake: its stimulus is
	// replaced by the pulse's.
	deck := "strike S a gnd waveform=tlp level=1\n" + p.Element("DUT", "a", "gnd") + "\n"
	c, err := netlist.Parse("fit", []byte(deck))
	if err != nil {
		return Shot{}, fmt.Errorf("the fitted part does not read as a deck line (%s): %w", p.Element("DUT", "a", "gnd"), err)
	}
	return RunCircuit(c, "a", "DUT", pulse, level)
}

// RunCircuit solves the pulse at level into a compiled deck's strike and
// measures the Shot at node (voltage) and element (current).
func RunCircuit(c *netlist.Circuit, node, element string, pulse Pulse, level float64) (Shot, error) {
	sys, err := mna.Compile(c)
	if err != nil {
		return Shot{}, err
	}
	st, err := pulse.Stimulus(level)
	if err != nil {
		return Shot{}, err
	}
	a, d := -1, -1
	for k, n := range sys.Nodes() {
		if n == node {
			a = k
		}
	}
	for k, n := range sys.Elements() {
		if n == element {
			d = k
		}
	}
	if a < 0 || d < 0 {
		panic("fit: RunCircuit: no node " + node + " or element " + element)
	}
	m := newShotMeter(pulse, st)
	// Steps of a 5000th of the span put a surge's sampled peak within
	// 1e-6 of the true one (the peak is smooth: the error goes as the
	// square of the step over the pulse's time scale).
	set := &mna.Settings{RelTol: 1e-6, ChargeTol: 1e-16, MaxStep: st.Stop / 5000,
		Observe: func(pt *mna.Point) { m.add(pt.T, pt.V[a], pt.I[d]) }}
	if !m.surge {
		// A TLP reading ends with its averaging window: the pulse's fall,
		// where a clamp with lead inductance swings into forward
		// conduction, has nothing to add to it.
		set.Stop = m.hi
		set.MaxStep = m.hi / 2000
	}
	if _, err := sys.Transient(st, 1, set); err != nil {
		return Shot{}, err
	}
	return m.shot(), nil
}

// shotMeter measures a Shot from the accepted points of a run.
type shotMeter struct {
	surge      bool
	lo, hi     float64 // TLP averaging window, s
	t, v, i    float64 // previous point
	sv, si, sw float64
	pv, pi     float64
}

func newShotMeter(p Pulse, st *waveforms.Stimulus) *shotMeter {
	m := &shotMeter{surge: p.IsSurge(), t: math.NaN()}
	if !m.surge {
		// The flat top of waveforms' TLP runs from rise to width; the
		// window is 70–90 % of the width [pub: ANSI/ESD STM5.5.1].
		w := st.Breakpoints[2]
		m.lo, m.hi = 0.7*w, 0.9*w
	}
	return m
}

func (m *shotMeter) add(t, v, i float64) {
	if m.surge {
		m.pv = math.Max(m.pv, math.Abs(v))
		m.pi = math.Max(m.pi, math.Abs(i))
		return
	}
	if !math.IsNaN(m.t) {
		// Trapezoids clipped to the window.
		a, b := math.Max(m.t, m.lo), math.Min(t, m.hi)
		if b > a {
			lerp := func(y0, y1, x float64) float64 { return y0 + (y1-y0)*(x-m.t)/(t-m.t) }
			va, vb := lerp(m.v, v, a), lerp(m.v, v, b)
			ia, ib := lerp(m.i, i, a), lerp(m.i, i, b)
			m.sv += (b - a) * (va + vb) / 2
			m.si += (b - a) * (ia + ib) / 2
			m.sw += b - a
		}
	}
	m.t, m.v, m.i = t, v, i
}

func (m *shotMeter) shot() Shot {
	if m.surge {
		return Shot{V: m.pv, I: m.pi}
	}
	return Shot{V: m.sv / m.sw, I: m.si / m.sw}
}

// knownKind reports whether the engine has a model for the kind.
func knownKind(kind string) bool { return devices.Lookup(kind) != nil }
