package mna

import (
	"math"

	"zapnet/devices"
)

// tol are the tolerances of one solution, defaults filled in.
type tol struct {
	rel     float64 // local error per step, relative to each unknown's scale
	newton  float64 // Newton's relative tolerance
	abs     float64 // V and A
	charge  float64 // the optional test of ChargeTol, C or Wb; 0: none
	current float64 // A
	gmin    float64 // S
	maxIter int
	edge    bool // the step lies on a stimulus edge (see edgeShare)
	newton0 float64
	// slackMax is the largest slack of the error control (see slackK).
	slackMax float64
}

// setEdge tightens Newton's tolerance on a stimulus edge as the error
// control tightens its bound there: Newton's error must stay below the
// truncation error allowed, or it would decide the estimate.
func (t *tol) setEdge(on bool) {
	t.edge = on
	t.newton = t.newton0
	if on {
		t.newton *= edgeShare
	}
}

// currentTol is the absolute tolerance on the KCL residual, A. It is far
// below the milliampere currents that matter for a protected pin and well
// above the rounding of the ampere-scale currents of a strike.
const currentTol = 1e-9

// roundoff is the relative rounding allowed on the terms that cancel in a
// state derivative: 16 ulps.
const roundoff = 16 * 0x1p-52

func tolerances(set *Settings) tol {
	t := tol{rel: localRel(DefaultAccuracy), abs: 1e-6, current: currentTol, gmin: 1e-12, maxIter: 50,
		slackMax: slackOf(DefaultAccuracy)}
	if set == nil {
		t.newton = newtonShare * t.rel
		t.newton0 = t.newton
		return t
	}
	if set.Accuracy > 0 {
		t.rel = localRel(set.Accuracy)
		t.slackMax = slackOf(set.Accuracy)
	}
	if set.RelTol > 0 {
		t.rel = set.RelTol
	}
	t.newton = newtonShare * t.rel
	t.newton0 = t.newton
	if set.AbsTol > 0 {
		t.abs = set.AbsTol
	}
	if set.ChargeTol > 0 {
		t.charge = set.ChargeTol
	}
	if set.Gmin > 0 {
		t.gmin = set.Gmin
	}
	if set.MaxIter > 0 {
		t.maxIter = set.MaxIter
	}
	return t
}

// denseMax is the largest circuit whose devices stamp into a dense
// Jacobian (see System.dense): up to here clearing n² numbers and gathering
// the pattern from them costs less than adding in each device's block.
const denseMax = 64

// slackOf is the largest slack of the error control for an Accuracy: full
// at the default and above, fading as the square of Accuracy below it.
func slackOf(acc float64) float64 {
	f := min(1, acc/DefaultAccuracy)
	return 1 + (slackMax-1)*f*f
}

// localRel is the error control's relative bound per step for an
// Accuracy (see localShare).
func localRel(acc float64) float64 {
	return localShare * acc * math.Sqrt(acc/DefaultAccuracy)
}

// assemble evaluates every device at s.x into F and the Jacobian's
// entries, forms the state derivatives and adds them, and adds the shunt
// conductances. Along the way it records each device's terminal currents
// (its own stamps on its terminal rows, with its states' below) and each
// device's contribution to each of its rows, from which setScale forms
// the rows' largest single contributions if the residual is tested.
func (s *System) assemble(g float64) {
	clear(s.f)
	s.scaleOK = false
	c := &s.ctx
	c.Limited = false
	c.NSlopes = 0
	if s.dense != nil {
		s.stampDense()
	} else {
		s.stampLocal()
	}
	f := s.f
	if c.DC {
		clear(s.qdot)
	} else {
		// The slices and Alpha in locals, as in take.
		alpha, cur, q := c.Alpha, s.termCur, s.q
		hist, qdot, st := s.hist[:len(q)], s.qdot[:len(q)], s.stateTerm[:len(q)]
		for k, r := range s.rows[:len(q)] {
			qd := alpha*q[k] + hist[k]
			qdot[k] = qd
			if r.Plus >= 0 {
				f[r.Plus] += qd
			}
			if r.Minus >= 0 {
				f[r.Minus] -= qd
			}
			if t := st[k][0]; t >= 0 {
				cur[t] += qd
			}
			if t := st[k][1]; t >= 0 {
				cur[t] -= qd
			}
		}
	}
	jac, diag, x := s.jacBuf, s.jacDiag, s.x
	for _, i := range s.nodeRows {
		f[i] += g * x[i]
		jac[diag[i]] += g
	}
}

