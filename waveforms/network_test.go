package waveforms

import (
	"math"
	"testing"
)

// rk4Network integrates the series R-L-C discharge as an ODE, independently
// of the closed form: dq/dt = −i, L·di/dt = q/C − R·i, q(0) = C·V0, i(0) = 0
// [calc: Kirchhoff's voltage law around the loop].
func rk4Network(v0, c, r, l, stop float64, n int) (ts, is []float64) {
	h := stop / float64(n)
	q, i := c*v0, 0.0
	f := func(q, i float64) (float64, float64) { return -i, (q/c - r*i) / l }
	for k := 0; k <= n; k++ {
		ts = append(ts, float64(k)*h)
		is = append(is, i)
		a1, b1 := f(q, i)
		a2, b2 := f(q+h/2*a1, i+h/2*b1)
		a3, b3 := f(q+h/2*a2, i+h/2*b2)
		a4, b4 := f(q+h*a3, i+h*b3)
		q += h / 6 * (a1 + 2*a2 + 2*a3 + a4)
		i += h / 6 * (b1 + 2*b2 + 2*b3 + b4)
	}
	return ts, is
}

// The closed-form discharge against the ODE in all three damping regimes.
func TestNetworkCurrentAgainstODE(t *testing.T) {
	c, l := 100e-12, 2.5e-6
	rc := 2 * math.Sqrt(l/c) // critical damping: 316.2 Ω
	for _, tc := range []struct {
		name string
		r    float64
	}{
		{"overdamped (HBM into a short)", 1500},
		{"critical", rc},
		{"underdamped", 20},
	} {
		stop := 600e-9
		ts, is := rk4Network(1000, c, tc.r, l, stop, 60000)
		peak, _ := AbsPeak(ts, is)
		worst := 0.0
		for k, x := range ts {
			worst = math.Max(worst, math.Abs(networkCurrent(x, 1000, c, tc.r, l)-is[k]))
		}
		if worst > 1e-7*peak {
			t.Errorf("%s: closed form departs from the ODE by %.3g A (peak %.3g A)", tc.name, worst, peak)
		}
	}
}

// Charge and energy conservation: whatever the damping, the loop delivers
// all of C·V0 and dissipates all of C·V0²/2 in its resistance [calc].
func TestNetworkConservation(t *testing.T) {
	for _, r := range []float64{1500, 330, 40} {
		s := newNetwork(1000, 100e-12, r, 2.5e-6)
		// Long enough for every regime to die out: 20 time constants.
		stop := 20 * math.Max(r*s.C, 2*s.L/r)
		ts, is := grid(0, stop, 400000, func(x float64) float64 { return networkCurrent(x, s.V0, s.C, r, s.L) })
		near(t, "charge", Integral(ts, is), s.C*s.V0, 1e-5)
		vr := make([]float64, len(is))
		for k := range is {
			vr[k] = r * is[k]
		}
		near(t, "energy in R", Energy(ts, vr, is), s.C*s.V0*s.V0/2, 1e-5)
	}
}

