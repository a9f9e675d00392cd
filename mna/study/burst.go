package study

import (
	"fmt"
	"math"

	"zapnet/devices/spec"
	"zapnet/mna"
	"zapnet/waveforms"
)

// BurstReport is what a burst of identical pulses (an IEC 61000-4-4 burst)
// brings each protector: over one burst, and over a minute of bursts, the
// length of a test at one polarity. A clamp that survives every pulse may
// still not survive their sum: what decides its fate is the energy it
// accumulates and the power it must shed.
type BurstReport struct {
	Pulses int `json:"pulses"` // in one burst
	// Solved pulses were solved; the others were taken to repeat the last
	// of them once the pulses repeated themselves (Extrapolated).
	Solved       int     `json:"solved"`
	Extrapolated bool    `json:"extrapolated"`
	Period       float64 `json:"period"` // between pulses, s
	Length       float64 `json:"length"` // of one burst, s
	Every        float64 `json:"every"`  // between bursts, s
	// PerMinute is the number of bursts in a minute.
	PerMinute int `json:"bursts_per_minute"`
	// Elements are the protectors, in deck order.
	Elements []BurstEnergy `json:"elements"`
}

// BurstEnergy is one protector's share of a burst.
type BurstEnergy struct {
	Name string `json:"name"`
	// FirstPulse and LargestPulse are the energies of the first pulse and
	// of the pulse that brought most, J.
	FirstPulse   float64 `json:"first_pulse_energy"`
	LargestPulse float64 `json:"largest_pulse_energy"`
	// Energy is over one burst, J; Power that energy over the burst's
	// length, W.
	Energy float64 `json:"energy"`
	Power  float64 `json:"power"`
	// MinuteEnergy is over a minute of bursts, each starting from rest, J;
	// MinutePower that energy over the minute, W.
	MinuteEnergy float64 `json:"minute_energy"`
	MinutePower  float64 `json:"minute_power"`
}

// BurstAccuracy is the accuracy of a burst when neither the deck's window
// nor Options set a tolerance: tenfold tighter than a single strike's
// default, because the solver tells pulses that repeat from pulses that
// still change by their energies, and the step control's noise in a
// pulse's energy must not hide whether they settled.
const BurstAccuracy = mna.DefaultAccuracy / 10

// solveBurst solves a burst stimulus through mna.SolveBurst: the first
// pulses, each with a full period, until they repeat, and the rest
// extrapolated. Energies (the ledger, emax) are the whole burst's; peaks,
// widths and the recorded waveforms are those of the pulses solved, which
// include the settled ones. The window's span does not apply: the burst
// is its span.
func (b *Bench) solveBurst(r *Run, st *waveforms.Stimulus, sign float64, opt *Options) (*mna.Result, error) {
	w := windowOf(b.Circuit, opt)
	var set mna.Settings
	if opt.Settings != nil {
		set = *opt.Settings
	}
	set.Resolve, set.Accuracy = w.Resolve, w.Accuracy
	if set.Accuracy == 0 {
		set.Accuracy = BurstAccuracy
	}
	set.Record = opt.Record
	// SolveBurst solves several prefixes of the burst; the meters follow
	// each from its start.
	set.Observe = func(p *mna.Point) {
		if p.T == 0 {
			b.reset()
		}
		b.observe(p)
	}
	br, err := b.sys.SolveBurst(st, sign, &set, nil)
	if err != nil {
		return nil, explain(err, b.Circuit, w)
	}
	r.Stats.add(br.Stats)
	bu := st.Burst
	length := float64(bu.Pulses) * bu.Period
	res := *br.Last
	res.Energy, res.Stop = br.Energy, length
	res.Balance = 0
	for _, e := range res.Energy {
		res.Balance += e
	}
	r.Window.Stop, r.Window.Default = length, w.Stop == 0
	if w.Stop > 0 {
		r.Notes = append(r.Notes, fmt.Sprintf("window stop= does not apply to a burst: its %d pulses span %s", bu.Pulses, spec.FormatSI(length, "s")))
	}
	if br.Extrapolated {
		r.Notes = append(r.Notes, fmt.Sprintf("the burst's pulses repeated themselves after %d of %d: energies include the %d pulses taken to repeat the last; peaks, widths and waveforms are those of the pulses solved",
			br.Solved, bu.Pulses, bu.Pulses-br.Solved))
	}
	r.Burst = b.burstReport(br, bu)
	r.Notes = append(r.Notes, fmt.Sprintf("the minute's figures assume the circuit is at rest when each burst starts (%s apart)", spec.FormatSI(bu.Every, "s")))
	return &res, nil
}

// burstReport is the protectors' share of the burst br.
func (b *Bench) burstReport(br *mna.BurstResult, bu *waveforms.Burst) *BurstReport {
	length := float64(bu.Pulses) * bu.Period
	per := int(math.Round(60 / bu.Every))
	rep := &BurstReport{Pulses: bu.Pulses, Solved: br.Solved, Extrapolated: br.Extrapolated,
		Period: bu.Period, Length: length, Every: bu.Every, PerMinute: per, Elements: []BurstEnergy{}}
	for k := range b.meters {
		m := &b.meters[k]
		if m.e.Kind.Role != spec.Protector {
			continue
		}
		e := BurstEnergy{Name: m.e.Name, FirstPulse: br.PulseEnergy[0][m.elem], Energy: br.Energy[m.elem]}
		for _, p := range br.PulseEnergy {
			e.LargestPulse = math.Max(e.LargestPulse, p[m.elem])
		}
		e.Power = e.Energy / length
		e.MinuteEnergy = float64(per) * e.Energy
		e.MinutePower = e.MinuteEnergy / 60
		rep.Elements = append(rep.Elements, e)
	}
	return rep
}