// stampDense evaluates the devices into the dense Jacobian (which the
// factorisation and the residual test read through jacSrc); a device's
// contribution to a row that an earlier device stamps too is told by a
// snapshot of that row before its Eval.
func (s *System) stampDense() {
	c := &s.ctx
	clear(s.dense)
	f := s.f
	dense := s.dense
	for di := range s.devs {
		d := &s.devs[di]
		snap := s.contrib[d.cLo : d.cLo+len(d.touched)]
		for _, k := range d.prior {
			snap[k] = f[d.touched[k]]
		}
		js := s.jsnap
		for _, e := range d.tjPrior {
			js[e] = dense[d.tjPos[e]]
		}
		c.StateBase = d.stateLo
		d.dev.Eval(c)
		tj := s.termJ[d.tjLo:d.tjHi]
		for e, p := range d.tjPos[:len(tj)] {
			tj[e] = dense[p]
		}
		for _, e := range d.tjPrior {
			tj[e] -= js[e]
		}
		for k, r := range d.touched {
			v := f[r]
			if d.shared[k] {
				v -= snap[k]
			}
			snap[k] = v
		}
		s.bookTermCur(d, snap)
	}
}

// stampLocal evaluates each device into its own rows (Context.Local) and
// adds them into F and the Jacobian's entries.
func (s *System) stampLocal() {
	c := &s.ctx
	clear(s.jac)
	f, jac, local := s.f, s.jac, s.local
	for di := range s.devs {
		d := &s.devs[di]
		m := len(d.touched)
		for k, r := range d.touched {
			local[r] = int32(k)
		}
		fl, jl := s.floc[:m], s.jloc[:m*m]
		clear(fl)
		clear(jl)
		c.F, c.J, c.N = fl, jl, m
		c.StateBase = d.stateLo
		d.dev.Eval(c)
		own := s.contrib[d.cLo : d.cLo+m]
		for k, r := range d.touched {
			v := fl[k]
			f[r] += v
			own[k] = v
		}
		s.bookTermCur(d, fl)
		pos := d.jpos[:len(jl)]
		for e, v := range jl {
			jac[pos[e]] += v
		}
		tj := s.termJ[d.tjLo:d.tjHi]
		for _, k := range d.termSnap {
			if k >= 0 {
				tj = tj[copy(tj, jl[k*m:(k+1)*m]):]
			}
		}
	}
}

// bookTermCur sets device d's terminal currents from its own residual
// rows, own, in the order of d.touched: a terminal's current is its row's,
// and a second terminal on the same row carries none (see layRows).
func (s *System) bookTermCur(d *device, own []float64) {
	cur := s.termCur[d.curBase : d.curBase+len(d.termSnap)]
	for t, k := range d.termSnap {
		v := 0.0
		if k >= 0 {
			v = own[k]
		}
		cur[t] = v
	}
}

// setNoise sums on every row the magnitudes of the history terms of the
// states stamped there, the rounding allowance of residualOK. The history
// is fixed over the Newton iterations of a step, so this is done at most
// once per step, at the first residual test after the history is formed
// (and cleared for the operating point, which has no state derivatives):
// most stages converge on their update alone and never test the residual,
// and forming the history marks the sums stale (noiseOK) instead.
func (s *System) setNoise() {
	s.noiseOK = true
	clear(s.noise)
	if s.ctx.DC {
		return
	}
	for k, r := range s.rows {
		big := math.Abs(s.hist[k])
		if r.Plus >= 0 {
			s.noise[r.Plus] += big
		}
		if r.Minus >= 0 {
			s.noise[r.Minus] += big
		}
	}
}

