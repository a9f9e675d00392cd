package mna

import (
	"errors"
	"fmt"
	"math"
	"time"

	"zapnet/devices/spec"
	"zapnet/waveforms"
)

// The error control. Each step's local error is estimated for every
// unknown (errorRatio) and held below
//
//	rel·b·w + AbsTol,   rel = localShare·Accuracy·√(Accuracy/DefaultAccuracy),
//
// b being the unknown's scale and w a slack.
//
// The scale b is the largest magnitude the unknown has reached on the side
// of zero where it now is (at least its present magnitude, and at least
// SideFloor of its largest magnitude on either side, and scaleFloor): the
// extremes of a report are relative to themselves, and a clamp node that
// swings to +27 V and −7 V must get its −7 V right to 0.2 % of 7 V, not of
// 27 V.
//
// The errors of a second-order method go as the step squared and its steps
// as the cube root of the local bound, so a bound proportional to Accuracy
// would leave errors that shrink only as Accuracy^(2/3): rel goes as
// Accuracy^(3/2) instead, so that the error a run leaves goes as Accuracy
// itself and a run at Accuracy/10 is ten times closer (about three times
// the steps). Its difference from the run at Accuracy is then the first
// run's error to within about a tenth: an error bar.
//
// The slack w = min(1 + slackK·(d/b)², slackMax) grows with the distance d
// from the value to the nearest extreme it has reached so far: a value in
// the middle of its range cannot make a new extreme now, and the ringing of
// a decoupling capacitor's esl with a pin's cin, which fills tens of
// nanoseconds of a strike a few hundred millivolts from any extreme, need
// not be followed to a part in ten thousand of its phase. Near an extreme
// (a ringing whose crests climb, the first nanosecond) d is small and w is
// 1. An error made in the middle of the range can still reach a later
// extreme in a circuit with a long memory, which is why the slack stays
// small; and it fades as the square of Accuracy below the default, so that
// a run at Accuracy/10 has none and its difference from the first run shows
// whatever the slack cost. Measured on the reference networks: a slack of
// up to 8 saves 46 % of network A's steps (35 % over all five) and moves
// no compared quantity by more than a twentieth of its budget. Up to 16
// saves another 11 % of network A's steps (7 % over all five) and leaves
// every network's worst quantity where it was (network D's from 0.65 to
// 0.68 of its budget); the sine-driven RC of TestAdaptiveMeetsAccuracy, a
// circuit whose memory carries a mid-range error to its later extremes,
// goes from 0.184 % to 0.192 % off. Up to 32 would save 4 % more of
// network A's steps but leave that RC 0.196 % off, too near its 0.2 %.
//
// A circuit with a transmission line solved by its characteristics gets
// no slack: the line is the longest memory there is, a lossless store of
// every wave that entered it, delivered whole one delay later at the
// other end and again after each reflection. An error made in the middle
// of a port's range travels to the far end and back, and the node that
// meets it there differentiates it (a clamp's lead inductance turns a
// milliampere that changes in ten picoseconds into tens of millivolts).
// On testdata/signal-connector.zap (a 380 ps line between a clamp and a
// pin) the slack left the pin's peak current and lowest voltage 0.2–0.34 %
// off at 8 kV and 4 kV; without it every one is within 0.2 %, for 28 %
// more steps on that deck alone.
//
// During a stimulus edge (see edgeSpan) the bound is edgeShare of itself,
// without slack: what the circuit does just after an edge (the undershoot
// and rebound when a pulse ends) depends on the phase of all its ringing at
// the corner, and edges are short.
//
// localShare, SideFloor, edgeShare and the slack were calibrated on the
// reference networks of testdata/reference (mna/reference_test.go): with
// them every compared quantity stays within Accuracy with a margin.
const (
	localShare = 0.1
	edgeShare  = 0.02
	slackK     = 1000.0
	slackMax   = 16.0
)

// SideFloor is the smallest scale of a value's side of zero, as a share of
// its largest magnitude on either side: the accuracy of a highest or
// lowest value is stated relative to the largest magnitude on its side,
// and at least SideFloor of the largest on both. A far-side excursion of a
// hundredth of a node's swing (a pin that dips to −0.4 V after +99 V, the
// difference of its clamp's 13 V and its inductance's −13.4 V) is held to
// a share of a twentieth of the swing: holding it to a share of itself
// would hold those 13 V to a share of 0.4 V.
const SideFloor = 0.05

// PinCurrentFactor is how much looser than Accuracy a protected pin's
// currents are stated: its peak current and the peak of its internal-path
// current. The internal path is an exponential of the pin's voltage
// behind an rs of an ohm or so, and the current into the pin's input
// capacitance is the derivative of that voltage: the error a run leaves in
// the pin's voltage (its phase over a sub-nanosecond ringing) comes back
// several times larger in both. On the front-panel demo at 2 kV a pin dip
// 0.04 % off gives an internal-path current 0.29 % off (0.16 % at half
// the accuracy, for 1.7 times the steps).
// The references hold it to the same bound (mna/reference_test.go).
const PinCurrentFactor = 5.0

