package mna

import "math"

// tol are the tolerances of one solution, defaults filled in.
type tol struct {
	rel, abs, charge, current, gmin float64
	maxIter                         int
}

// currentTol is the absolute tolerance on the KCL residual, A. It is far
// below the milliampere currents that matter for a protected pin and well
// above the rounding of the ampere-scale currents of a strike.
const currentTol = 1e-9

// roundoff is the relative rounding allowed on the terms that cancel in a
// state derivative: 16 ulps.
const roundoff = 16 * 0x1p-52

func tolerances(set *Settings) tol {
	t := tol{rel: 1e-3, abs: 1e-6, charge: 1e-14, current: currentTol, gmin: 1e-12, maxIter: 50}
	if set == nil {
		return t
	}
	if set.RelTol > 0 {
		t.rel = set.RelTol
	}
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

// assemble evaluates every device at s.x into F and J, forms the state
// derivatives and adds them, and adds the shunt conductances. Along the way
// it records each device's terminal currents (the change its Eval and its
// own states make on its terminal rows) and each row's largest single
// contribution.
func (s *System) assemble(g float64) {
	clear(s.f)
	// Devices stamp only within the structure (see structure), so only
	// that part of the Jacobian needs clearing; a small one is cleared in
	// one move.
	if s.n <= smallLU {
		clear(s.jac)
	} else {
		for i := 0; i < s.n; i++ {
			clear(s.jac[i*s.n+s.lu.lo0[i] : i*s.n+s.lu.hi0[i]+1])
		}
	}
	clear(s.scale)
	c := &s.ctx
	c.Limited = false
	for di := range s.devs {
		d := &s.devs[di]
		for _, k := range d.prior {
			s.snap[k] = s.f[d.touched[k]]
		}
		c.StateBase = d.stateLo
		d.dev.Eval(c)
		for k, r := range d.touched {
			v := s.f[r]
			if d.shared[k] {
				v -= s.snap[k]
			}
			s.snap[k] = v
			if a := math.Abs(v); a > s.scale[r] {
				s.scale[r] = a
			}
		}
		for t, k := range d.termSnap {
			if k >= 0 {
				s.termCur[d.curBase+t] = s.snap[k]
			} else {
				s.termCur[d.curBase+t] = 0
			}
		}
	}
	if c.DC {
		clear(s.qdot)
	} else {
		hist, qdot := s.hist[:len(s.q)], s.qdot[:len(s.q)]
		for k, r := range s.rows {
			qd := c.Alpha*s.q[k] + hist[k]
			qdot[k] = qd
			a := math.Abs(qd)
			if r.Plus >= 0 {
				s.f[r.Plus] += qd
				if a > s.scale[r.Plus] {
					s.scale[r.Plus] = a
				}
			}
			if r.Minus >= 0 {
				s.f[r.Minus] -= qd
				if a > s.scale[r.Minus] {
					s.scale[r.Minus] = a
				}
			}
			st := s.stateTerm[k]
			if st[0] >= 0 {
				s.termCur[st[0]] += qd
			}
			if st[1] >= 0 {
				s.termCur[st[1]] -= qd
			}
		}
	}
	n := s.n
	for _, i := range s.nodeRows {
		s.f[i] += g * s.x[i]
		s.jac[i*n+i] += g
	}
}

// setNoise sums on every row the magnitudes of the history terms of the
// states stamped there, the rounding allowance of residualOK. The history
// is fixed over the Newton iterations of a step, so this is done once per
// step, after the history is formed (and cleared for the operating point,
// which has no state derivatives).
func (s *System) setNoise() {
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

// residualOK tests the KCL residual of every node row against
// current + rel·(largest current any one element puts on that node), and
// every branch row (volts) against abs + rel·(largest term of its equation,
// |J_ij·x_j|), and remembers the worst row for diagnostics. Both limits also
// allow the rounding of the state derivatives: Alpha·q and the history
// cancel to the small dq/dt of a large charge (a biased decoupling capacitor
// at a picosecond step), which leaves an error of a few ulps of the history
// that no iteration removes.
func (s *System) residualOK(t *tol) bool {
	n := s.n
	ok := true
	worst := -1.0
	for i, node := range s.isNode {
		lim := roundoff * s.noise[i]
		if node {
			lim += t.current + t.rel*s.scale[i]
		} else {
			big := 0.0
			row := s.jac[i*n : i*n+n]
			for _, j := range s.rowCols[i] {
				if a := math.Abs(row[j] * s.x[j]); a > big {
					big = a
				}
			}
			lim += t.abs + t.rel*big
		}
		if a := math.Abs(s.f[i]); !(a <= lim) {
			// Only a failing row can be the one to name.
			ok = false
			if r := a / lim; r > worst || r != r {
				worst = r
				s.resRow, s.resValue = i, s.f[i]
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
)

// newton iterates from s.x at the context's time and integration rule. g is
// the total shunt on every node row. It returns the iterations used (device
// evaluations).
//
// An iterate is converged when an update was within tolerance on every
// unknown, the residual is within tolerance on every row and no device
// limited its junction step. The test is made at the start of an iteration,
// on the residual of the freshly evaluated point, so the last iteration needs
// no factorisation and the states and terminal currents left by the
// evaluation belong to the accepted point. When the residual passes but the
// last update was large (the first iteration of a step), the update the
// previous factors give (a chord step, a back-substitution only) decides: on
// the linear stretches of a circuit it is already negligible, which saves the
// second factorisation of every step. An update within tolerance from a point
// whose residual already passed is also accepted.
func (s *System) newton(t *tol, g float64) (int, newtonStatus) {
	prevOK := false
	for it := 1; it <= t.maxIter; it++ {
		s.assemble(g)
		resOK := s.residualOK(t)
		if resOK && !s.ctx.Limited {
			if prevOK {
				return it, converged
			}
			if it > 1 {
				s.negF()
				s.lu.solve(s.dx)
				if ok, _ := s.update(t, false); ok {
					s.update(t, true)
					return it, converged
				}
			}
		}
		s.factorisations++
		// Node rows carry at least the shunt g, so a pivot far below it
		// means a dependent unknown (a loop of supplies or inductors, a
		// node held only by branch equations), not a weakly tied node:
		// factor names the first such column in weak.
		s.lu.tiny = 1e-6 * g
		if k := s.lu.factor(s.jac); k >= 0 {
			s.resRow, s.resValue = k, s.f[k]
			return it, singular
		}
		if k := s.lu.weak; k >= 0 {
			s.resRow, s.resValue = k, s.f[k]
			return it, singular
		}
		s.negF()
		s.lu.solve(s.dx)
		dxOK, bad := s.update(t, true)
		if bad >= 0 {
			s.resRow, s.resValue = bad, s.f[bad]
			return it, notConverged
		}
		if dxOK && resOK && !s.ctx.Limited {
			return it, converged
		}
		prevOK = dxOK
	}
	return t.maxIter, notConverged
}

// negF sets dx to −F, the right-hand side of the Newton step.
func (s *System) negF() {
	for i, f := range s.f {
		s.dx[i] = -f
	}
}

// update tests the step dx against rel·|x| + abs on every unknown and, with
// apply, adds it to x. bad is an unknown whose update is not finite, or -1.
func (s *System) update(t *tol, apply bool) (ok bool, bad int) {
	ok, bad = true, -1
	for i, d := range s.dx {
		x := s.x[i]
		xn := x + d
		if !(math.Abs(d) <= t.rel*max(math.Abs(x), math.Abs(xn))+t.abs) {
			ok = false
			if d != d || math.IsInf(xn, 0) {
				bad = i
			}
		}
		if apply {
			s.x[i] = xn
		}
	}
	return ok, bad
}