// setScale forms each row's largest single contribution at the last
// evaluation, a device's or a state derivative's, for the residual test.
// Most iterates are judged by their update alone, so it is formed only
// when a residual is tested; the largest magnitude does not depend on the
// order in which the contributions are met.
func (s *System) setScale() {
	s.scaleOK = true
	scale := s.scale
	clear(scale)
	for di := range s.devs {
		d := &s.devs[di]
		own := s.contrib[d.cLo : d.cLo+len(d.touched)]
		for k, r := range d.touched {
			if a := math.Abs(own[k]); a > scale[r] {
				scale[r] = a
			}
		}
	}
	// At the operating point the derivatives are zero and add nothing.
	for k, r := range s.rows {
		a := math.Abs(s.qdot[k])
		if r.Plus >= 0 && a > scale[r.Plus] {
			scale[r.Plus] = a
		}
		if r.Minus >= 0 && a > scale[r.Minus] {
			scale[r.Minus] = a
		}
	}
}

// residualOK tests the KCL residual of every node row against
// current + rel·(largest current any one element puts on that node), and
// every branch row (volts) against abs + rel·(largest term of its equation,
// |J_ij·x_j|), and remembers the worst row for diagnostics. Both limits also
// allow the rounding of the state derivatives: Alpha·q and the history
// cancel to the small dq/dt of a large charge (a biased decoupling capacitor
// at a picosecond step), which leaves an error of a few ulps of the history
// that no iteration removes.
func (s *System) residualOK(t *tol) bool {
	if !s.noiseOK {
		s.setNoise()
	}
	if !s.scaleOK {
		s.setScale()
	}
	p := s.pat
	ok := true
	worst := -1.0
	jac, src := s.jacBuf, s.jacSrc
	f, noise, scale := s.f[:s.n], s.noise[:s.n], s.scale[:s.n]
	for i, node := range s.isNode[:s.n] {
		a := math.Abs(f[i])
		lim := roundoff * noise[i]
		// Most rows pass on the simple bound; only the others need the
		// allowances below.
		if node {
			lim += t.current + t.newton*scale[i]
		} else {
			lim += t.abs
		}
		if a <= lim {
			continue
		}
		if node {
			// A row whose own conductance is large turns even a large
			// residual into a small error of its voltage (a conducting
			// clamp's junction: amperes per millivolt), which the update
			// test bounds; the residual need only be small beside that.
			lim = max(lim, roundoff*noise[i]+t.current+math.Abs(jac[src[p.diag[i]]])*s.xtol[i])
		} else {
			big := 0.0
			for e := p.ptr[i]; e < p.ptr[i+1]; e++ {
				if v := math.Abs(jac[src[e]] * s.x[p.col[e]]); v > big {
					big = v
				}
			}
			lim += t.newton * big
		}
		if !(a <= lim) {
			// Only a failing row can be the one to name.
			ok = false
			if r := a / lim; r > worst || r != r {
				worst = r
				s.resRow, s.resValue = i, f[i]
			}
		}
	}
	return ok
}

// newtonStatus says how a Newton solve ended.
type newtonStatus int

const (
	converged newtonStatus = iota
	notConverged
	singular
	runaway
)

// impossible is a magnitude no voltage (V) or current (A) of a protection
// network reaches: a solution beyond it is the arithmetic of a junction
// driven far past its knee by an ideal source (a supply straight across a
// clamp), whose matrix is singular in all but rounding.
const impossible = 1e9

