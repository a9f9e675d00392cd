package waveforms

import (
	"fmt"
	"math"

	"zapnet/devices/spec"
)

// IEC 61000-4-4 bursts: 75 pulses of 5/50 ns at 5 kHz (a 15 ms burst) or at
// 100 kHz (0.75 ms), a burst every 300 ms [pub]; the generator's 50 Ω
// reaches the line through the coupling network's 33 nF capacitor [mem].
const (
	eftBurstPulses = 75
	eftBurstEvery  = 300e-3 // s
	eftCoupling    = 33e-9  // F
)

// BurstNote is the caution carried by a burst stimulus.
const BurstNote = "The checks measure the burst's first pulse. zapnet run solves the burst to its settled pulses, " +
	"takes the rest to repeat them, and reports each clamp's energy and average power over a burst and over a minute of bursts."

// eftBurstRates are the published repetition rates, Hz.
var eftBurstRates = []float64{5e3, 100e3}

// Burst describes a stimulus made of identical pulses one period apart, so
// that a solver may solve the first pulses and, once the circuit repeats
// itself from pulse to pulse, extrapolate the rest.
type Burst struct {
	Pulses int     // pulses in one burst
	Period float64 // between pulse starts, s
	Every  float64 // between burst starts, s
	first  func(n int) (*Stimulus, error)
}

// First returns the burst cut to its first n pulses (1 <= n <= Pulses),
// its span n periods: every pulse is followed by a full period.
func (b *Burst) First(n int) (*Stimulus, error) {
	if n < 1 || n > b.Pulses {
		return nil, fmt.Errorf("burst: %d pulses asked of a burst of %d", n, b.Pulses)
	}
	return b.first(n)
}

// newEFTAny is the eft waveform: a standard burst through the coupling
// capacitor with burst= (Hz: 5k or 100k), otherwise the pulse or pulse
// train of newEFT.
func newEFTAny(level float64, v *spec.Values) (*Stimulus, error) {
	if v.Has("burst") {
		return newEFTBurst(level, v)
	}
	return newEFT(level, v)
}

// newEFTBurst is a burst of the standard: 75 pulses at the rate burst=
// (5 kHz or 100 kHz) from 50 Ω through 33 nF. It replaces count and rate.
func newEFTBurst(level float64, v *spec.Values) (*Stimulus, error) {
	rate := v.Num("burst")
	ok := false
	for _, r := range eftBurstRates {
		ok = ok || math.Abs(rate-r) <= 1e-9*r
	}
	if !ok {
		return nil, fmt.Errorf("eft: burst is the repetition rate of IEC 61000-4-4, 5 kHz or 100 kHz, got %g Hz", rate)
	}
	b := &Burst{Pulses: eftBurstPulses, Period: 1 / rate, Every: eftBurstEvery}
	b.first = func(n int) (*Stimulus, error) {
		train, err := eftTrain(level, n, rate)
		if err != nil {
			return nil, err
		}
		const g = 0
		f := &Fragment{
			Nodes: []Node{{Name: "g"}},
			Parts: []Part{
				{Kind: PartSource, Name: "gen", A: g, B: Ref, Value: eftR, F: train.F},
				{Kind: PartCapacitor, Name: "ccpl", A: g, B: Out, Value: eftCoupling},
			},
		}
		return &Stimulus{Name: "eft", Level: level, Unit: "V", Form: Generator, Gen: f,
			Breakpoints: train.Breakpoints, Stop: float64(n) * b.Period, Pulse: eftTail, Burst: b,
			Values: *v, Note: BurstNote, Rise: eftRiseMin}, nil
	}
	return b.First(b.Pulses)
}
