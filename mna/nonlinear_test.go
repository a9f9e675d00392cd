package mna

import (
	"errors"
	"math"
	"testing"

	"zapnet/waveforms"
)

// lambertW is the principal branch W0(x) for x ≥ 0, from Halley's iteration
// on w·e^w − x = 0 [pub: Corless, Gonnet, Hare, Jeffrey & Knuth, "On the
// Lambert W function", Adv. Comput. Math. 5 (1996), eq. 5.9].
func lambertW(x float64) float64 {
	w := math.Log1p(x) // a start on the right side of the root for x ≥ 0
	if x > 3 {
		l := math.Log(x)
		w = l - math.Log(l)
	}
	for range 50 {
		ew := math.Exp(w)
		f := w*ew - x
		next := w - f/(ew*(w+1)-(w+2)*f/(2*w+2))
		if math.Abs(next-w) <= 1e-15*(1+math.Abs(next)) {
			return next
		}
		w = next
	}
	return w
}

// [calc] A supply V behind R into a diode i = Is·(e^{v/(n·Vt)} − 1) (MODELS.md,
// Vt = k·T/q at 300 K): KCL (V − v)/R = Is·(e^{v/a} − 1), a = n·Vt, solves to
// v = V + Is·R − a·W((Is·R/a)·e^{(V+Is·R)/a}).
func TestDiodeResistorOperatingPoint(t *testing.T) {
	const k, q, T = 1.380649e-23, 1.602176634e-19, 300.0 // [pub: SI 2019 exact constants]
	vt := k * T / q
	for _, c := range []struct{ V, R, Is, n float64 }{
		{5, 1e3, 1e-14, 1},
		{1, 100, 1e-12, 2},
		{12, 47, 1e-9, 1.5},
		{0.2, 1e4, 1e-14, 1}, // below the knee: the diode barely conducts
	} {
		s := compile(t,
			el("supply", "V1", "a", "gnd", c.V, "r", c.R),
			el("diode", "D1", "a", "gnd", 0, "is", c.Is, "n", c.n))
		a := c.n * vt
		want := c.V + c.Is*c.R - a*lambertW(c.Is*c.R/a*math.Exp((c.V+c.Is*c.R)/a))
		// The tight case also drops Gmin, whose 1e-12 S would shift v by
		// about Gmin·R·v (2 nV in the last case).
		for _, set := range []*Settings{nil, {RelTol: 1e-9, AbsTol: 1e-12, Gmin: 1e-20}} {
			v, err := s.OperatingPoint(set)
			if err != nil {
				t.Fatal(err)
			}
			// Default tolerances: within 0.1 mV; tight ones: within 1 nV.
			lim := 1e-4
			if set != nil {
				lim = 1e-9
			}
			if d := math.Abs(v[0] - want); d > lim {
				t.Errorf("V=%g R=%g Is=%g n=%g: v = %.10g V, want %.10g V (off %.2g V)", c.V, c.R, c.Is, c.n, v[0], want, d)
			}
		}
	}
}

// The Halley iteration itself against W's defining identity and two known
// values [pub: Corless et al. 1996: W(e) = 1, W(0) = 0].
func TestLambertW(t *testing.T) {
	if w := lambertW(math.E); math.Abs(w-1) > 1e-14 {
		t.Errorf("W(e) = %.16g, want 1", w)
	}
	if w := lambertW(0); w != 0 {
		t.Errorf("W(0) = %g, want 0", w)
	}
	for _, x := range []float64{1e-6, 0.5, 10, 1e5, 1e80} {
		w := lambertW(x)
		if d := math.Abs(w + math.Log(w) - math.Log(x)); d > 1e-13*math.Max(1, math.Log(x)) {
			t.Errorf("W(%g) = %.16g does not satisfy w + ln w = ln x (off %.2g)", x, w, d)
		}
	}
}

