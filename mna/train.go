package mna

import (
	"fmt"
	"math"
	"time"

	"zapnet/waveforms"
)

// BurstOptions tune SolveBurst. A nil *BurstOptions means every default.
type BurstOptions struct {
	// Settle is the relative change of a pulse's energy, element by
	// element, below which successive pulses count as repeating. Zero:
	// 1e-4.
	Settle float64
	// Every solves every pulse of the burst, extrapolating nothing (the
	// check of the extrapolation).
	Every bool
}

// BurstResult is a burst of identical pulses, solved and extrapolated.
type BurstResult struct {
	Pulses int // pulses in the burst
	Solved int // pulses solved; the others were extrapolated
	// Extrapolated reports whether the last pulses solved repeated
	// themselves and the rest of the burst was taken to repeat them too.
	Extrapolated bool
	// Energy is ∫ Σ v·i dt into each element over the whole burst, J
	// (System.Elements order), the extrapolated pulses included.
	Energy []float64
	// PulseEnergy[k][e] is element e's energy in pulse k (k < Solved),
	// from the pulse's start to the next pulse's, J.
	PulseEnergy [][]float64
	// PeakCurrent is each element's largest |I| over the pulses solved, A.
	PeakCurrent []float64
	Stats       Stats
}

// burstStart is how many pulses the first attempt solves.
const burstStart = 4

// SolveBurst solves the burst st (st.Burst set) with polarity sign. A
// burst is many identical pulses one period apart; once the circuit has
// settled (a coupling capacitor charged, a slow node at its level) each
// pulse repeats the one before it. SolveBurst solves the first few pulses,
// each with a full period after it, and compares the energies the pulses
// bring into every element: when the last two changes are both below
// Settle of the pulse's energy and the last is no larger than the one
// before, the remaining pulses are taken to repeat the last one solved.
// Otherwise it solves twice as many pulses, up to the whole burst. The
// work is then at most about twice that of the pulses needed.
//
// Why the test bounds the error: if the change from pulse to pulse is at
// most ε of the pulse energy and does not grow, the n pulses left drift by
// at most ε·E·n(n+1)/2 together, under ε·N/2 of the burst's N·E: 0.4 % for
// ε = 1e-4 and 75 pulses.
//
// set is as for Transient; its Stop and Observe are SolveBurst's own
// (Observe is still called at every point when set gives one).
func (s *System) SolveBurst(st *waveforms.Stimulus, sign float64, set *Settings, opt *BurstOptions) (*BurstResult, error) {
	start := time.Now()
	if st == nil || st.Burst == nil {
		return nil, fmt.Errorf("mna: SolveBurst needs a burst stimulus (eft with burst=)")
	}
	b := st.Burst
	settle := 1e-4
	if opt != nil && opt.Settle > 0 {
		settle = opt.Settle
	}
	n := min(burstStart, b.Pulses)
	if opt != nil && opt.Every {
		n = b.Pulses
	}
	ne := len(s.devs)
	res := &BurstResult{Pulses: b.Pulses}
	for {
		cut, err := b.First(n)
		if err != nil {
			return nil, err
		}
		pulses, peak, stats, err := s.solvePulses(cut, sign, set, b.Period, n)
		addStats(&res.Stats, stats)
		if err != nil {
			return nil, err
		}
		res.Solved, res.PulseEnergy, res.PeakCurrent = n, pulses, peak
		if n == b.Pulses || repeating(pulses, settle) {
			break
		}
		n = min(2*n, b.Pulses)
	}
	res.Energy = make([]float64, ne)
	last := res.PulseEnergy[res.Solved-1]
	for e := range res.Energy {
		for _, p := range res.PulseEnergy {
			res.Energy[e] += p[e]
		}
		res.Energy[e] += float64(b.Pulses-res.Solved) * last[e]
	}
	res.Extrapolated = res.Solved < b.Pulses
	res.Stats.Wall = time.Since(start)
	return res, nil
}

// solvePulses solves the first n pulses of a burst, each with its full
// period, and books each element's energy per pulse exactly as the ledger
// does (trapezoidal on the accepted points; every pulse start is a
// breakpoint, so no step straddles two pulses).
func (s *System) solvePulses(cut *waveforms.Stimulus, sign float64, set *Settings, period float64, n int) ([][]float64, []float64, Stats, error) {
	ne := len(s.devs)
	pulses := make([][]float64, n)
	for k := range pulses {
		pulses[k] = make([]float64, ne)
	}
	var cfg Settings
	if set != nil {
		cfg = *set
	}
	cfg.Stop = float64(n) * period
	user := cfg.Observe
	prevT := 0.0
	prevP := make([]float64, ne)
	cfg.Observe = func(p *Point) {
		if p.T > 0 {
			k := min(int(prevT/period+1e-9), n-1)
			h := p.T - prevT
			for e := range ne {
				pulses[k][e] += 0.5 * h * (prevP[e] + s.power[e])
			}
		}
		prevT = p.T
		copy(prevP, s.power)
		if user != nil {
			user(p)
		}
	}
	res, err := s.Transient(cut, sign, &cfg)
	if err != nil {
		return nil, nil, Stats{}, err
	}
	return pulses, res.PeakCurrent, res.Stats, nil
}

// repeating reports whether the last pulses repeat: for every element
// whose pulse energy matters (above 1e-9 of the largest), the last two
// changes are within settle of its energy and the last is no larger than
// the one before (or both are below a thousandth of that).
func repeating(pulses [][]float64, settle float64) bool {
	n := len(pulses)
	if n < 3 {
		return false
	}
	a, b, c := pulses[n-3], pulses[n-2], pulses[n-1]
	big := 0.0
	for _, e := range c {
		big = math.Max(big, math.Abs(e))
	}
	for e := range c {
		if math.Abs(c[e]) <= 1e-9*big {
			continue
		}
		d1, d2 := math.Abs(b[e]-a[e]), math.Abs(c[e]-b[e])
		tol := settle * math.Abs(c[e])
		// A growing change counts unless both are at the solution's own
		// noise, far below the tolerance.
		if d1 > tol || d2 > tol || (d2 > d1 && d2 > 1e-3*tol) {
			return false
		}
	}
	return true
}

func addStats(dst *Stats, s Stats) {
	dst.Steps += s.Steps
	dst.Rejected += s.Rejected
	dst.Newton += s.Newton
	dst.DCNewton += s.DCNewton
	dst.Factorisations += s.Factorisations
}