// newtonShare is Newton's relative tolerance as a share of the local error
// per step: the iteration error must stay below the truncation error the
// step control allows, or it would decide the answer [practice: a tenth].
const newtonShare = 0.1

// scaleFloor is the smallest scale of an unknown, V or A: signals below a
// millivolt or a milliampere are of no consequence to a protection network,
// so their relative accuracy buys nothing.
const scaleFloor = 1e-3

// edgeSpan is the longest interval between two breakpoints of a stimulus
// that counts as an edge, as a fraction of the stimulus's span: a pulse's
// rise and fall (0.5 ns of a 75 ns pulse), not its flat top.
const edgeSpan = 0.02

// firstFraction is the first step after t = 0 and after every breakpoint, as
// a fraction of the interval it starts (itself at most the step bound). That
// step is backward Euler without an error estimate (there is no history), so
// it must be small enough that its first-order error is negligible; the
// error control then grows the step at most 2× a step.
const firstFraction = 1e-4

// floorShare is the smallest step the error control asks for, as a share
// of the stimulus's time scale (Stimulus.Scale: 60 fs for the 200 ns of an
// ESD strike); the first step after a breakpoint is no shorter either,
// unless the interval it starts is. Nothing in a protection network moves
// on a shorter scale, and steps much shorter make the circuit's matrix
// numerically singular wherever capacitors tie nodes to each other but
// only inductors tie them to the rest (a line's clamp, filter and pin
// returning through a connector's ground pins): at a femtosecond step the
// capacitors' Alpha·C outweighs the inductors' 1/(Alpha·L) by the whole
// precision of a float64, and the iterates of those nodes are noise.
const floorShare = 3e-7

// The step-size controller. After an accepted step with error ratio r (error
// over tolerance) the next step is
//
//	h·safety·r^(−kI/3)·rPrev^(kP/3):
//
// the proportional-integral controller, which follows the error's trend as
// well as its size and so keeps the step from oscillating between
// acceptance and rejection on a ringing circuit [pub: Gustafsson 1991;
// Hairer & Wanner, Solving ODEs II, IV.2, with kI = 0.7, kP = 0.4]; the 3
// is the order plus one. A step grows at most maxGrow and a rejected one
// shrinks at most to minShrink of itself.
const (
	safety    = 0.9
	kI        = 0.7
	kP        = 0.4
	maxGrow   = 2.0
	minShrink = 0.2
	rFloor    = 1e-2
)

// The step is TR-BDF2 [pub: Bank et al. 1985; Hosea & Shampine 1996]: a
// trapezoidal stage over gamma·h, then a second-order backward
// differentiation stage over the rest through the three points. It is
// second order like the trapezoidal rule, and L-stable: whatever the
// trapezoidal rule would leave ringing from step to step (a stiff
// junction, the voltage across an inductor whose current a source forces,
// a derivative that jumps at a corner) the second stage damps within the
// step, so no backward-Euler step is needed inside a ringing, where it
// would take (ω·h)²/2 of the amplitude. A resolved ringing loses about
// (ω·h)⁴/3000 of its amplitude a step (3e-5 at 25 steps a period): the
// pin's sub-nanosecond ringing keeps its peaks. With gamma = 2 − √2 both
// stages have the same matrix coefficient, so they can share one
// factorisation, and the truncation error constant is the smallest of the
// family.
const gamma = 2 - math.Sqrt2

// lteC is the constant of TR-BDF2's local truncation error, C·h³·q‴
// [pub: Bank et al. 1985, with gamma as above: about −0.0404].
const lteC = (-3*gamma*gamma + 4*gamma - 2) / (12 * (2 - gamma))