// ramp is V·min(1, t/tr) for t > 0, with its corner as a breakpoint.
func ramp(v, tr, r, stop float64) *waveforms.Stimulus {
	return &waveforms.Stimulus{Name: "test-ramp", Form: waveforms.Thevenin, R: r, Stop: stop,
		Breakpoints: []float64{tr},
		F: func(t float64) float64 {
			if t <= 0 {
				return 0
			}
			return v * math.Min(1, t/tr)
		}}
}

// [calc] Bounce diagram of a lossless line (delay T, impedance z0) driven by
// f(t) behind Rs and loaded by RL: with A = z0/(Rs+z0), ΓS = (Rs−z0)/(Rs+z0),
// ΓL = (RL−z0)/(RL+z0),
// v_out(t) = Σ_k A·(ΓS·ΓL)^k·(1+ΓL)·f(t − (2k+1)T),
// v_in(t) = A·f(t) + Σ_{k≥1} A·ΓL^k·ΓS^(k−1)·(1+ΓS)·f(t − 2kT)
// [pub: the lattice diagram of any transmission-line textbook].
func TestLineBounceDiagram(t *testing.T) {
	const V, z0, T = 1.0, 50.0, 1e-9
	tr := 0.1 * T
	for _, c := range []struct {
		name   string
		Rs, RL float64
	}{
		{"matched", z0, z0},
		{"open-ish load", z0, 1e4},
		{"both mismatched", 10, 200},
	} {
		t.Run(c.name, func(t *testing.T) {
			stop := 9.5 * T
			s := compile(t,
				el(testSourceKind, "src", "in", "gnd", 0),
				el("line", "TL", "in", "out", 0, "z0", z0, "delay", T),
				el("resistor", "RL", "out", "gnd", c.RL))
			s.SetStimulus(ramp(V, tr, c.Rs, stop), 1)
			// The wavefronts reach the ports through the line's history, not
			// through a charge the error control watches, and a resistive
			// termination has no charge at all: the step must resolve the
			// edges by itself.
			res, err := s.Transient(&Settings{Record: true, MaxStep: T / 20})
			if err != nil {
				t.Fatal(err)
			}
			A := z0 / (c.Rs + z0)
			gs := (c.Rs - z0) / (c.Rs + z0)
			gl := (c.RL - z0) / (c.RL + z0)
			f := func(t float64) float64 { return V * math.Max(0, math.Min(1, t/tr)) }
			vout := func(t float64) float64 {
				v := 0.0
				for k := 0; float64(2*k+1)*T < t; k++ {
					v += A * math.Pow(gs*gl, float64(k)) * (1 + gl) * f(t-float64(2*k+1)*T)
				}
				return v
			}
			vin := func(t float64) float64 {
				v := A * f(t)
				for k := 1; float64(2*k)*T < t; k++ {
					v += A * math.Pow(gl, float64(k)) * math.Pow(gs, float64(k-1)) * (1 + gs) * f(t-float64(2*k)*T)
				}
				return v
			}
			in, out := nodeIndex(t, s, "in"), nodeIndex(t, s, "out")
			// Compare at the middle of each half-delay interval, away from
			// the wavefronts, interpolating between recorded points.
			for m := 0.75; m < 9.5; m += 0.5 {
				tm := m * T
				for _, p := range []struct {
					name string
					v    []float64
					want func(float64) float64
				}{{"v(in)", res.V[in], vin}, {"v(out)", res.V[out], vout}} {
					got := interp(res.Time, p.v, tm)
					if d := math.Abs(got - p.want(tm)); d > 1e-2*V {
						t.Errorf("%s at %.2f T: %.5f V, want %.5f V", p.name, m, got, p.want(tm))
					}
				}
			}
		})
	}
}

// interp is the piecewise-linear value of (ts, vs) at t.
func interp(ts, vs []float64, t float64) float64 {
	for k := 1; k < len(ts); k++ {
		if ts[k] >= t {
			w := (t - ts[k-1]) / (ts[k] - ts[k-1])
			return vs[k-1] + w*(vs[k]-vs[k-1])
		}
	}
	return vs[len(vs)-1]
}

