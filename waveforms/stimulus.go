// Package waveforms holds the standard discharge and surge stimuli, each with
// its breakpoints and default span, and the measurements of sampled
// waveforms (peaks, rise times, widths, integrals, energies).
//
// # Waveforms, units, defaults and spans
//
// Each stimulus is built by New from the name a deck's strike line uses. The
// level is in the waveform's unit; the parameters are the strike's keys.
//
//	name           form      level          keys (default)                         span (Stop)
//	iec61000-4-2   current   V              -                                      200 ns
//	hbm            network   V              l (2.5 µH)                             5·RC + 10·L/R ≈ 767 ns
//	iso10605       network   V              c (150 pF), r (330 Ω), l (0)           5·RC + 10·L/R
//	surge-8-20     current   A (peak Ip)    -                                      60 µs
//	surge-1.2-50   thevenin  V (peak Voc)   r (2 Ω)                                350 µs
//	tlp            thevenin  A (into short) width (100 ns), rise (1 ns)            width + rise + width/2
//	eft            thevenin  V (peak Voc)   count (1), rate (5 kHz)                (count−1)/rate + 300 ns
//	pwl            current   scale          file (required)                        last sample time
//	iec61000-4-2-network  generator  V      -                                      5·RC + 10·L/R ≈ 303 ns
//	iec61000-4-2-air      generator  V      approach (1)                           that + 100 ns
//	surge-cwg             generator  V (peak Voc)  path (direct)                   350 µs
//	eft with burst=       generator  V (peak Voc)  burst (5 kHz or 100 kHz)        75 periods
//
// Spans end when the stimulus has fallen below about 1 % of its peak (pwl:
// at its last sample); a study may extend them for slow circuits.
//
// Shapes and their sources (CHECKS.md holds the published values):
//
//   - iec61000-4-2: the informative annex's two-term formula of IEC 61000-4-2
//     Ed. 2.0 with I1, I2 scaled linearly from 16.6 A and 9.3 A at 4 kV. An
//     ideal current: the annex describes the current into the 2 Ω target.
//   - hbm: JS-001's 100 pF and 1.5 kΩ with a series inductance chosen so that
//     the rise into a short falls inside the 2–10 ns window [practice]; l = 0
//     gives the ideal RC (0.6667 A/kV, τ = 150 ns).
//   - iso10605: the 150/330 pF and 330 Ω/2 kΩ networks as plain RC
//     discharges; they lack a real generator's first fast spike.
//   - surge-8-20: i = A·Ip·t³·e^(−t/τ), τ = 3.911 µs, A = 0.01243 µs⁻³.
//   - surge-1.2-50: v = A·Vp·(1 − e^(−t/τ1))·e^(−t/τ2) behind 2 Ω. A
//     simplification: into a short this source gives a 1.2/50-shaped current,
//     not the 8/20 µs current of a real combination generator (Surge12_50Note;
//     the waveform command prints it and shows the mismatch as a check).
//   - tlp: a trapezoid from 50 Ω whose short-circuit current is the level;
//     linear edges of `rise`, width measured at half maximum.
//   - eft: a double exponential fitted to a 5 ns rise and 50 ns width at half
//     maximum [calc], from 50 Ω, so that 50 Ω sees half the open-circuit peak;
//     count > 1 makes a burst at rate.
//   - pwl: a "time,current" CSV, linear between samples, zero outside them.
//   - the generator circuits (Generator form, a Fragment the engine solves):
//     the IEC 61000-4-2 generator network for contact discharge and through
//     a spark for air discharge (generator.go), the IEC 61000-4-5
//     combination wave generator with its coupling paths (cwg.go), and the
//     IEC 61000-4-4 burst through its coupling capacitor (eftburst.go).
//     Their check points are measured on the engine's solution
//     (SolvedChecks, netchecks.go).
//
// Measurement conventions: rise times are between the first crossings of the
// fractions of the peak; the IEC 61000-4-2 30 and 60 ns points count from the
// first 10 % crossing; surge fronts are 1.25·(10–90 %) for current and
// 1.67·(30–90 %) for voltage, and the time to half value runs from the virtual
// origin (where the line through those two points meets zero) to the 50 %
// point of the tail [mem: IEC 61000-4-5]; HBM decay runs from the peak to
// 36.8 % of it [mem: JS-001]; ringing is the largest swing below zero after
// the peak, in per cent of the peak.
package waveforms

import "zapnet/devices/spec"

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
	// Generator is a generator's circuit (Stimulus.Gen) between the node
	// and ref: a network with its parasitic paths, a spark gap, a coupling
	// network. It has no closed form; the engine solves it.
	Generator
)

func (f Form) String() string {
	switch f {
	case Current:
		return "current"
	case Thevenin:
		return "thevenin"
	case Network:
		return "network"
	case Generator:
		return "generator"
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
	// Gen is the circuit of a Generator form, and the same network as C,
	// R, L and V0 for a Network form (the strike stamps either through
	// it); nil for the other forms.
	Gen *Fragment
	// Burst describes a stimulus of identical pulses (an EFT burst) for a
	// solver that extrapolates a settled train; nil otherwise.
	Burst *Burst
	// Breakpoints are the corners of F (or the network's switching instant),
	// ascending, in seconds; the engine lands on each exactly.
	Breakpoints []float64
	// Stop is the default simulated span in seconds for this stimulus alone;
	// the study may extend it for slow circuits.
	Stop float64
	// Rise is the shortest rise of the stimulus, s (Waveform.Rise); 0 when
	// unknown.
	Rise float64
	// Pulse is the span of one pulse of a train (an EFT burst, s), 0 for a
	// single event; see Scale.
	Pulse float64
	// Values are the parameters the stimulus was built with (of its
	// waveform's table), so that a strike can be built for it again.
	Values spec.Values
	// Note is a caution to show with the stimulus (a known simplification),
	// empty for most waveforms.
	Note string
}

// Scale is the time scale of the stimulus's events, s: the span of one
// pulse of a train, otherwise the whole span. A solver sizes its first
// step after each breakpoint from it: a train's span is that of all its
// pulses, far too long to resolve each one's rise.
func (s *Stimulus) Scale() float64 {
	if s.Pulse > 0 {
		return s.Pulse
	}
	return s.Stop
}

// The shortest rises of the standard stimuli, s: the nominal 10–90 % rise
// less the standard's tolerance on it. IEC 61000-4-2 (and the ISO 10605
// contact networks built to the same generator) 0.8 ns ±25 % [pub: IEC
// 61000-4-2 table 3]; an air discharge's spark can be faster than the
// contact generator's relay, taken as a quarter of it [practice]; HBM 2 to
// 10 ns [mem: JS-001]; the 8/20 µs current's front 8 µs ±20 % is
// 1.25 × its 10–90 % rise, so 5.1 µs at least, and the 1.2/50 µs
// voltage's front 1.2 µs ±30 % is 1.67 × its 30–90 % rise, so 0.5 µs at
// least [pub: IEC 61000-4-5]; the EFT pulse's 5 ns ±30 % [pub: IEC
// 61000-4-4].
const (
	iecRiseMin       = 0.6e-9
	airRiseMin       = 0.15e-9
	hbmRiseMin       = 2e-9
	surge820RiseMin  = 0.8 * 8e-6 / 1.25
	surge1250RiseMin = 0.7 * 1.2e-6 / 1.67
	eftRiseMin       = 3.5e-9
)
