package mna

import (
	"errors"
	"math"
	"time"

	"zapnet/waveforms"
)

// trtol widens the truncation-error tolerance: the divided-difference
// estimate overstates the error the solution actually carries, and a factor
// of about 7 is the common practice [practice] that keeps the step from
// being needlessly small while the Newton tolerances still govern accuracy.
const trtol = 7

// firstFraction is the first step after t = 0 and after every breakpoint, as
// a fraction of the interval it starts (itself at most MaxStep): small
// enough to follow a corner, and the error control then grows it at most 2×
// a step.
const firstFraction = 1e-3

// safety scales the step the error estimate allows. The divided-difference
// estimate is noisy on the ringing of a clamp network; 0.8 rather than the
// textbook 0.9 cut the rejected steps of the reference network by two
// thirds and the total work by a quarter (measured; 0.7 took more steps).
const safety = 0.8

// beSteps is the number of backward-Euler steps after t = 0 and after each
// breakpoint: they damp the step-to-step ringing the trapezoidal rule
// leaves after a discontinuity (it is not L-stable). A rejected step is
// retried with one backward-Euler step too: the rejection is the sign of an
// event the step did not resolve, a corner the stimulus did not announce (a
// clamp switching on or off). On the reference network that damping halved
// the work and removed a 14 V excursion of the clamp node that the
// trapezoidal rule alone left at reltol = 3e-3 (measured against a
// reltol = 1e-6 solution); one step rather than two keeps the first-order
// steps few, which the energy ledger notices at tight tolerances.
const beSteps = 2