// [calc] Two diodes in series carry one current i ≈ Is1·e^{v1/a} = Is2·e^{v2/a}
// (the −1 terms are below 1e-12 of i here), so together they are one diode
// with n = 2 and Is = √(Is1·Is2), whose operating point behind R is the
// Lambert W form above. With too few Newton iterations for a start from
// zero the operating point must come from the fallbacks and still be right.
func TestOperatingPointFallbacks(t *testing.T) {
	const V, R, is1, is2 = 30.0, 0.01, 1e-14, 1e-9
	vt := 1.380649e-23 * 300 / 1.602176634e-19
	a := 2 * vt
	is := math.Sqrt(is1 * is2)
	want := V + is*R - a*lambertW(is*R/a*math.Exp((V+is*R)/a))
	s := compile(t,
		el("supply", "V1", "a", "gnd", V, "r", R),
		el("diode", "D1", "a", "b", 0, "is", is1),
		el("diode", "D2", "b", "gnd", 0, "is", is2))
	for _, c := range []struct {
		maxIter int
		method  string
	}{{50, "newton"}, {6, "source stepping"}} {
		v, err := s.OperatingPoint(&Settings{MaxIter: c.maxIter})
		if err != nil {
			t.Fatalf("MaxIter %d: %v", c.maxIter, err)
		}
		if s.dcMethod != c.method {
			t.Errorf("MaxIter %d: solved by %s, want %s", c.maxIter, s.dcMethod, c.method)
		}
		if d := math.Abs(v[0] - want); d > 1e-4 {
			t.Errorf("MaxIter %d: v(a) = %.8f V, want %.8f V", c.maxIter, v[0], want)
		}
	}
	// Two iterations cannot even confirm convergence: a named error.
	_, err := s.OperatingPoint(&Settings{MaxIter: 2})
	var se *SolveError
	if !errors.As(err, &se) || se.Time >= 0 || se.Hint == "" {
		t.Errorf("MaxIter 2: got %v, want an operating-point *SolveError with a hint", err)
	}
}

// The nonlinear models and the strike keep values between evaluations (the
// stimulus at the time point being solved, the last junction evaluation):
// two runs of one system, with a run of another stimulus between them, and
// a run of a fresh system still agree bit for bit [practice: a solution
// depends only on its circuit, stimulus and settings].
func TestReproducibleNonlinear(t *testing.T) {
	set := &Settings{Stop: 100e-9, Record: true}
	s := referenceNetwork(t)
	a, err := s.Transient(set)
	if err != nil {
		t.Fatal(err)
	}
	other, _ := waveforms.Lookup("iec61000-4-2").New(4000, nil)
	s.SetStimulus(other, -1)
	if _, err := s.Transient(set); err != nil {
		t.Fatal(err)
	}
	st, _ := waveforms.Lookup("iec61000-4-2").New(8000, nil)
	s.SetStimulus(st, 1)
	b, err := s.Transient(set)
	if err != nil {
		t.Fatal(err)
	}
	c, err := referenceNetwork(t).Transient(set)
	if err != nil {
		t.Fatal(err)
	}
	for name, r := range map[string]*Result{"second run": b, "fresh system": c} {
		if len(r.Time) != len(a.Time) || r.Stats.Newton != a.Stats.Newton || r.Balance != a.Balance {
			t.Fatalf("%s: %d points, %d Newton iterations; first run %d, %d", name, len(r.Time), r.Stats.Newton, len(a.Time), a.Stats.Newton)
		}
		for i := range a.V {
			for k := range a.V[i] {
				if a.V[i][k] != r.V[i][k] {
					t.Fatalf("%s: node %s differs at %g s", name, s.Nodes()[i], a.Time[k])
				}
			}
		}
		for i := range a.Energy {
			if a.Energy[i] != r.Energy[i] {
				t.Fatalf("%s: energy of %s differs", name, s.Elements()[i])
			}
		}
	}
}
