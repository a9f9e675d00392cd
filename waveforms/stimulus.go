// Package waveforms holds the standard discharge and surge stimuli, each with
// its breakpoints and default span, and the measurements of sampled
// waveforms (peaks, rise times, widths, integrals, energies).
package waveforms

// Form says how a stimulus meets the circuit.
type Form int

const (
	// Current is an ideal current F(t), in amperes, injected into the node.
	Current Form = iota
	// Thevenin is an open-circuit voltage F(t), in volts, behind R ohms.
	Thevenin
	// Network is a capacitor C charged to V0 discharging through R (and a
	// series L when L > 0) into the node: its current depends on the load.
	Network
)

func (f Form) String() string {
	switch f {
	case Current:
		return "current"
	case Thevenin:
		return "thevenin"
	case Network:
		return "network"
	}
	return "unknown"
}

// Stimulus is one discharge or surge at one level, positive polarity. The
// engine applies the sign of the polarity.
type Stimulus struct {
	Name  string  // waveform name as in the deck: "iec61000-4-2", "hbm", ...
	Level float64 // as given, in the waveform's unit (Unit)
	Unit  string  // "V" or "A" (or "" for a dimensionless pwl scale)
	Form  Form
	// F is the stimulus function of time for Current (A) and Thevenin (V)
	// forms; nil for Network. F(t) = 0 for t <= 0.
	F func(t float64) float64
	// R is the series resistance of Thevenin and Network forms, ohms.
	R float64
	// L is the optional series inductance of a Network, henries (0: none).
	L float64
	// C and V0 are the Network's capacitor and its initial voltage.
	C, V0 float64
	// Breakpoints are the corners of F (or the network's switching instant),
	// ascending, in seconds; the engine lands on each exactly.
	Breakpoints []float64
	// Stop is the default simulated span in seconds for this stimulus alone;
	// the study may extend it for slow circuits.
	Stop float64
	// Note is a caution to show with the stimulus (a known simplification),
	// empty for most waveforms.
	Note string
}