// Transient solves the circuit struck by stim with polarity sign (+1 or −1)
// from the operating point to the stop time. A nil stim solves the circuit
// with its strike off (a supply's response alone); a nil set means every
// default. The result carries the solver's statistics and its status; on a
// failure it comes back with the error, holding the statistics of the work
// done.
//
// The initial state is the operating point (strike off, supplies on): its
// charges and fluxes, with zero derivatives. Each step is solved by Newton
// with the trapezoidal rule, after t = 0 and after each breakpoint first with
// two backward-Euler steps. The step follows the local truncation error of
// every charge and flux; a step whose error is too large or whose Newton
// iteration fails is shrunk and retried with one backward-Euler step. Before
// the trapezoidal rule resumes, the derivatives are re-estimated to second
// order. Breakpoints of the stimulus are hit exactly. The energy ledger
// integrates Σ v·i of every element over the accepted points with the
// trapezoidal rule.
//
// Transient resets the system first, so one System serves any number of
// runs; it allocates per run, never per step (unless Record keeps the
// waveforms). Runs are reproducible bit for bit.
func (s *System) Transient(stim *waveforms.Stimulus, sign float64, set *Settings) (*Result, error) {
	start := time.Now()
	s.setStimulus(stim, sign)
	var cfg Settings
	if set != nil {
		cfg = *set
	}
	t := tolerances(set)
	stop := cfg.Stop
	if stop <= 0 && s.stim != nil {
		stop = s.stim.Stop
	}
	if !(stop > 0) || math.IsInf(stop, 0) {
		return nil, errors.New("mna: no stop time: give one in the settings or set a stimulus with a default span")
	}
	maxStep := cfg.MaxStep
	if maxStep <= 0 {
		maxStep = stop / 50
	}
	for _, d := range s.devs {
		if d.limiter != nil {
			if m := d.limiter.MaxStep(); m > 0 && m < maxStep {
				maxStep = m
			}
		}
	}
	minStep := cfg.MinStep
	if minStep <= 0 {
		minStep = 1e-16
	}
	fixed := cfg.FixedStep
	// first is the first step after t = 0 and after each breakpoint.
	first := func(interval float64) float64 {
		h := min(maxStep, interval) * firstFraction
		if cfg.FirstStep > 0 {
			h = min(h, cfg.FirstStep)
		} else if s.stim != nil && s.stim.Stop > 0 {
			// The stimulus's own time scale, not a window stretched for a
			// slow circuit, sets how fine the first step must be.
			h = min(h, s.stim.Stop/50*firstFraction)
		}
		return h
	}

	ne := len(s.devs)
	res := &Result{Energy: make([]float64, ne), PeakCurrent: make([]float64, ne), Stop: stop}
	if cfg.Record {
		res.V = make([][]float64, len(s.nodeNames))
		res.I = make([][]float64, ne)
		res.P = make([][]float64, len(s.probes))
	}

	s.reset()
	dcIt, err := s.operatingPoint(&t)
	res.Stats.DCNewton = dcIt
	if err != nil {
		return res.fail(start), err
	}
	c := &s.ctx
	c.DC = false
	s.factorisations = 0

	copy(s.xAcc, s.x)
	head, nHist := 0, 1
	copy(s.hq[head], s.q)
	s.ht[head] = 0
	clear(s.qdotAcc)
	s.accept(res, &cfg, 0, 0, true)

	now := 0.0
	bi := 0 // next candidate breakpoint in s.stim.Breakpoints
	var bps []float64
	if s.stim != nil {
		bps = s.stim.Breakpoints
	}
	// nextTarget is the next breakpoint after now (or the stop time).
	nextTarget := func() (float64, bool) {
		for bi < len(bps) && bps[bi] <= now+minStep {
			bi++
		}
		if bi < len(bps) && bps[bi] < stop-minStep {
			return bps[bi], true
		}
		return stop, false
	}
	target, _ := nextTarget()
	h := first(target)
	if fixed > 0 {
		h = fixed
	}
	be := beSteps
	for now < stop {
		target, isBP := nextTarget()
		hs := min(h, maxStep)
		rem := target - now
		hit := false
		if hs >= rem {
			hs, hit = rem, true
		} else if hs > 0.5*rem {
			hs = 0.5 * rem
		}
		if hs < minStep {
			return res.fail(start), s.solveError(now, notConverged, "the time step fell below the minimum step")
		}
		tNew := now + hs
		if hit {
			tNew = target
		}

		hn := s.hq[head]
		if be > 0 {
			c.Alpha = 1 / hs
			for k, q := range hn {
				s.hist[k] = -q / hs
			}
		} else {
			c.Alpha = 2 / hs
			for k, q := range hn {
				s.hist[k] = -c.Alpha*q - s.qdotAcc[k]
			}
		}
		s.setNoise()
		c.T = tNew
		copy(s.x, s.xAcc) // start Newton from the last point
		it, st := s.newton(&t, t.gmin)
		res.Stats.Newton += it
		if st != converged {
			be = max(be, 1)
			res.Stats.Rejected++
			h = hs / 2
			if h < minStep {
				return res.fail(start), s.solveError(now, st)
			}
			continue
		}
		grow := 2.0
		if fixed <= 0 {
			r, have := s.lteRatio(be > 0, tNew, head, nHist, &t)
			if have {
				// r^(−1/order): a cube root for the trapezoidal rule, a
				// square root for backward Euler, cheaper than math.Pow.
				root := math.Cbrt
				if be > 0 {
					root = math.Sqrt
				}
				if r > 1 {
					be = max(be, 1)
					res.Stats.Rejected++
					h = hs * max(1.0/8, min(0.5, safety/root(r)))
					if h < minStep {
						e := s.solveError(now, notConverged, "the truncation error stays too large at the minimum step")
						who := s.elements[s.stateDev[s.lteWorst]]
						e.Where = "element " + who
						e.Hint = "try a smaller maxstep in the window statement, or add series resistance to " + who
						return res.fail(start), e
					}
					continue
				}
				if r > 0 {
					grow = min(2, safety/root(r))
				}
			}
		}

		// Accept.
		wasBE := be > 0
		head = (head + 1) % len(s.hq)
		copy(s.hq[head], s.q)
		s.ht[head] = tNew
		nHist = min(nHist+1, len(s.hq))
		copy(s.qdotAcc, s.qdot)
		copy(s.xAcc, s.x)
		now = tNew
		res.Stats.Steps++
		s.accept(res, &cfg, now, hs, false)

		switch {
		case fixed > 0:
			h = fixed
			if hit && isBP {
				be = beSteps
			} else if be > 0 {
				be--
			}
		case hit && isBP:
			be = beSteps
			nHist = 1
			next, _ := nextTarget()
			h = first(next - now)
		default:
			if be > 0 {
				be--
			}
			h = hs * grow
		}
		if be == 0 && wasBE {
			s.restartDerivative(head, nHist)
		}
	}
	for _, e := range res.Energy {
		res.Balance += e
	}
	res.Stats.Factorisations = s.factorisations
	res.Stats.Wall = time.Since(start)
	res.Status = Completed
	return res, nil
}

// fail marks a run that stopped on an error, keeping its statistics.
func (r *Result) fail(start time.Time) *Result {
	r.Stats.Wall = time.Since(start)
	r.Status = Failed
	return r
}

// restartDerivative replaces the state derivatives of the last accepted
// point by the slope of the parabola through the last three points before
// the trapezoidal rule takes over from backward Euler. The trapezoidal rule
// carries the derivative from step to step, and an error in it alternates in
// sign ever after without decay wherever a derivative is forced (the
// voltage of an inductor whose current a source imposes): the first-order
// derivative of backward Euler left such an alternation of about 1 % on the
// strike node; a second-order one shrinks it by the step ratio again.
func (s *System) restartDerivative(head, nHist int) {
	if nHist < 3 {
		return
	}
	n := len(s.hq)
	i2, i1, i0 := head, (head+n-1)%n, (head+n-2)%n
	t0, t1, t2 := s.ht[i0], s.ht[i1], s.ht[i2]
	q0, q1, q2 := s.hq[i0], s.hq[i1], s.hq[i2]
	for k := range s.qdotAcc {
		d21 := (q2[k] - q1[k]) / (t2 - t1)
		d10 := (q1[k] - q0[k]) / (t1 - t0)
		s.qdotAcc[k] = d21 + (d21-d10)/(t2-t0)*(t2-t1)
	}
}