// Transient solves the circuit struck by stim with polarity sign (+1 or −1)
// from the operating point to the stop time. A nil stim solves the circuit
// with its strike off (a supply's response alone); a nil set means every
// default. The result carries the solver's statistics and its status; on a
// failure it comes back with the error, holding the statistics of the work
// done.
//
// The initial state is the operating point (strike off, supplies on): its
// charges and fluxes, with zero derivatives. The first step after t = 0 and
// after each breakpoint is a small backward-Euler step, which sets the
// derivatives the corner left behind; every other step is a TR-BDF2 step
// (see gamma) solved by Newton from values extrapolated from the last
// points. The step follows the local truncation error of every charge and
// flux, mapped through the circuit's matrix onto the unknowns (see
// Settings.Accuracy); a step whose error is too large, or whose Newton
// iteration fails, is shrunk and retried. Breakpoints of the stimulus are
// hit exactly. Both points of a step, the stage's and the end's, are
// reported (Observe, Record): the first lies at gamma·h, so the points of a
// run come in uneven pairs. The energy ledger integrates Σ v·i of every
// element over the reported points.
//
// Transient resets the system first, so one System serves any number of
// runs; it allocates per run, never per step (unless Record keeps the
// waveforms). Runs are reproducible bit for bit.
func (s *System) Transient(stim *waveforms.Stimulus, sign float64, set *Settings) (*Result, error) {
	start := time.Now()
	if err := s.setStimulus(stim, sign); err != nil {
		return nil, err
	}
	r := run{s: s, start: start}
	if err := r.configure(set); err != nil {
		return nil, err
	}
	res := r.res
	s.reset()
	dcIt, err := s.operatingPoint(&r.t)
	res.Stats.DCNewton = dcIt
	if err != nil {
		return res.fail(start), err
	}
	r.startPoint()
	r.begin()
	for loop := 0; r.now < r.stop; loop++ {
		if r.cfg.Context != nil && loop%checkEvery == 0 {
			if err := r.cfg.Context.Err(); err != nil {
				res.fail(start).Status = Interrupted
				return res, fmt.Errorf("mna: %w at %s: %w", ErrInterrupted, spec.FormatSI(r.now, "s"), err)
			}
		}
		if err := r.step(); err != nil {
			return res.fail(start), err
		}
	}
	return r.finish(), nil
}

// run is one transient solution under way: its settings as the step loop
// reads them, and what the loop carries from one step to the next.
type run struct {
	s     *System
	res   *Result
	cfg   Settings
	t     tol
	start time.Time

	stop      float64   // the end of the run, s
	maxStep   float64   // the longest step: Resolve, MaxStep, the devices' bounds
	minStep   float64   // the step below which the run gives up
	fixed     float64   // Settings.FixedStep: no error control when positive
	stimScale float64   // the stimulus's time scale, 0 without a stimulus
	hFloor    float64   // the step below which the error control no longer rejects (see begin)
	bps       []float64 // the stimulus's breakpoints

	now     float64 // time of the last accepted point
	h       float64 // the step to try next
	bi      int     // next candidate breakpoint in bps
	restart bool    // the next step is the backward-Euler step after a corner
	logPrev float64 // log of the error ratio of the last accepted step (PI memory)
}

// configure reads the run's settings (nil: every default): the stop time,
// the bounds of the step and the tolerances; and it makes the result.
func (r *run) configure(set *Settings) error {
	s := r.s
	if set != nil {
		r.cfg = *set
	}
	r.t = tolerances(set)
	stop := r.cfg.Stop
	if stop <= 0 && s.stim != nil {
		stop = s.stim.Stop
	}
	if !(stop > 0) || math.IsInf(stop, 0) {
		return errors.New("mna: no stop time: give one in the settings or set a stimulus with a default span")
	}
	maxStep := stop / 50
	for _, m := range []float64{r.cfg.Resolve, r.cfg.MaxStep} {
		if m > 0 && m < maxStep {
			maxStep = m
		}
	}
	for _, d := range s.devs {
		if d.limiter != nil {
			if m := d.limiter.MaxStep(); m > 0 {
				maxStep = min(maxStep, m)
				// A line solved by its characteristics is a memory: see
				// slackMax.
				r.t.slackMax = 1
			}
		}
	}
	r.stop, r.maxStep = stop, maxStep
	r.minStep = r.cfg.MinStep
	if r.minStep <= 0 {
		r.minStep = 1e-16
	}
	r.fixed = r.cfg.FixedStep
	if s.stim != nil {
		r.stimScale = s.stim.Scale()
	}

	ne := len(s.devs)
	res := &Result{Energy: make([]float64, ne), Gross: make([]float64, ne), PeakCurrent: make([]float64, ne), TPeakCurrent: make([]float64, ne), Stop: stop}
	if r.cfg.Record {
		res.V = make([][]float64, len(s.nodeNames))
		res.I = make([][]float64, ne)
		res.P = make([][]float64, len(s.probes))
	}
	r.res = res
	return nil
}

// first is the first step after t = 0 and after each breakpoint, in an
// interval of the length given.
func (r *run) first(interval float64) float64 {
	h := min(r.maxStep, interval) * firstFraction
	if r.cfg.FirstStep > 0 {
		h = min(h, r.cfg.FirstStep)
	} else if r.stimScale > 0 {
		// The stimulus's own time scale (one pulse's, for a train),
		// not a window stretched for a slow circuit, sets how fine the
		// first step must be.
		h = min(h, r.stimScale/50*firstFraction)
	}
	return max(h, r.minStep, min(floorShare*r.stimScale, 0.01*interval))
}

