package devices

import (
	"fmt"
	"math"
	"testing"

	"zapnet/waveforms"
)

// strikeRig is a strike into node 0 (ref gnd) loaded by rl ohms.
func strikeRig(t *testing.T, st *waveforms.Stimulus, sign, rl float64) (*Strike, *nlRig) {
	t.Helper()
	d := nlMust(t, nlElement("strike", "zap", "n", "gnd", nil, nil)).(*Strike)
	d.SetStimulus(st, sign)
	r := newNLRig(t, d, 0, Ground)
	r.extra = func(c *Context) { c.Conductance(0, Ground, 1/rl) }
	return d, r
}

// transient integrates the rig from the operating point with the rule the
// engine uses (backward Euler for the first two steps after the switching
// instant, then trapezoidal; NUMERICS.md) and calls visit at every step.
func (r *nlRig) transient(t *testing.T, h float64, steps int, visit func(tm float64, x []float64)) {
	t.Helper()
	x := make([]float64, r.n)
	r.c.DC, r.c.Alpha = true, 0
	clear(r.hist)
	if _, err := r.newton(x, 100); err != nil {
		t.Fatalf("operating point: %v", err)
	}
	r.residual(x)
	if a, ok := r.d.(Acceptor); ok {
		a.Accept(0, x)
	}
	q := append([]float64(nil), r.c.Q...)
	qdot := make([]float64, len(q)) // d/dt q at the operating point: 0
	r.c.DC = false
	for s := 1; s <= steps; s++ {
		r.c.T = float64(s) * h
		if s <= 2 {
			r.c.Alpha = 1 / h
			for k := range q {
				r.hist[k] = -q[k] / h
			}
		} else {
			r.c.Alpha = 2 / h
			for k := range q {
				r.hist[k] = -2/h*q[k] - qdot[k]
			}
		}
		if _, err := r.newton(x, 100); err != nil {
			t.Fatalf("t = %g: %v", r.c.T, err)
		}
		r.residual(x)
		for k := range q {
			q[k] = r.c.Q[k]
			qdot[k] = r.c.Alpha*q[k] + r.hist[k]
		}
		if a, ok := r.d.(Acceptor); ok {
			a.Accept(r.c.T, x)
		}
		visit(r.c.T, x)
	}
}

func TestStrikeCurrent(t *testing.T) {
	// An ideal current s·F(t) into the node: the load sees s·F(t)·RL [Ohm's
	// law]; at the operating point the strike is off.
	ramp := func(tm float64) float64 { return math.Max(0, tm) * 1e9 } // 1 A/ns
	st := &waveforms.Stimulus{Form: waveforms.Current, F: ramp}
	for _, sign := range []float64{1, -1} {
		_, r := strikeRig(t, st, sign, 2)
		r.transient(t, 0.1e-9, 20, func(tm float64, x []float64) {
			if want := sign * ramp(tm) * 2; !nlClose(x[0], want, 1e-12, 1e-15) {
				t.Errorf("sign %g, t=%g: v = %g, want %g", sign, tm, x[0], want)
			}
		})
	}
}

func TestStrikeThevenin(t *testing.T) {
	// Open-circuit voltage F(t) behind R into RL: v = s·F·RL/(R+RL)
	// [voltage divider]; at the operating point F = 0 and R still loads the
	// node (the generator stays connected).
	step := func(tm float64) float64 {
		if tm > 0 {
			return 100
		}
		return 0
	}
	st := &waveforms.Stimulus{Form: waveforms.Thevenin, F: step, R: 50}
	d, r := strikeRig(t, st, -1, 50)
	r.transient(t, 1e-9, 3, func(tm float64, x []float64) {
		if !nlClose(x[0], -50, 1e-12, 0) {
			t.Errorf("t=%g: v = %g, want −50", tm, x[0])
		}
	})
	// Loading at DC: a 1 V test source behind 1 Ω sees R ∥ RL = 25 Ω.
	r.extra = func(c *Context) {
		c.Conductance(0, Ground, 1.0/50)
		c.Conductance(0, Ground, 1)
		c.Inject(0, Ground, 1)
	}
	r.c.DC = true
	x := make([]float64, r.n)
	if _, err := r.newton(x, 10); err != nil {
		t.Fatal(err)
	}
	if want := 25.0 / 26; !nlClose(x[0], want, 1e-12, 0) {
		t.Errorf("DC load: v = %g, want %g", x[0], want)
	}
	d.SetStimulus(nil, 1)
	x = make([]float64, r.n)
	if _, err := r.newton(x, 10); err != nil {
		t.Fatal(err)
	}
	if want := 50.0 / 51; !nlClose(x[0], want, 1e-12, 0) {
		t.Errorf("strike off: v = %g, want %g (no load)", x[0], want)
	}
}