// lteRatio is the largest ratio of estimated local truncation error to
// tolerance over the states, for a step to tNew whose charges are in s.q.
// The error comes from divided differences over the accepted points since
// the last breakpoint: h³/12·q‴ for the trapezoidal rule (needs three
// earlier points) and h²/2·q″ for backward Euler (needs two). have is false
// when there are too few points. The state with the largest ratio is left
// in s.lteWorst.
func (s *System) lteRatio(be bool, tNew float64, head, nHist int, t *tol) (r float64, have bool) {
	n := len(s.hq)
	i1 := head
	i2 := (head + n - 1) % n
	i3 := (head + n - 2) % n
	h := tNew - s.ht[i1]
	if be {
		if nHist < 2 {
			return 0, false
		}
		t0, t1 := s.ht[i2], s.ht[i1]
		q0, q1 := s.hq[i2], s.hq[i1]
		q0, q1 = q0[:len(s.q)], q1[:len(s.q)]
		// Reciprocals of the time differences, formed once for all states.
		r10, r21, r20 := 1/(t1-t0), 1/(tNew-t1), 1/(tNew-t0)
		for k, q2 := range s.q {
			d10 := (q1[k] - q0[k]) * r10
			d21 := (q2 - q1[k]) * r21
			dd2 := (d21 - d10) * r20
			lte := h * h * dd2
			tl := trtol * (t.rel*math.Max(math.Abs(q1[k]), math.Abs(q2)) + t.charge)
			// Divide only for a new largest ratio.
			if e := math.Abs(lte); e > r*tl {
				r, s.lteWorst = e/tl, k
			}
		}
		return r, true
	}
	if nHist < 3 {
		return 0, false
	}
	t0, t1, t2 := s.ht[i3], s.ht[i2], s.ht[i1]
	q0, q1, q2 := s.hq[i3], s.hq[i2], s.hq[i1]
	q0, q1, q2 = q0[:len(s.q)], q1[:len(s.q)], q2[:len(s.q)]
	r10, r21, r32 := 1/(t1-t0), 1/(t2-t1), 1/(tNew-t2)
	r20, r31, r30 := 1/(t2-t0), 1/(tNew-t1), 1/(tNew-t0)
	for k, q3 := range s.q {
		d10 := (q1[k] - q0[k]) * r10
		d21 := (q2[k] - q1[k]) * r21
		d32 := (q3 - q2[k]) * r32
		dd20 := (d21 - d10) * r20
		dd31 := (d32 - d21) * r31
		dd3 := (dd31 - dd20) * r30
		lte := h * h * h * dd3 / 2
		tl := trtol * (t.rel*math.Max(math.Abs(q2[k]), math.Abs(q3)) + t.charge)
		if e := math.Abs(lte); e > r*tl {
			r, s.lteWorst = e/tl, k
		}
	}
	return r, true
}

// accept books an accepted point: element currents and powers, the energy
// ledger (trapezoidal over the step h), peaks, probes, the devices'
// Acceptors, Observe and Record.
func (s *System) accept(res *Result, cfg *Settings, now, h float64, first bool) {
	pt := &s.pt
	pt.T = now
	for i, k := range s.nodeIdx {
		pt.V[i] = s.x[k]
	}
	for di := range s.devs {
		d := &s.devs[di]
		p := 0.0
		for ti, r := range d.term {
			if r >= 0 {
				p += s.x[r] * s.termCur[d.curBase+ti]
			}
		}
		if !first {
			res.Energy[di] += 0.5 * h * (s.power[di] + p)
		}
		s.power[di] = p
		pt.W[di] = p
		i := 0.0
		switch {
		case len(d.term) > 0 && d.term[0] >= 0:
			i = s.termCur[d.curBase]
		case len(d.term) > 1:
			i = -s.termCur[d.curBase+1]
		}
		pt.I[di] = i
		res.PeakCurrent[di] = math.Max(res.PeakCurrent[di], math.Abs(i))
		if d.prober != nil {
			d.prober.Probe(s.x, pt.P[d.probeBase:d.probeBase+d.nProbe])
		}
		if d.acceptor != nil {
			d.acceptor.Accept(now, s.x)
		}
	}
	if cfg.Observe != nil {
		cfg.Observe(pt)
	}
	if cfg.Record {
		res.Time = append(res.Time, now)
		for i, v := range pt.V {
			res.V[i] = append(res.V[i], v)
		}
		for i, v := range pt.I {
			res.I[i] = append(res.I[i], v)
		}
		for i, v := range pt.P {
			res.P[i] = append(res.P[i], v)
		}
	}
}