// nextTarget is the next breakpoint after now (or the stop time), and
// whether it is a breakpoint.
func (r *run) nextTarget() (float64, bool) {
	for r.bi < len(r.bps) && r.bps[r.bi] <= r.now+r.minStep {
		r.bi++
	}
	if r.bi < len(r.bps) && r.bps[r.bi] < r.stop-r.minStep {
		return r.bps[r.bi], true
	}
	return r.stop, false
}

// startPoint makes the operating point the run's first accepted point:
// its values the first scales and extremes, its charges and fluxes the
// first history, with zero derivatives.
func (r *run) startPoint() {
	s := r.s
	s.ctx.DC = false
	s.factorisations = 0
	s.eta = [2]float64{1, 1}

	copy(s.xAcc, s.x)
	for i, v := range s.x {
		s.xScale[i] = max(scaleFloor, math.Abs(v))
	}
	copy(s.xMax, s.x)
	copy(s.xMin, s.x)
	for k := range s.pairScale {
		s.pairScale[k] = scaleFloor
	}
	copy(s.qAcc, s.q)
	clear(s.qdotAcc)
	s.pushPoint(0, s.x, s.q, true)
	s.accept(r.res, &r.cfg, s.x, s.termCur, 0, 0, true, true)
}

// begin sets the step loop up at t = 0: the first step, a backward-Euler
// restart, and the floor of the error control.
func (r *run) begin() {
	r.now = 0
	r.bi = 0
	if r.s.stim != nil {
		r.bps = r.s.stim.Breakpoints
	}
	target, _ := r.nextTarget()
	r.h = r.first(target)
	if r.fixed > 0 {
		r.h = min(r.h, r.fixed)
	}
	// hFloor is the step below which the error control no longer rejects:
	// a hundredth of the first step, which is taken with no estimate at all,
	// and no less than floorShare of the stimulus's scale (and, unless
	// MinStep is set, no less than twice the minimum step).
	// Where a node without capacitance is held by a junction that switches
	// off (a clamp fed through an inductor, its current running out), or
	// where a spark's resistance collapses, a value moves on a time scale
	// that shrinks as it goes: a corner in all but name. The estimate of a
	// step across it is a fixed share of the move however short the step,
	// and without a floor the run would stop there.
	r.hFloor = max(r.first(r.stop)/100, floorShare*r.stimScale)
	if r.cfg.MinStep <= 0 {
		r.hFloor = max(r.hFloor, 2*r.minStep)
	}
	r.restart = true
	r.logPrev = 0
}

// step tries one step from r.now. A step that Newton or the error control
// rejects is counted and leaves a shorter r.h to retry with; an accepted
// one is booked and sets r.h for the next. An error ends the run: the
// step fell below the minimum.
func (r *run) step() error {
	hs, tNew, corner, err := r.plan()
	if err != nil {
		return err
	}
	if st := r.solve(hs, tNew); st != converged {
		if r.reject(hs / 2) {
			return r.s.solveError(r.now, st)
		}
		return nil
	}
	grow, ok, err := r.control(hs)
	if !ok {
		return err
	}
	r.acceptStep(tNew, corner)
	r.advance(hs, grow, corner)
	return nil
}

// plan sizes the step to try, hs to tNew: r.h within the step bound,
// ending exactly on the next breakpoint or the stop time when it reaches
// it, and at most half the way there when it would stop just short, which
// leaves two even steps instead of a sliver. corner says it ends on a
// breakpoint. It also tells the tolerances whether the step lies in a
// stimulus edge.
func (r *run) plan() (hs, tNew float64, corner bool, err error) {
	s := r.s
	target, isBP := r.nextTarget()
	hs = min(r.h, r.maxStep)
	rem := target - r.now
	hit := false
	if hs >= rem {
		hs, hit = rem, true
	} else if hs > 0.5*rem {
		hs = 0.5 * rem
	}
	if hs < r.minStep {
		return 0, 0, false, s.solveError(r.now, notConverged, "the time step fell below the minimum step")
	}
	tNew = r.now + hs
	if hit {
		tNew = target
	}
	corner = hit && isBP
	// A stimulus edge: the interval between the last breakpoint and the
	// next is short against the stimulus's span.
	bi, bps := r.bi, r.bps
	r.t.setEdge(bi > 0 && bi < len(bps) && s.stim != nil && bps[bi]-bps[bi-1] < edgeSpan*s.stim.Stop)
	return hs, tNew, corner, nil
}