// The ideal RC limit of the HBM network: 0.6667 A/kV at t = 0 decaying with
// τ = R·C = 150 ns [calc: CHECKS.md].
func TestHBMIdealLimit(t *testing.T) {
	s, err := mk("hbm", 2000, map[string]float64{"l": 0}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if s.Form != Network || s.C != 100e-12 || s.R != 1500 || s.V0 != 2000 || s.L != 0 {
		t.Fatalf("network %+v", s)
	}
	ts, is, _ := Sample(s, 0, 1e-7)
	pk, at := Peak(ts, is)
	near(t, "peak per kV", pk/2, 0.6667, 1e-4)
	nearAbs(t, "peak time", at, 0, 0)
	near(t, "tau", mustCross(t, ts, is, pk*math.Exp(-1)), 150e-9, 1e-6)
}

func mustCross(t *testing.T, ts, ys []float64, level float64) float64 {
	t.Helper()
	at, ok := FirstCrossing(ts, ys, level)
	if !ok {
		t.Fatalf("no crossing of %g", level)
	}
	return at
}

// HBM with the default series inductance into a short meets JS-001's
// window at every common level [pub: JS-001 via CHECKS.md], and so does an
// explicit l that the JS-001 rise window allows.
func TestHBMChecksIntoShort(t *testing.T) {
	for _, lv := range []float64{500, 1000, 2000, 4000, 8000} {
		s, err := mk("hbm", lv, nil, nil)
		if err != nil {
			t.Fatal(err)
		}
		if s.L != hbmL {
			t.Fatalf("default l = %g, want %g", s.L, hbmL)
		}
		expectAllWithin(t, s, 0)
	}
	s, _ := mk("hbm", 2000, map[string]float64{"l": 5e-6}, nil)
	expectAllWithin(t, s, 0)
	// Without inductance the rise is zero: outside JS-001's window, as it
	// should be for an ideal RC.
	s, _ = mk("hbm", 2000, map[string]float64{"l": 0}, nil)
	cs, _ := Checks(s, 0)
	if cs[1].Quantity != "rise 10-90 %" || cs[1].Within {
		t.Errorf("ideal RC rise check: %+v", cs[1])
	}
}

func expectAllWithin(t *testing.T, s *Stimulus, load float64) {
	t.Helper()
	cs, err := Checks(s, load)
	if err != nil {
		t.Fatal(err)
	}
	if len(cs) == 0 {
		t.Fatalf("%s: no checks", s.Name)
	}
	for _, c := range cs {
		if !c.Within {
			t.Errorf("%s at %g %s into %g Ω: %s = %s, published %s %s (%s)", s.Name, s.Level, s.Unit, load,
				c.Quantity, FormatValue(c.Computed, c.Unit), FormatValue(c.Published, c.Unit), c.Tol, c.Source)
		}
	}
}

// Every ISO 10605 network into a short meets its points [mem: CHECKS.md],
// and the points agree with the RC time constant to a few per cent [calc].
func TestISO10605Networks(t *testing.T) {
	for _, p := range isoPoints {
		for _, lv := range []float64{2000, 8000, 15000} {
			s, err := mk("iso10605", lv, map[string]float64{"c": p.c, "r": p.r}, nil)
			if err != nil {
				t.Fatal(err)
			}
			cs, _ := Checks(s, DefaultLoad)
			if len(cs) != 2 {
				t.Fatalf("%g/%g: %d checks", p.c, p.r, len(cs))
			}
			expectAllWithin(t, s, 0)
			// The RC value itself: V/R·e^(−t/RC).
			near(t, "rc point", cs[0].Computed, lv/p.r*math.Exp(-p.t1/(p.r*p.c)), 1e-6)
		}
	}
	s, err := mk("iso10605", 8000, nil, nil)
	if err != nil || s.C != 150e-12 || s.R != 330 {
		t.Fatalf("defaults: %+v, %v", s, err)
	}
	// Other values: no published points, no error.
	s, _ = mk("iso10605", 8000, map[string]float64{"c": 200e-12}, nil)
	if cs, err := Checks(s, 0); err != nil || len(cs) != 0 {
		t.Errorf("non-standard network: %v, %v", cs, err)
	}
	for _, bad := range []map[string]float64{{"c": 0}, {"r": -1}, {"l": -1e-9}, {"c": math.NaN()}} {
		if _, err := mk("iso10605", 8000, bad, nil); err == nil {
			t.Errorf("%v accepted", bad)
		}
	}
}

// Into a resistive load the current is the same discharge through R+load
// [calc], and the voltage is i·load; an open load carries nothing.
func TestNetworkIntoLoad(t *testing.T) {
	s, _ := mk("hbm", 1000, nil, nil)
	i, v := s.Into(500, 20e-9)
	near(t, "i into 500 Ω", i, networkCurrent(20e-9, 1000, 100e-12, 2000, hbmL), 1e-15)
	near(t, "v across 500 Ω", v, 500*i, 1e-15)
	i, v = s.Into(math.Inf(1), 20e-9)
	if i != 0 || v != 1000 {
		t.Errorf("open load: i = %g, v = %g", i, v)
	}
}
