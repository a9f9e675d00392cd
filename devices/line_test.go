package devices

import (
	"fmt"
	"math"
	"testing"
)

// lineRig is a line from node 0 (in) to node 1 (out), driven at in by vs(t)
// behind rs and loaded at out by rl (0: open).
func lineRig(t *testing.T, z0, delay, rs, rl float64, vs func(float64) float64) (*Line, *nlRig) {
	t.Helper()
	d := nlMust(t, nlElement("line", "TL1", "in", "out", map[string]float64{"z0": z0, "delay": delay}, nil)).(*Line)
	r := newNLRig(t, d, 0, 1)
	r.extra = func(c *Context) {
		c.Conductance(0, Ground, 1/rs)
		c.Inject(0, Ground, vs(c.T)/rs)
		if rl > 0 {
			c.Conductance(1, Ground, 1/rl)
		}
	}
	return d, r
}

func TestLineDC(t *testing.T) {
	// At DC a lossless line is a wire: 1 V behind 10 Ω into 40 Ω through
	// the line gives 0.8 V at both ends and 20 mA through it [Ohm's law].
	d, r := lineRig(t, 50, 2e-9, 10, 40, func(float64) float64 { return 1 })
	r.c.DC = true
	x := make([]float64, r.n)
	if _, err := r.newton(x, 10); err != nil {
		t.Fatal(err)
	}
	if !nlClose(x[0], 0.8, 1e-12, 0) || !nlClose(x[1], 0.8, 1e-12, 0) || !nlClose(x[d.br], 0.02, 1e-12, 0) {
		t.Errorf("DC: v_in %g, v_out %g, i %g; want 0.8, 0.8, 0.02", x[0], x[1], x[d.br])
	}
	// The DC state is a steady state of the transient equations: with the
	// history seeded by the operating point nothing moves [calc].
	r.transient(t, 0.5e-9, 20, func(tm float64, x []float64) {
		if !nlClose(x[0], 0.8, 1e-12, 0) || !nlClose(x[1], 0.8, 1e-12, 0) {
			t.Errorf("t=%g: v_in %g, v_out %g, want 0.8 both", tm, x[0], x[1])
		}
	})
	if d.MaxStep() != 2e-9 {
		t.Errorf("MaxStep %g, want the delay", d.MaxStep())
	}
}

func TestLineMatchedDelay(t *testing.T) {
	// Matched at both ends, the far end repeats the near end one delay
	// later: v_out(t) = v_in(t−T) = vs(t−T)/2 (lossless line, method of
	// characteristics) [pub: transmission-line theory]. A piecewise-linear
	// source with corners on the step grid is interpolated exactly.
	const z0, delay = 50.0, 2e-9
	vs := func(tm float64) float64 {
		switch {
		case tm <= 0:
			return 0
		case tm < 1e-9:
			return 4 * tm / 1e-9
		case tm < 3e-9:
			return 4 - 1.5*(tm-1e-9)/2e-9
		}
		return 2.5
	}
	_, r := lineRig(t, z0, delay, z0, z0, vs)
	r.transient(t, 0.25e-9, 40, func(tm float64, x []float64) {
		if !nlClose(x[0], vs(tm)/2, 1e-9, 1e-12) || !nlClose(x[1], vs(tm-delay)/2, 1e-9, 1e-12) {
			t.Errorf("t=%g: v_in %g (want %g), v_out %g (want %g)", tm, x[0], vs(tm)/2, x[1], vs(tm-delay)/2)
		}
	})
}

func TestLineOpenEnd(t *testing.T) {
	// A step V behind z0 into a line open at the far end: V/2 enters, the
	// open end reflects it with coefficient +1, so v_out jumps to V at T and
	// v_in to V at 2T [calc: reflection coefficients].
	const z0, delay, v = 75.0, 1e-9, 3.0
	h := delay / 8
	_, r := lineRig(t, z0, delay, z0, 0, func(tm float64) float64 {
		if tm > 0 {
			return v
		}
		return 0
	})
	r.transient(t, h, 40, func(tm float64, x []float64) {
		k := int(math.Round(tm / h))
		wantIn, wantOut := v/2, 0.0
		if k > 16 {
			wantIn = v
		}
		if k > 8 {
			wantOut = v
		}
		if !nlClose(x[0], wantIn, 1e-9, 1e-12) || !nlClose(x[1], wantOut, 1e-9, 1e-12) {
			t.Errorf("step %d: v_in %g (want %g), v_out %g (want %g)", k, x[0], wantIn, x[1], wantOut)
		}
	})
}

