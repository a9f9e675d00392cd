package mna

import (
	"fmt"
	"math"
	"time"

	"zapnet/waveforms"
)

// BurstOptions tune SolveBurst. A nil *BurstOptions means every default.
type BurstOptions struct {
	// Settle bounds, as a fraction of each element's energy over the
	// whole burst, how far that energy could still move if the drift from
	// pulse to pulse seen at the end of the pulses solved went on for the
	// rest of the burst; below it the pulses count as repeating. Zero:
	// 2e-3.
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
	// Last is the last solution of the pulses solved, as Transient returns
	// it (its samples when the settings Record them); its Energy is of the
	// pulses solved only.
	Last  *Result
	Stats Stats
}

// burstBlock is how many pulses make one of the two blocks whose means
// the settling test compares; the first attempt solves two blocks.
const burstBlock = 3

// SolveBurst solves the burst st (st.Burst set) with polarity sign. A
// burst is many identical pulses one period apart; once the circuit has
// settled (a coupling capacitor charged, a slow node at its level) each
// pulse repeats the one before. SolveBurst solves the first pulses, each
// with a full period after it, and books the energy every element takes in
// each pulse. It then compares, element by element, the mean energy of the
// last burstBlock pulses with that of the burstBlock before them: the
// difference over burstBlock is the drift per pulse, averaged over the
// solution's own step-to-step noise. If that drift went on for the n
// pulses left, the burst's energy would move by drift·n²/2; when that is
// within Settle of the element's energy over the burst, for every element
// that takes at least a thousandth of the largest share, the rest of the
// burst is taken to repeat the last block's mean. Otherwise it solves twice
// as many pulses, up to the whole burst. The work is then at most about
// twice that of the pulses needed. A drift that dies away (the usual
// geometric settling of a charging capacitor) moves the burst by less than
// the bound. Every node must have settled too: its voltage at the pulse
// starts, drifting as it does at the end, may not move by more than 1 % of
// its swing (or 1 mV) over the rest of the burst, so that the peaks of the
// pulses solved stand for the burst's.
//
// The pulses' energies carry the step control's noise (about RelTol of
// each pulse's energy): a RelTol tenfold tighter than a single strike needs
// lets the test see the pulses repeat after a few of them.
//
// set is as for Transient; its Stop and Observe are SolveBurst's own
// (Observe is still called at every point when set gives one).
func (s *System) SolveBurst(st *waveforms.Stimulus, sign float64, set *Settings, opt *BurstOptions) (*BurstResult, error) {
	start := time.Now()
	if st == nil || st.Burst == nil {
		return nil, fmt.Errorf("mna: SolveBurst needs a burst stimulus (eft with burst=)")
	}
	b := st.Burst
	settle := 2e-3
	if opt != nil && opt.Settle > 0 {
		settle = opt.Settle
	}
	n := min(2*burstBlock, b.Pulses)
	if opt != nil && opt.Every {
		n = b.Pulses
	}
	ne := len(s.devs)
	res := &BurstResult{Pulses: b.Pulses}
	var rep []float64 // the energy per pulse taken to repeat
	for {
		cut, err := b.First(n)
		if err != nil {
			return nil, err
		}
		lg, last, err := s.solvePulses(cut, sign, set, b.Period, n)
		if last != nil {
			addStats(&res.Stats, last.Stats)
		}
		if err != nil {
			return nil, err
		}
		res.Solved, res.PulseEnergy, res.PeakCurrent, res.Last = n, lg.energy, last.PeakCurrent, last
		if n == b.Pulses {
			break
		}
		if rep = repeating(lg, b.Pulses, settle); rep != nil {
			break
		}
		n = min(2*n, b.Pulses)
	}
	res.Energy = make([]float64, ne)
	for e := range res.Energy {
		for _, p := range res.PulseEnergy {
			res.Energy[e] += p[e]
		}
		if rep != nil {
			res.Energy[e] += float64(b.Pulses-res.Solved) * rep[e]
		}
	}
	res.Extrapolated = res.Solved < b.Pulses
	res.Stats.Wall = time.Since(start)
	return res, nil
}

