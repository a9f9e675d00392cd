package devices

// series is the series path a two-terminal model puts between its terminal
// t and its core's node j:
//
//	t –ls– m –r– j
//
// The inductance ls is a branch current i with flux λ = ls·i and branch
// equation v(t) − v(m) − dλ/dt = 0; r is a plain conductance g = 1/r. A
// zero ls or r adds no unknown (m is t, or j is m). The clamp, the table
// path, the diode and the varistor embed it, so that the wiring of the
// three cases is written once.
type series struct {
	ls float64 // H; 0: none
	g  float64 // 1/r, S; 0: none

	t, m, j, br int
	kFlux       int // local state of the flux, or -1
}

// newSeries is the series path of ls and r (either may be 0).
func newSeries(ls, r float64) series {
	s := series{ls: ls}
	if r > 0 {
		s.g = 1 / r
	}
	return s
}

// layout adds the path's internal nodes (m, then j named core) and its
// branch to l.
func (s *series) layout(l *Layout, core string) {
	switch {
	case s.ls > 0 && s.g > 0:
		l.Internal = append(l.Internal, "m", core)
	case s.ls > 0 || s.g > 0:
		l.Internal = append(l.Internal, core)
	}
	if s.ls > 0 {
		l.Branches = append(l.Branches, "ls")
	}
}

// bind takes the terminal t and the unknowns layout asked for, the first
// of n's internal nodes and branches.
func (s *series) bind(t int, n Nodes) {
	s.t, s.m, s.j, s.br = t, t, t, Ground
	switch {
	case s.ls > 0 && s.g > 0:
		s.m, s.j = n.Internal[0], n.Internal[1]
	case s.ls > 0:
		s.m, s.j = n.Internal[0], n.Internal[0]
	case s.g > 0:
		s.j = n.Internal[0]
	}
	if s.ls > 0 {
		s.br = n.Branches[0]
	}
}

// fluxRow appends the flux state, when there is an inductance, to the
// model's states.
func (s *series) fluxRow(rows []StateRows) []StateRows {
	s.kFlux = -1
	if s.ls > 0 {
		s.kFlux = len(rows)
		rows = append(rows, StateRows{Plus: Ground, Minus: s.br})
	}
	return rows
}

// stamp stamps the path.
func (s *series) stamp(c *Context) {
	if s.ls > 0 {
		stampBranch(c, s.kFlux, s.t, s.m, s.br, s.ls)
	}
	if s.g > 0 {
		c.Conductance(s.m, s.j, s.g)
	}
}