// solve solves the step from r.now to tNew, of length hs: a backward-Euler
// step after a corner, otherwise a TR-BDF2 step, whose trapezoidal stage
// it keeps in s.xG, s.qG, s.termG and s.stageT.
func (r *run) solve(hs, tNew float64) newtonStatus {
	s, c := r.s, &r.s.ctx
	qn := s.qAcc[:len(s.q)]
	if r.restart {
		// Backward Euler: q' = (q − q_n)/h.
		c.Alpha = 1 / hs
		for k, q := range qn {
			s.hist[k] = -q / hs
		}
		s.noiseOK = false
		c.T = tNew
		s.predict(tNew, false)
		it, st := s.newton(&r.t, r.t.gmin, false)
		r.res.Stats.Newton += it
		return st
	}
	const a2 = (1 - gamma) * (1 - gamma) / (gamma * (2 - gamma))
	const a1 = 1 / (gamma * (2 - gamma))
	// TR-BDF2: the trapezoidal stage to now + gamma·hs, ...
	h1 := gamma * hs
	c.Alpha = 2 / h1
	for k, q := range qn {
		s.hist[k] = -c.Alpha*q - s.qdotAcc[k]
	}
	s.noiseOK = false
	c.T = r.now + h1
	s.predict(c.T, false)
	it, st := s.newton(&r.t, r.t.gmin, false)
	r.res.Stats.Newton += it
	if st != converged {
		return st
	}
	copy(s.xG, s.x)
	copy(s.qG, s.q)
	copy(s.termG, s.termCur)
	s.stageT = c.T
	// ... then second-order backward differentiation through
	// q_n, q_G and the end: q' = Alpha·(q − a1·q_G + a2·q_n),
	// the same Alpha.
	for k, q := range qn {
		s.hist[k] = c.Alpha * (a2*q - a1*s.qG[k])
	}
	s.noiseOK = false
	c.T = tNew
	s.predict(tNew, true)
	it, st = s.newton(&r.t, r.t.gmin, true)
	r.res.Stats.Newton += it
	return st
}

// reject counts a rejected step and sets h as the step to retry with;
// tooShort says h is below the minimum step, and the run must stop.
func (r *run) reject(h float64) (tooShort bool) {
	r.res.Stats.Rejected++
	r.h = h
	r.logPrev = 0
	return h < r.minStep
}

// control judges a solved step of length hs by its error estimate (the
// restart after a corner and a fixed step go unjudged). A rejected step
// (ok false) leaves a shorter r.h to retry with, or err when that is below
// the minimum step; an accepted one gives grow, the next step's factor
// over this one.
func (r *run) control(hs float64) (grow float64, ok bool, err error) {
	grow = maxGrow
	if r.fixed > 0 || r.restart {
		return grow, true, nil
	}
	ratio, have := r.s.errorRatio(hs, &r.t)
	if !have {
		return grow, true, nil
	}
	if ratio > 1 && hs > r.hFloor {
		if r.reject(max(r.hFloor, hs*max(minShrink, safety*math.Exp(-math.Log(ratio)/3)))) {
			return 0, false, r.s.truncationError(r.now)
		}
		return 0, false, nil
	}
	// Far below its bound the estimate is rounding, and its
	// trend from one step to the next means nothing.
	lr := math.Log(max(ratio, rFloor))
	if ratio > rFloor {
		grow = min(maxGrow, safety*math.Exp((-kI*lr+kP*r.logPrev)/3))
	}
	r.logPrev = lr
	if ratio > 1 {
		// Accepted at the floor: try the floor again.
		grow, r.logPrev = r.hFloor/hs, 0
	}
	return grow, true, nil
}

// acceptStep books an accepted step ending at tNew: the stage's point,
// then the end's, which becomes the last accepted solution.
func (r *run) acceptStep(tNew float64, corner bool) {
	s := r.s
	if !r.restart {
		s.pushPoint(s.stageT, s.xG, s.qG, false)
		s.scaleWith(s.xG)
		s.accept(r.res, &r.cfg, s.xG, s.termG, s.stageT, s.stageT-r.now, false, false)
		r.now = s.stageT
	}
	copy(s.qAcc, s.q)
	copy(s.qdotAcc, s.qdot)
	copy(s.xAcc, s.x)
	s.scaleWith(s.x)
	s.pushPoint(tNew, s.x, s.q, corner)
	s.accept(r.res, &r.cfg, s.x, s.termCur, tNew, tNew-r.now, false, corner)
	r.now = tNew
	r.res.Stats.Steps++
}

// advance sets r.h after an accepted step of length hs: a restart after
// a corner, twice a restart, or the step grown by grow.
func (r *run) advance(hs, grow float64, corner bool) {
	switch {
	case corner:
		r.restart = true
		r.logPrev = 0
		next, _ := r.nextTarget()
		r.h = r.first(next - r.now)
	case r.restart:
		// The step after backward Euler takes twice its length: its
		// estimate needs the restart's point, and one of that size is
		// as safe as the restart.
		r.restart = false
		r.h = 2 * hs
		r.logPrev = 0
	default:
		r.h = hs * grow
	}
	if r.fixed > 0 {
		r.h = r.fixed
	}
}

