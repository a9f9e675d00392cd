package mna

import "fmt"

// OperatingPoint solves the DC state (strike off, supplies on) and returns
// the node voltages in Nodes order.
//
// Newton starts from zero. If it fails, gmin stepping ties every node to gnd
// through a shunt of 10 mS relaxed by decades down to Gmin, each solution
// starting the next; if that fails too, source stepping ramps the supplies
// from zero to their value in adaptive increments.
func (s *System) OperatingPoint(set *Settings) ([]float64, error) {
	t := tolerances(set)
	s.reset()
	if _, err := s.operatingPoint(&t); err != nil {
		return nil, err
	}
	v := make([]float64, len(s.nodeNames))
	for i, k := range s.nodeIdx {
		v[i] = s.x[k]
	}
	return v, nil
}

// reset clears per-run state: the devices' memories and the iterate.
func (s *System) reset() {
	for _, d := range s.devs {
		if d.resetter != nil {
			d.resetter.Reset()
		}
	}
	clear(s.x)
	// The factorisation's pivot order is the first analysis's of each run,
	// not whatever an earlier run of the same system left: otherwise a run's
	// rounding would depend on the runs before it.
	s.lu.ok, s.luOK = false, false
	for i := range s.curTr {
		s.curTr[i].Reset()
	}
	s.ctx.T = 0
	s.ctx.Alpha = 0
	s.ctx.Gmin = 0
	s.ctx.SourceScale = 1
}

// operatingPoint leaves the DC solution in s.x (and its states in s.q) and
// returns the Newton iterations spent.
func (s *System) operatingPoint(t *tol) (int, error) {
	c := &s.ctx
	c.DC, c.T, c.Alpha, c.Gmin, c.SourceScale = true, 0, 0, t.gmin, 1
	clear(s.hist)
	s.noiseOK = false
	total := 0
	defer func() { c.SourceScale = 1 }()

	clear(s.x)
	s.dcMethod = "newton"
	it, st := s.newton(t, t.gmin, false)
	total += it
	if st == converged {
		return total, nil
	}
	if st == singular || st == runaway {
		return total, s.solveError(-1, st)
	}

	// Gmin stepping.
	clear(s.x)
	s.dcMethod = "gmin stepping"
	ok := true
	for g := 1e-2; g > t.gmin; g /= 10 {
		it, st = s.newton(t, g+t.gmin, false)
		total += it
		if st != converged {
			ok = false
			break
		}
	}
	if ok {
		it, st = s.newton(t, t.gmin, false)
		total += it
		if st == converged {
			return total, nil
		}
	}

	// Source stepping.
	clear(s.x)
	s.dcMethod = "source stepping"
	c.SourceScale = 0
	it, st = s.newton(t, t.gmin, false)
	total += it
	if st != converged {
		return total, s.solveError(-1, st)
	}
	step := 0.1
	for c.SourceScale < 1 {
		saved := c.SourceScale
		copy(s.xAcc, s.x) // xAcc is free before the transient: keep the last good point
		c.SourceScale = min(1, saved+step)
		it, st = s.newton(t, t.gmin, false)
		total += it
		if st == converged {
			step = min(2*step, 0.5)
			continue
		}
		copy(s.x, s.xAcc)
		c.SourceScale = saved
		step /= 4
		if step < 1e-4 {
			return total, s.solveError(-1, notConverged)
		}
	}
	return total, nil
}

// solveError tells why a solution stopped at time now (negative: the
// operating point), near the unknown of the last largest residual.
func (s *System) solveError(now float64, st newtonStatus, reason ...string) *SolveError {
	e := &SolveError{Time: now, Where: s.where(s.resRow), Residual: s.resValue}
	switch {
	case st == singular:
		e.Reason, e.Hint = "the circuit matrix is singular", s.singularHint(s.resRow)
	case st == runaway:
		e.Reason = fmt.Sprintf("the solution needs an impossible %s (%.3g)", s.quantityOf(s.resRow), s.x[s.resRow])
		e.Hint = s.singularHint(s.resRow)
	case now < 0:
		e.Reason, e.Hint = "Newton iteration did not converge", s.hintFor(s.resRow, false)
	default:
		e.Reason, e.Hint = "Newton iteration did not converge and the time step fell below the minimum step", s.hintFor(s.resRow, true)
	}
	if len(reason) > 0 {
		e.Reason = reason[0]
	}
	return e
}

// quantityOf is what unknown i is, for a message.
func (s *System) quantityOf(i int) string {
	if i >= 0 && i < len(s.isNode) && s.isNode[i] {
		return "voltage, V,"
	}
	return "current, A,"
}

// where names an unknown for a message.
func (s *System) where(i int) string {
	if i < 0 || i >= len(s.unknowns) {
		return "an unknown"
	}
	if s.isNode[i] {
		return "node " + s.unknowns[i]
	}
	return "branch " + s.unknowns[i]
}

func (s *System) singularHint(i int) string {
	if i >= 0 && i < len(s.isNode) && !s.isNode[i] {
		// The deck checks reject loops of ideal supplies and inductors
		// before any solve, so the likelier cause here is a supply forcing
		// a junction so far into conduction that its conductance swamps
		// the matrix.
		return "either the supply drives a clamp or junction far into conduction (a supply above a clamp's vbr with no series resistance), or a loop of supplies or inductors fixes no current there; give the supply a series r=, or check the clamp's vbr"
	}
	return "a node with no DC path to gnd, or held only by supplies; connect it through a resistor"
}
