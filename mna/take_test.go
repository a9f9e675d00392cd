package mna

import (
	"math"
	"testing"
)

// An iterate taken one update beyond the point Newton evaluated carries the
// states and terminal currents an evaluation there would give: to rounding
// for a linear circuit (the ladder, small enough for the dense Jacobian and
// large enough to be stamped device by device), and to the square of the update where
// a junction conducts (the reference network 2 ns into a strike, its clamp
// at tens of amperes) [calc: first-order Taylor expansion, the remainder
// of second order in the update].
func TestTakeMovesStatesAlong(t *testing.T) {
	for _, c := range []struct {
		name  string
		s     *struck
		stop  float64
		size  float64 // the update, relative to each unknown's magnitude
		limit float64 // allowed mismatch, relative to the change or the value
	}{
		{"ladder", ladder(t, 5), 3e-9, 1e-3, 1e-9},
		{"ladder, stamped device by device", ladder(t, 40), 3e-9, 1e-3, 1e-9},
		{"reference", referenceNetwork(t), 2e-9, 1e-6, 1e-4},
	} {
		s := c.s
		if want := c.name != "ladder, stamped device by device"; (s.dense != nil) != want {
			t.Fatalf("%s: dense stamping %v, want %v", c.name, s.dense != nil, want)
		}
		if _, err := s.Transient(&Settings{Stop: c.stop}); err != nil {
			t.Fatal(err)
		}
		g := tolerances(nil).gmin
		x0 := append([]float64(nil), s.x...)
		s.assemble(g)
		q0 := append([]float64(nil), s.q...)
		i0 := append([]float64(nil), s.termCur...)
		for i, v := range x0 {
			s.dx[i] = c.size * math.Max(math.Abs(v), 1e-3) * float64(1-2*(i%2))
		}
		if st := s.take(); st != converged {
			t.Fatalf("%s: take: status %d", c.name, st)
		}
		q1 := append([]float64(nil), s.q...)
		i1 := append([]float64(nil), s.termCur...)
		s.assemble(g)
		moved := 0
		check := func(what string, k int, before, taken, fresh float64) {
			change := math.Abs(fresh - before)
			if change > 0 {
				moved++
			}
			if d := math.Abs(taken - fresh); d > c.limit*change+1e-12*math.Abs(fresh)+1e-300 {
				t.Errorf("%s: %s %d: taken %.12g, evaluated %.12g (from %.12g)", c.name, what, k, taken, fresh, before)
			}
		}
		for k := range q1 {
			check("state", k, q0[k], q1[k], s.q[k])
		}
		for k := range i1 {
			check("terminal current", k, i0[k], i1[k], s.termCur[k])
		}
		if moved == 0 {
			t.Errorf("%s: the update moved nothing", c.name)
		}
	}
}