// finish completes the result of a run that reached its stop time.
func (r *run) finish() *Result {
	s, res := r.s, r.res
	for i := range s.curTr {
		res.PeakCurrent[i], res.TPeakCurrent[i] = s.curTr[i].AbsPeak()
	}
	for _, e := range res.Energy {
		res.Balance += e
	}
	res.Stats.Factorisations = s.factorisations
	res.Stats.Wall = time.Since(r.start)
	res.Status = Completed
	return res
}

// checkEvery is how many passes of the step loop go between two looks at
// the context: a pass costs microseconds, a look tens of nanoseconds.
const checkEvery = 16

// fail marks a run that stopped on an error, keeping its statistics.
func (r *Result) fail(start time.Time) *Result {
	r.Stats.Wall = time.Since(start)
	r.Status = Failed
	return r
}

// scaleWith raises each unknown's scale to its magnitude in x.
func (s *System) scaleWith(x []float64) {
	sc := s.xScale[:len(x)]
	for i, v := range x {
		if a := math.Abs(v); a > sc[i] {
			sc[i] = a
		}
		if v > s.xMax[i] {
			s.xMax[i] = v
		}
		if v < s.xMin[i] {
			s.xMin[i] = v
		}
	}
	for k, p := range s.pairs {
		if a := math.Abs(x[p[0]] - x[p[1]]); a > s.pairScale[k] {
			s.pairScale[k] = a
		}
	}
}

// pushPoint adds a reported point to the history of the predictor and the
// error estimate; a corner starts the history afresh with that point.
func (s *System) pushPoint(t float64, x, q []float64, corner bool) {
	n := len(s.hx)
	s.hHead = (s.hHead + 1) % n
	copy(s.hx[s.hHead], x)
	copy(s.hq[s.hHead], q)
	s.ht[s.hHead] = t
	if corner {
		s.hLen = 1
	} else {
		s.hLen = min(s.hLen+1, n)
	}
}

// point is the k-th newest reported point (k = 0 the newest).
func (s *System) point(k int) (t float64, x, q []float64) {
	j := (s.hHead - k + len(s.hx)) % len(s.hx)
	return s.ht[j], s.hx[j], s.hq[j]
}

// predict sets Newton's starting point at tNew: the polynomial through the
// last reported points since the last corner (up to three; a line through
// two, the last point alone), the newest being, with stage, the TR-BDF2
// step's trapezoidal stage in s.xG.
func (s *System) predict(tNew float64, stage bool) {
	var ts [3]float64
	var xs [3][]float64
	m := 0
	if stage {
		ts[0], xs[0] = s.stageT, s.xG
		m = 1
	}
	for k := 0; k < s.hLen && m < 3; k++ {
		ts[m], xs[m], _ = s.point(k)
		m++
	}
	x := s.x[:len(s.xAcc)]
	switch m {
	case 1:
		copy(x, xs[0])
	case 2:
		f := (tNew - ts[0]) / (ts[0] - ts[1])
		x0, x1 := xs[0][:len(x)], xs[1][:len(x)]
		for i := range x {
			x[i] = x0[i] + f*(x0[i]-x1[i])
		}
	default:
		t0, t1, t2 := ts[0], ts[1], ts[2]
		w0 := (tNew - t1) * (tNew - t2) / ((t0 - t1) * (t0 - t2))
		w1 := (tNew - t0) * (tNew - t2) / ((t1 - t0) * (t1 - t2))
		w2 := (tNew - t0) * (tNew - t1) / ((t2 - t0) * (t2 - t1))
		x0, x1, x2 := xs[0][:len(x)], xs[1][:len(x)], xs[2][:len(x)]
		for i := range x {
			x[i] = w0*x0[i] + w1*x1[i] + w2*x2[i]
		}
	}
}