// newton iterates from s.x at the context's time and integration rule. g is
// the total shunt on every node row. With reuse, the factors left in s.lu
// (of this step's other stage, whose matrix coefficient is the same) serve
// until they stop converging. It returns the iterations used (device
// evaluations).
//
// An iterate is converged when the update the present factors give from it
// is within tolerance on every unknown, the residual is within tolerance on
// every row and no device limited its junction step. The test is made at the
// start of an iteration, on the freshly evaluated point; the update is then
// applied, and the states and terminal currents that evaluation left are
// moved along it by their derivatives there (see take).
// The update comes from the factors in hand: those of the previous iterate
// (a Newton step) or older ones (a chord step, a back-substitution only);
// a chord step that does not at least halve the previous update is not
// trusted, and the matrix is factored afresh.
//
// In the transient the iterate one update beyond an evaluated point is
// also taken, without evaluating it, when the contraction measured on
// recent solves says the next update would be far below tolerance: an
// iteration contracting at rate θ leaves θ/(1−θ) of its last update, and
// a protection network between its junctions' knees is so nearly linear
// that one update leaves a millionth of itself. The rate is the ratio of
// a solve's second update to its first, as last measured and relaxed
// towards 1 at every solve since (s.eta), so that an iterate is still
// evaluated and a verifying update computed every so many solves [pub:
// Hairer & Wanner, Solving ODEs II, IV.8, and their RADAU5: the
// simplified Newton iteration stops on the update itself once θ/(1−θ),
// carried over from the previous step, times it is small]. A limited
// junction step forbids it, and so does a node voltage that moves by more
// than onceVolts: the rate was measured where the junctions were, and a
// junction that was off cannot reach conduction unseen. Most stages then
// cost one evaluation and one solve.
func (s *System) newton(t *tol, g float64, reuse bool) (int, newtonStatus) {
	if !reuse {
		// The second stage keeps the first's: a step moves the scales
		// little.
		s.setTolerances(t)
	}
	have := reuse && s.luOK // factors in hand
	fresh := false          // ... formed at the previous iterate
	prev := math.Inf(1)     // size of the last update, in tolerances
	dc := s.ctx.DC
	// The first update comes from factors of this solve's first iterate
	// (a Newton update) or, with reuse, of an earlier matrix (a chord
	// update), whose rate also holds the difference of the matrices: each
	// kind has its rate.
	eta := &s.eta[0]
	if have {
		eta = &s.eta[1]
	}
	if !dc {
		*eta = min(1, etaRelax*max(*eta, etaFloor))
	}
	// once says the update just computed, r tolerances and at most volts
	// on any node, may be taken unevaluated.
	once := func(r, volts float64) bool {
		return !dc && !s.ctx.Limited && *eta*r <= etaAccept && volts <= onceVolts &&
			s.ctx.NSlopes <= len(s.ctx.Slopes)
	}
	for it := 1; it <= t.maxIter; it++ {
		s.assemble(g)
		if have {
			s.lu.solveNeg(s.dx, s.f)
			r, volts, bad := s.measure()
			if bad >= 0 {
				s.resRow, s.resValue = bad, s.f[bad]
				return it, notConverged
			}
			// The rate that matters is the first one, of the update from
			// the predicted point: Newton's later updates shrink
			// quadratically, and their ratio says nothing of the first.
			if it == 2 && prev > 0 && !dc {
				if th := r / prev; th < 1 {
					*eta = th / (1 - th)
				} else {
					*eta = 1
				}
			}
			// A Newton update bounds the error left (the next one is far
			// smaller); a chord update converging at rate ρ leaves
			// ρ/(1−ρ) of itself, and with no rate known yet only a tenth
			// of the tolerance is trusted.
			err := r
			if !fresh {
				if rho := r / prev; rho < 1 {
					err = r * max(1, rho/(1-rho))
				} else {
					err = math.Inf(1)
				}
				if math.IsInf(prev, 1) {
					err = 10 * r
				}
			}
			// The residual is tested only where it can decide: most
			// iterates are judged by their update alone.
			if (err <= 1 && !s.ctx.Limited && s.residualOK(t)) || once(r, volts) {
				return it, s.take()
			}
			if r <= 0.5*prev {
				s.apply()
				prev, fresh = r, false
				continue
			}
		}
		s.factorisations++
		// Node rows carry at least the shunt g, so a pivot far below it
		// means a dependent unknown (a loop of supplies or inductors, a
		// node held only by branch equations), not a weakly tied node:
		// factor names the first such column in weak.
		s.lu.tiny = 1e-6 * g
		s.luOK = false
		if k := s.lu.factor(s.jacBuf); k >= 0 {
			s.resRow, s.resValue = k, s.f[k]
			return it, singular
		}
		if k := s.lu.weak; k >= 0 {
			s.resRow, s.resValue = k, s.f[k]
			return it, singular
		}
		s.luOK, have, fresh = true, true, true
		s.lu.solveNeg(s.dx, s.f)
		r, volts, bad := s.measure()
		if bad >= 0 {
			s.resRow, s.resValue = bad, s.f[bad]
			return it, notConverged
		}
		if once(r, volts) {
			return it, s.take()
		}
		s.apply()
		prev = r
	}
	s.residualOK(t) // names the worst row of the last evaluation
	return t.maxIter, notConverged
}