func TestLineHistory(t *testing.T) {
	// Bookkeeping: accepted points are interpolated linearly at any time
	// within one delay of the newest; before the first point the operating
	// point holds. Many points per delay force the storage to grow; old
	// points are dropped once no query can reach them.
	const delay = 1e-9
	d := nlMust(t, nlElement("line", "TL1", "in", "out", map[string]float64{"z0": 50, "delay": delay}, nil)).(*Line)
	r := newNLRig(t, d, 0, 1)
	// Operating point: 1 V at both ends, 5 mA through the wire.
	r.c.DC = true
	x := []float64{1, 1, 5e-3}
	r.eval(x, 0)
	d.Accept(0, x)
	r.c.DC = false
	v1 := func(tm float64) float64 { return 1 + math.Sin(3e9*tm) }
	v2 := func(tm float64) float64 { return 1 - 0.5*math.Sin(2e9*tm) }
	const steps = 2000 // 1000 points per delay
	h := 2 * delay / steps
	var i1, i2 []float64 // the currents the line itself computes at each point
	i1 = append(i1, 5e-3)
	i2 = append(i2, -5e-3)
	for k := 1; k <= steps; k++ {
		tm := float64(k) * h
		x := []float64{v1(tm), v2(tm), 0}
		r.c.T = tm
		r.eval(x, 0)
		// Current into the line at in: the stamped F[0], by the characteristic
		// equation with the history at tm − T.
		i1 = append(i1, r.c.F[0])
		i2 = append(i2, r.c.F[1])
		d.Accept(tm, x)
	}
	if d.size > steps/2+2 || len(d.ht) < steps/2 {
		t.Errorf("history keeps %d points in storage of %d", d.size, len(d.ht))
	}
	// Characteristic check at the end: i1(t) = v1(t)/z0 − [v2(t−T)/z0 + i2(t−T)]
	// with the line's own stored values, on the grid (no interpolation).
	kT := int(math.Round(delay / h))
	for k := steps - kT; k <= steps; k += 97 {
		tm := float64(k) * h
		want := v1(tm)/50 - (v2(tm-delay)/50 + i2[k-kT])
		if !nlClose(i1[k], want, 1e-9, 1e-15) {
			t.Errorf("i1(%g) = %g, want %g", tm, i1[k], want)
		}
	}
	// Interpolation between stored points: the parabola through the two
	// points around tq and the next one [Lagrange interpolation]. On the
	// smooth voltages it is within (ωh)³ of the function, which linear
	// interpolation ((ωh)²/8 ≈ 1e-6 here) would miss [calc].
	for _, tq := range []float64{2*delay - 0.9*delay + 0.3*h, 2*delay - 1.6*h, 2*delay - 0.2*h} {
		k := int(math.Floor(tq / h))
		pts := [3]int{k, k + 1, k + 2}
		if k+2 > steps {
			pts[2] = k - 1
		}
		lag := func(f func(int) float64) float64 {
			s := 0.0
			for a, ka := range pts {
				w := 1.0
				for b, kb := range pts {
					if a != b {
						w *= (tq - float64(kb)*h) / (float64(ka-kb) * h)
					}
				}
				s += w * f(ka)
			}
			return s
		}
		gv1, gv2, gi1, gi2 := d.at(tq)
		if math.Abs(gv1-v1(tq)) > 1e-8 || math.Abs(gv2-v2(tq)) > 1e-8 ||
			!nlClose(gi1, lag(func(k int) float64 { return i1[k] }), 1e-6, 1e-12) ||
			!nlClose(gi2, lag(func(k int) float64 { return i2[k] }), 1e-6, 1e-12) {
			t.Errorf("at(%g): v1 %.12g (%.12g), v2 %.12g (%.12g), i1 %g, i2 %g", tq, gv1, v1(tq), gv2, v2(tq), gi1, gi2)
		}
	}
	// Before any transient point the operating point holds.
	d.Reset()
	r.c.DC = true
	r.eval([]float64{2, 2, 1e-3}, 0)
	d.Accept(0, []float64{2, 2, 1e-3})
	r.c.DC = false
	r.c.T = 0.3 * delay
	r.eval([]float64{2, 2, 0}, 0)
	if !nlClose(r.c.F[0], 1e-3, 1e-12, 0) || !nlClose(r.c.F[1], -1e-3, 1e-12, 0) {
		t.Errorf("before T: currents %g, %g; want the DC wire current ±1 mA", r.c.F[0], r.c.F[1])
	}
}

func TestLineJacobian(t *testing.T) {
	d := nlMust(t, nlElement("line", "TL1", "in", "out", map[string]float64{"z0": 90, "delay": 1e-9}, nil)).(*Line)
	for _, dc := range []bool{true, false} {
		r := newNLRig(t, d, 0, 1)
		r.c.DC, r.c.T = dc, 0.5e-9
		d.Accept(0, []float64{0.3, 0.2, 1e-3})
		r.checkJacobian(t, nlRandom(r.n, 1, 5), fmt.Sprintf("line dc=%v", dc))
	}
	if _, err := build(nlElement("line", "TL1", "in", "out", map[string]float64{"z0": 50}, nil)); err == nil {
		t.Error("line without delay accepted")
	}
}

func TestLineReturnsItsEnergy(t *testing.T) {
	// A lossless line stores energy and gives it all back: after a smooth
	// pulse has bounced out between a matched source and a 10 Ω load,
	// ∫(v1·i1 + v2·i2) dt = 0 [energy conservation of a lossless line]. The
	// step T/10.3 does not divide the delay, so every history value is
	// interpolated; the loss must stay below 0.1 % of the energy that passed.
	const z0, delay = 50.0, 1e-9
	vs := func(tm float64) float64 { return 10 * math.Exp(-math.Pow((tm-2e-9)/0.5e-9, 2)) }
	d, r := lineRig(t, z0, delay, z0, 10, vs)
	h := delay / 10.3
	var e, passed, pPrev float64
	r.transient(t, h, int(40e-9/h), func(tm float64, x []float64) {
		h1, h2 := d.history(tm)
		p := x[0]*(x[0]/z0-h1) + x[1]*(x[1]/z0-h2)
		e += 0.5 * h * (p + pPrev)
		passed += 0.5 * h * (math.Abs(p) + math.Abs(pPrev))
		pPrev = p
	})
	if math.Abs(e) > 1e-3*passed {
		t.Errorf("line kept %g J of %g J that passed through it", e, passed)
	}
}