// errorRatio is the largest ratio of estimated local error to tolerance
// over the unknowns for the TR-BDF2 step of length h just solved (its
// stage in s.qG at s.stageT), and have = false when too few points since
// the last corner allow an estimate.
//
// Each charge's truncation error is C·h³·q‴ (lteC), q‴ being six times the
// third divided difference of the charge over the step's stage, its end
// and the two points reported before them. The charges, not their
// derivatives: a derivative that a corner or a singular start (the t^1.8
// onset of the contact-discharge current) left wrong would otherwise enter
// every later estimate as an error no step could reduce. A charge computed
// with an error d enters its rows as a companion current off by Alpha·d;
// the error that leaves in the solution is the matrix's answer to those
// currents, J⁻¹·(Alpha·d), found with the factors Newton left (those of
// this step or of a recent one: an estimate needs no more). Mapping the
// errors this way weighs each by its effect on the voltages and currents a
// report reads, and filters out the stiff parts (a conducting junction's
// charge, whose error its own conductance absorbs) that a test on the
// charges themselves would chase with ever smaller steps [pub: Hosea &
// Shampine 1996 filter TR-BDF2's estimate the same way]. Each unknown's
// error is then held to its bound (see localShare). The unknown of the
// largest ratio is left in s.lteWorst.
func (s *System) errorRatio(h float64, t *tol) (r float64, have bool) {
	if s.hLen < 2 {
		return 0, false
	}
	t0, _, q0 := s.point(1)
	t1, _, q1 := s.point(0)
	t2, q2 := s.stageT, s.qG
	t3 := t1 + h
	r10, r21, r32 := 1/(t1-t0), 1/(t2-t1), 1/(t3-t2)
	r20, r31, r30 := 1/(t2-t0), 1/(t3-t1), 1/(t3-t0)
	f := -6 * lteC * h * h * h * r30
	lte := s.lte[:len(s.q)]
	q0, q1, q2 = q0[:len(lte)], q1[:len(lte)], q2[:len(lte)]
	for k, q3 := range s.q[:len(lte)] {
		d10 := (q1[k] - q0[k]) * r10
		d21 := (q2[k] - q1[k]) * r21
		d32 := (q3 - q2[k]) * r32
		lte[k] = f * ((d32-d21)*r31 - (d21-d10)*r20)
	}
	e := s.errx
	clear(e)
	a := s.ctx.Alpha
	for k, rw := range s.rows {
		d := a * lte[k]
		if rw.Plus >= 0 {
			e[rw.Plus] += d
		}
		if rw.Minus >= 0 {
			e[rw.Minus] -= d
		}
	}
	s.lu.solve(e)
	rel := t.rel
	if t.edge {
		rel *= edgeShare
	}
	x, xo := s.x[:len(e)], s.xAcc[:len(e)]
	hi, lo, sc := s.xMax[:len(e)], s.xMin[:len(e)], s.xScale[:len(e)]
	wmax := t.slackMax
	if t.edge {
		wmax = 1
	}
	for i, v := range e {
		b := scaleOf(x[i], xo[i], hi[i], lo[i], SideFloor*sc[i])
		tl := rel*b*slack(x[i], hi[i], lo[i], b, wmax) + t.abs
		if a := math.Abs(v); a > r*tl {
			r, s.lteWorst = a/tl, i
		}
	}
	for k, p := range s.pairs {
		d := e[p[0]] - e[p[1]]
		tl := rel*max(s.pairScale[k], math.Abs(x[p[0]]-x[p[1]])) + t.abs
		if a := math.Abs(d); a > r*tl {
			r, s.lteWorst = a/tl, p[0]
		}
	}
	// A probe's error is its reading at the solution plus the solution's
	// error less its reading at the solution: a pin's internal-path
	// current is an exponential of the pin's voltage, and an error of a
	// part in a thousand of that voltage is a few percent of the current.
	if len(s.probers) > 0 {
		xe := s.xe[:len(e)]
		for i, v := range e {
			xe[i] = x[i] + v
		}
		for _, di := range s.probers {
			d := &s.devs[di]
			lo, hi := d.probeBase, d.probeBase+d.nProbe
			d.prober.Probe(x, s.pAt[lo:hi])
			d.prober.Probe(xe, s.pEr[lo:hi])
			for k := lo; k < hi; k++ {
				v, vh, vl := s.pAt[k], s.pHi[k], s.pLo[k]
				b := scaleOf(v, v, vh, vl, SideFloor*max(vh, -vl))
				tl := rel*b*slack(v, vh, vl, b, wmax) + t.abs
				if a := math.Abs(s.pEr[k] - v); a > r*tl {
					r, s.lteWorst = a/tl, worstOf(d.term)
				}
			}
		}
	}
	if t.charge > 0 {
		for k, d := range lte {
			tl := t.rel*math.Abs(s.q[k]) + t.charge
			if a := math.Abs(d); a > r*tl {
				r, s.lteWorst = a/tl, -1-k
			}
		}
	}
	return r, true
}

// slack is the factor w of an unknown's bound (see localShare): 1 near an
// extreme it has reached, up to wmax in the middle of its range [lo, hi],
// b being its scale.
func slack(x, hi, lo, b, wmax float64) float64 {
	if d := min(hi-x, x-lo); d > 0 && wmax > 1 {
		d /= b
		return min(1+slackK*d*d, wmax)
	}
	return 1
}

// worstOf is the unknown a device's error is reported on: its first
// terminal off ground.
func worstOf(term []int) int {
	for _, n := range term {
		if n >= 0 {
			return n
		}
	}
	return 0
}