func TestStrikeNetworkRC(t *testing.T) {
	// A capacitor C charged to V0 discharging through R into RL:
	// i(t) = V0/(R+RL)·exp(−t/((R+RL)·C)) [RC circuit, analytic]. The
	// operating point holds x at s·V0 with no current into the node.
	const c0, v0, rs, rl = 150e-12, 2000.0, 330.0, 20.0
	st := &waveforms.Stimulus{Form: waveforms.Network, C: c0, V0: v0, R: rs}
	for _, sign := range []float64{1, -1} {
		d, r := strikeRig(t, st, sign, rl)
		r.c.DC = true
		x := make([]float64, r.n)
		if _, err := r.newton(x, 10); err != nil {
			t.Fatal(err)
		}
		if x[d.gen.nodes[0]] != sign*v0 || x[0] != 0 || x[d.gen.br[1]] != 0 {
			t.Fatalf("operating point: x = %v", x)
		}
		tau := (rs + rl) * c0
		h := tau / 2000
		worst := 0.0
		r.transient(t, h, 6000, func(tm float64, x []float64) {
			want := sign * v0 / (rs + rl) * math.Exp(-tm/tau)
			worst = math.Max(worst, math.Abs(x[d.gen.br[1]]-want)/(v0/(rs+rl)))
			if v := x[0]; !nlClose(v, x[d.gen.br[1]]*rl, 1e-9, 1e-12) {
				t.Fatalf("load voltage %g, current %g", v, x[d.gen.br[1]])
			}
		})
		// Two first-order steps then trapezoidal at τ/2000: the error is
		// dominated by the first steps, of order h/τ.
		if worst > 1e-3 {
			t.Errorf("sign %g: worst relative current error %g", sign, worst)
		}
	}
}

func TestStrikeNetworkRLC(t *testing.T) {
	// With a series L the discharge is an overdamped series RLC:
	// i(t) = V0/(L·(s1−s2))·(e^(s1·t) − e^(s2·t)), s1,2 the roots of
	// L·s² + R·s + 1/C = 0 [series RLC, analytic].
	const c0, v0, rs, l0, rl = 150e-12, 1000.0, 330.0, 1e-6, 10.0
	st := &waveforms.Stimulus{Form: waveforms.Network, C: c0, V0: v0, R: rs, L: l0}
	d, r := strikeRig(t, st, 1, rl)
	rt := rs + rl
	disc := math.Sqrt(rt*rt - 4*l0/c0)
	s1, s2 := (-rt+disc)/(2*l0), (-rt-disc)/(2*l0)
	ipk := 0.0
	worst := 0.0
	r.transient(t, 5e-12, 40000, func(tm float64, x []float64) {
		want := v0 / (l0 * (s1 - s2)) * (math.Exp(s1*tm) - math.Exp(s2*tm))
		ipk = math.Max(ipk, want)
		worst = math.Max(worst, math.Abs(x[d.gen.br[1]]-want))
	})
	if worst > 1e-3*ipk {
		t.Errorf("worst current error %g A of a %g A peak", worst, ipk)
	}
}

func TestStrikeJacobian(t *testing.T) {
	ramp := func(tm float64) float64 { return tm * 1e9 }
	for _, st := range []*waveforms.Stimulus{
		nil,
		{Form: waveforms.Current, F: ramp},
		{Form: waveforms.Thevenin, F: ramp, R: 50},
		{Form: waveforms.Network, C: 150e-12, V0: 2000, R: 330},
		{Form: waveforms.Network, C: 100e-12, V0: 2000, R: 1500, L: 7.5e-6},
	} {
		for _, dc := range []bool{true, false} {
			d := nlMust(t, nlElement("strike", "zap", "n", "r", nil, nil)).(*Strike)
			d.SetStimulus(st, -1)
			r := newNLRig(t, d, 0, 1)
			r.c.DC, r.c.T = dc, 3e-9
			name := "off"
			if st != nil {
				name = st.Form.String()
			}
			r.checkJacobian(t, nlRandom(r.n, 100, 3), fmt.Sprintf("strike %s dc=%v", name, dc))
		}
	}
}

// The strike keeps the stimulus's value for the time point Newton is
// solving; a new time, a new stimulus or a reset (a stimulus changed in
// place between runs) must each give the current value of F(t) = level·t
// [calc: the ramp itself].
func TestStrikeValueFollowsTimeAndStimulus(t *testing.T) {
	level := 2.0
	ramp := func(tm float64) float64 { return level * 1e9 * tm }
	st := &waveforms.Stimulus{Form: waveforms.Current, F: ramp}
	d, r := strikeRig(t, st, 1, 50)
	r.c.DC = false
	x := make([]float64, r.n)
	injected := func() float64 {
		r.eval(x, 0)
		return -r.c.F[0] - x[0]/50 // the strike draws −F from node 0; the load is 0 V
	}
	want := func(what string, v float64) {
		t.Helper()
		if got := injected(); got != v {
			t.Errorf("%s: injected %g A, want %g A", what, got, v)
		}
	}
	r.c.T = 1e-9
	want("first evaluation", 2)
	want("same time again", 2)
	r.c.T = 2e-9
	want("new time", 4)
	d.SetStimulus(&waveforms.Stimulus{Form: waveforms.Current, F: func(tm float64) float64 { return -ramp(tm) }}, 1)
	want("new stimulus at the same time", -4)
	d.SetStimulus(st, 1)
	want("first stimulus back", 4)
	level = 3 // the stimulus changed in place, as between two runs
	d.Reset()
	want("after a reset", 6)
}
