package waveforms

import (
	"math"

	"zapnet/devices/spec"
)

// IEC 61000-4-5 combination-wave shapes (CHECKS.md).
const (
	// 8/20 µs current i = A·Ip·t³·exp(−t/τ), t in µs [pub in a secondary
	// source].
	surgeI_A   = 0.01243  // µs⁻³
	surgeI_Tau = 3.911e-6 // s
	// 1.2/50 µs voltage v = A·Vp·(1 − e^(−t/τ1))·e^(−t/τ2) [mem].
	surgeV_A    = 1.037
	surgeV_Tau1 = 0.4074e-6 // s
	surgeV_Tau2 = 68.22e-6  // s
	// surgeR is the generator's effective output impedance, the ratio of
	// open-circuit peak voltage to short-circuit peak current [pub].
	surgeR = 2.0
	// Spans: the 8/20 current is below 1 % of its peak after about 46 µs,
	// the 1.2/50 voltage after about 320 µs [calc].
	surgeIStop = 60e-6
	surgeVStop = 350e-6
)

// Surge12_50Note is the caution carried by the surge-1.2-50 stimulus.
const Surge12_50Note = "surge-1.2-50 is a simplification: the 1.2/50 µs open-circuit voltage behind a fixed 2 Ω. " +
	"A real combination generator delivers an 8/20 µs current into a short, which this source does not " +
	"reproduce (its short-circuit current keeps the 1.2/50 shape); use surge-8-20 for low-impedance loads."

// newSurge8_20 is the 8/20 µs short-circuit current as an ideal current
// source; level is the peak current Ip in amperes.
func newSurge8_20(level float64, _ *spec.Values) (*Stimulus, error) {
	a := surgeI_A * level
	f := func(t float64) float64 {
		if t <= 0 {
			return 0
		}
		u := t * 1e6 // µs
		return a * u * u * u * math.Exp(-t/surgeI_Tau)
	}
	return &Stimulus{Form: Current, F: f, Breakpoints: []float64{0}, Stop: surgeIStop}, nil
}

// newSurge1_2_50 is the 1.2/50 µs open-circuit voltage (peak = level, volts)
// behind r ohms (key r, default 2 Ω). See Surge12_50Note.
func newSurge1_2_50(level float64, v *spec.Values) (*Stimulus, error) {
	r := v.Num("r")
	a := surgeV_A * level
	f := func(t float64) float64 {
		if t <= 0 {
			return 0
		}
		return a * -math.Expm1(-t/surgeV_Tau1) * math.Exp(-t/surgeV_Tau2)
	}
	return &Stimulus{Form: Thevenin, F: f, R: r, Breakpoints: []float64{0}, Stop: surgeVStop, Note: Surge12_50Note}, nil
}