// take applies the update dx and ends the solve there. The states and
// terminal currents were evaluated before the update: in the transient
// they are moved along it by the derivatives that evaluation gave (the
// device's own rows of the Jacobian for a terminal current, its
// ChargeDeriv slopes for a state), so that what the step reports and
// integrates belongs to the point taken; the update being converged, what
// that linearisation leaves out is of its square.
func (s *System) take() newtonStatus {
	s.apply()
	// The slices and Alpha in locals: each store through a slice of the
	// System would otherwise reload them.
	dx := s.dx
	x := s.x[:len(dx)]
	for i, v := range x {
		if !(math.Abs(v) < impossible) {
			s.resRow, s.resValue = i, s.f[i]
			return runaway
		}
	}
	c := &s.ctx
	if c.DC || c.NSlopes > len(c.Slopes) {
		return converged
	}
	q, qdot, alpha := s.q, s.qdot, c.Alpha
	for _, sl := range c.Slopes[:c.NSlopes] {
		d := sl.D * dx[sl.Col]
		q[sl.State] += d
		qdot[sl.State] += alpha * d
	}
	tc := s.termCur
	cur, col := s.tjCur[:len(s.termJ)], s.tjCol[:len(s.termJ)]
	for e, v := range s.termJ {
		tc[cur[e]] += v * dx[col[e]]
	}
	return converged
}

// The single-update acceptance (see newton): an iterate is taken when
// eta·(its update, in tolerances) is at most etaAccept, that is when the
// error it is estimated to leave is a twentieth of Newton's tolerance. At
// every solve that does not measure it eta doubles, from at least
// etaFloor: a rate of a hundred-millionth is trusted for about fifteen
// solves, a rate of a thousandth for none. Hairer & Wanner relax it as
// max(η, uround)^0.8 [pub: Solving ODEs II, IV.8]; a fixed factor does the
// same work without a power, which cost 5 % of a strike. Measured on the
// reference strike: doubling takes 2790 evaluations, a tenfold rise 3155;
// the reference networks' errors do not move with it once the two kinds of
// update keep their own rates (a shared one let a chord update ride on the
// millionth of a Newton update and moved network B's bead energy from 0.75
// to 1.1 of its budget).
//
// onceVolts, the thermal voltage, is the largest move of a node voltage
// taken unevaluated: an exponential junction law grows at most e-fold over
// it (more slowly with an emission coefficient above 1), so a junction
// that carried nothing at the evaluated point carries next to nothing
// after it. In a strike it stops about one such update in a hundred.
const (
	onceVolts = devices.ThermalVoltage
	etaAccept = 0.05
	etaRelax  = 2.0
	etaFloor  = 1e-12
)

// setTolerances sets Newton's tolerance on every unknown, newton·scale +
// abs, the scale being the error control's (see localShare) at the point
// Newton starts from (|x| at the operating point, at least scaleFloor).
// One evaluation per step: the scale moves little over its two stages.
func (s *System) setTolerances(t *tol) {
	n := len(s.xtol)
	x, sc, hi, lo := s.x[:n], s.xScale[:n], s.xMax[:n], s.xMin[:n]
	if s.ctx.DC {
		for i, v := range x {
			s.xtol[i] = t.newton*max(math.Abs(v), scaleFloor) + t.abs
		}
		return
	}
	for i, v := range x {
		s.xtol[i] = t.newton*scaleOf(v, v, hi[i], lo[i], SideFloor*sc[i]) + t.abs
	}
}

// measure compares the update dx with the tolerance of every unknown (see
// setTolerances): r is the largest ratio of a step to its tolerance (within
// tolerance: r ≤ 1), volts the largest step of a node voltage, and bad an
// unknown whose step is not finite, or -1.
func (s *System) measure() (r, volts float64, bad int) {
	bad = -1
	n := len(s.dx)
	xtol, node := s.xtol[:n], s.nodeMask[:n]
	for i, d := range s.dx {
		a := math.Abs(d)
		if v := a * node[i]; v > volts {
			volts = v
		}
		if !(a <= r*xtol[i]) {
			if a != a || math.IsInf(a, 0) {
				bad, r = i, math.Inf(1)
				continue
			}
			r = a / xtol[i]
		}
	}
	return r, volts, bad
}

// apply adds the update dx to x.
func (s *System) apply() {
	x := s.x[:len(s.dx)]
	for i, d := range s.dx {
		x[i] += d
	}
}