// pulseLog is what solvePulses books of each pulse: every element's
// energy, and the node voltages when the pulse starts; and each node's
// swing (highest minus lowest) over all the pulses.
type pulseLog struct {
	energy [][]float64 // [pulse][element], J
	start  [][]float64 // [pulse][node], V
	swing  []float64   // [node], V
}

// solvePulses solves the first n pulses of a burst, each with its full
// period, and books each element's energy per pulse exactly as the ledger
// does (its entry over each step; every pulse start is a breakpoint, so no
// step straddles two pulses).
func (s *System) solvePulses(cut *waveforms.Stimulus, sign float64, set *Settings, period float64, n int) (*pulseLog, *Result, error) {
	ne, nn := len(s.devs), len(s.nodeNames)
	lg := &pulseLog{energy: make([][]float64, n), start: make([][]float64, n), swing: make([]float64, nn)}
	for k := range n {
		lg.energy[k] = make([]float64, ne)
		lg.start[k] = make([]float64, nn)
	}
	var cfg Settings
	if set != nil {
		cfg = *set
	}
	cfg.Stop = float64(n) * period
	user := cfg.Observe
	prevT := 0.0
	next := 0 // the next pulse whose start is to be booked
	cfg.Observe = func(p *Point) {
		if p.T > 0 {
			k := min(int(prevT/period+1e-9), n-1)
			for e := range ne {
				lg.energy[k][e] += s.stepEnergy[e]
			}
		}
		if next < n && p.T >= (float64(next)-1e-9)*period {
			copy(lg.start[next], p.V)
			next++
		}
		prevT = p.T
		if user != nil {
			user(p)
		}
	}
	res, err := s.Transient(cut, sign, &cfg)
	if err != nil {
		return nil, res, err
	}
	// The run kept every unknown's range over the points reported, the
	// error control's (see scaleWith).
	for i, k := range s.nodeIdx {
		lg.swing[i] = s.xMax[k] - s.xMin[k]
	}
	return lg, res, nil
}

// repeating returns each element's energy per pulse for the rest of a
// burst of total pulses when the pulses solved repeat (SolveBurst's test),
// or nil when they do not yet.
func repeating(lg *pulseLog, total int, settle float64) []float64 {
	pulses := lg.energy
	n := len(pulses)
	if n < 2*burstBlock {
		return nil
	}
	mean := func(rows [][]float64, from, e int) float64 {
		sum := 0.0
		for k := from; k < from+burstBlock; k++ {
			sum += rows[k][e]
		}
		return sum / burstBlock
	}
	left := float64(total - n)
	// A node still creeping from pulse to pulse (a filter capacitor
	// charging) has not settled even when its energies are negligible: its
	// level at the pulse starts may not move by more than 1 % of its swing
	// (or 1 mV) over the rest of the burst.
	for i, sw := range lg.swing {
		drift := math.Abs(mean(lg.start, n-burstBlock, i)-mean(lg.start, n-2*burstBlock, i)) / burstBlock
		if drift*left > math.Max(1e-2*sw, 1e-3) {
			return nil
		}
	}
	ne := len(pulses[0])
	last := make([]float64, ne)
	big := 0.0
	for e := range last {
		last[e] = mean(pulses, n-burstBlock, e)
		big = math.Max(big, math.Abs(last[e]))
	}
	for e := range last {
		if math.Abs(last[e]) < 1e-3*big {
			continue
		}
		drift := math.Abs(last[e]-mean(pulses, n-2*burstBlock, e)) / burstBlock
		if drift*left*left/2 > settle*float64(total)*math.Abs(last[e]) {
			return nil
		}
	}
	return last
}

func addStats(dst *Stats, s Stats) {
	dst.Steps += s.Steps
	dst.Rejected += s.Rejected
	dst.Newton += s.Newton
	dst.DCNewton += s.DCNewton
	dst.Factorisations += s.Factorisations
}