// scaleOf is the scale of an unknown whose value is x (xo before the step),
// which has reached hi and lo so far and whose largest magnitude times
// SideFloor is floor: the largest magnitude on the side of zero where x
// lies, at least |x|, |xo| and floor (see localShare). The caller forms
// floor, which keeps this small enough to be inlined into the loops over
// the unknowns that call it at every step.
//
// A value nearer zero than the other side's scale is on its way to that
// side as much as to its own, and an error made there is still in it when
// it crosses: it is held to the smaller of the two scales. A connector pin
// that peaks at +99 V and then falls through zero to −0.4 V (the near
// cancellation of its clamp's 13 V and its pin inductance's −13.4 V) is
// held, on the way down through the last volts, to the −0.4 V side's scale
// (at least a twentieth of 99 V), not to the 99 V it left behind.
func scaleOf(x, xo, hi, lo, floor float64) float64 {
	side, other := hi, -lo
	if x < 0 {
		side, other = other, side
	}
	ax := math.Abs(x)
	if other = max(other, floor); ax < other {
		side = min(side, other)
	}
	return max(side, ax, math.Abs(xo), floor, scaleFloor)
}

// truncationError is the error of a step that the error control keeps
// rejecting at the minimum step. It names the element whose charge or flux
// error weighs most on the worst unknown: each state's error of the last
// estimate mapped alone (a costly search, but only on the way out).
func (s *System) truncationError(now float64) *SolveError {
	e := s.solveError(now, notConverged, "the truncation error stays too large at the minimum step")
	worst := -1
	if s.lteWorst < 0 {
		worst = -1 - s.lteWorst
	} else {
		big := -1.0
		for k, rw := range s.rows {
			clear(s.errx)
			d := s.ctx.Alpha * s.lte[k]
			if rw.Plus >= 0 {
				s.errx[rw.Plus] += d
			}
			if rw.Minus >= 0 {
				s.errx[rw.Minus] -= d
			}
			s.lu.solve(s.errx)
			if a := math.Abs(s.errx[s.lteWorst]); a > big {
				big, worst = a, k
			}
		}
	}
	if worst >= 0 {
		who := s.elements[s.stateDev[worst]]
		e.Where = "element " + who
		e.Hint = "try a finer resolve= in the window statement, or add series resistance to " + who
	}
	return e
}

// accept books an accepted point: element currents and powers, the energy
// ledger over the step h, peaks, probes, the devices' Acceptors, Observe and
// Record. corner says the point is t = 0 or a breakpoint; first that it is
// the operating point, whose powers the gross ledger is counted from.
//
// The ledger takes each terminal's voltage and current averaged over the
// step: Σ h·v̄·ī. For a linear capacitor or inductor integrated by the
// trapezoidal rule that sum is exactly the change of its stored energy
// (v̄·h·ī = v̄·Δq, and the rule makes h·ī = Δq), so an element that ends as
// it began gets zero, as it must; the trapezoidal sum of v·i instead left
// an alternating error of the rule's forced derivatives in it (an
// inductor carrying the strike current booked 1e5 times its true entry).
// For a resistor or a clamp both sums are second order.
func (s *System) accept(res *Result, cfg *Settings, x, termCur []float64, now, h float64, first, corner bool) {
	pt := &s.pt
	pt.T = now
	pt.Corner = corner
	for i, k := range s.nodeIdx {
		pt.V[i] = x[k]
	}
	// The ledger's slices in locals, as in take.
	energy, gross, power0, stepEnergy := res.Energy, res.Gross, s.power0, s.stepEnergy
	for di := range s.devs {
		d := &s.devs[di]
		e, p := 0.0, 0.0
		lo, hi := d.curBase, d.curBase+len(d.term)
		cur, tv, ti := termCur[lo:hi], s.termV[lo:hi], s.termI[lo:hi]
		for t, r := range d.term {
			v, i := 0.0, cur[t]
			if r >= 0 {
				v = x[r]
			}
			e += (v + tv[t]) * (i + ti[t])
			p += v * i
			tv[t], ti[t] = v, i
		}
		se := 0.0
		if first {
			power0[di] = p
		} else {
			se = 0.25 * h * e
			energy[di] += se
			gross[di] += math.Abs(se - power0[di]*h)
		}
		stepEnergy[di] = se
		pt.W[di] = p
		i := 0.0
		switch {
		case len(cur) > 0 && d.term[0] >= 0:
			i = cur[0]
		case len(cur) > 1:
			i = -cur[1]
		}
		pt.I[di] = i
		s.curTr[di].Add(now, i)
		if corner {
			s.curTr[di].Corner()
		}
		if d.prober != nil {
			lo, hi := d.probeBase, d.probeBase+d.nProbe
			d.prober.Probe(x, pt.P[lo:hi])
			// Each probe's range, for its error bound (errorRatio).
			for k := lo; k < hi; k++ {
				if v := pt.P[k]; first || v > s.pHi[k] {
					s.pHi[k] = v
				}
				if v := pt.P[k]; first || v < s.pLo[k] {
					s.pLo[k] = v
				}
			}
		}
		if d.acceptor != nil {
			d.acceptor.Accept(now, x)
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
