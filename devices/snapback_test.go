package devices

import (
	"math"
	"testing"
)

// snapSpec is an invented snapback clamp for the tests.
var snapSpec = SnapbackSpec{Name: "S1", Nodes: [2]string{"a", "gnd"},
	Vt1: 8.5, It1: 0.05, Vh: 4.2, Ih: 0.6, Ron: 1.2, Nbr: 1.5, Cj: 2e-12, Ls: 0.3e-9}

func mustSnapLaw(t testing.TB, s SnapbackSpec) *SnapbackLaw {
	t.Helper()
	l, err := NewSnapbackLaw(s)
	if err != nil {
		t.Fatal(err)
	}
	return l
}

func TestSnapbackCurvePoints(t *testing.T) {
	// The defining properties of the S-curve (the model's doc comment): the
	// trigger point is the maximum of V(I) at (vt1, it1), the holding point
	// its minimum at (vh, ih), the slope tends to ron, and the curve is
	// smooth at both joins [calc: the formulas, differentiated by central
	// differences here].
	for _, bi := range []bool{false, true} {
		s := snapSpec
		s.Bi = bi
		l := mustSnapLaw(t, s)
		check := func(what string, got, want, tol float64) {
			t.Helper()
			if math.Abs(got-want) > tol {
				t.Errorf("bi=%v: %s = %.12g, want %.12g", bi, what, got, want)
			}
		}
		v, dv := l.V(s.It1)
		check("V(it1)", v, s.Vt1, 1e-12)
		check("V'(it1)", dv, 0, 1e-9)
		v, dv = l.V(s.Ih)
		check("V(ih)", v, s.Vh, 1e-12)
		check("V'(ih)", dv, 0, 1e-12)
		_, dv = l.V(50)
		check("V'(50 A)", dv, s.Ron, 1e-9)
		for _, i0 := range []float64{s.It1, s.Ih} {
			for _, side := range []float64{-1, 1} {
				h := 1e-7 * i0
				x := i0 + side*3*h
				vp, _ := l.V(x + h)
				vm, _ := l.V(x - h)
				_, d := l.V(x)
				if math.Abs((vp-vm)/(2*h)-d) > 1e-4*math.Max(1, math.Abs(d)) {
					t.Errorf("bi=%v: V' at %g A = %g, difference %g", bi, x, d, (vp-vm)/(2*h))
				}
			}
			// Slope continuous across the join.
			_, dl := l.V(i0 * (1 - 1e-9))
			_, dr := l.V(i0 * (1 + 1e-9))
			if math.Abs(dl-dr) > 1e-5*math.Max(1, math.Abs(dl)) {
				t.Errorf("bi=%v: V' jumps at %g A: %g | %g", bi, i0, dl, dr)
			}
		}
		// V = u_j + ρ everywhere, and V is odd for bi.
		for _, i := range []float64{-3, -0.2, -1e-6, 1e-9, 1e-4, 0.03, 0.05, 0.2, 0.6, 2, 30} {
			v, _ := l.V(i)
			u, _ := l.Junction(i)
			r, _ := l.rho(i)
			if math.Abs(v-(u+r)) > 1e-12*math.Max(1, math.Abs(v)) {
				t.Errorf("bi=%v: V(%g) = %g, u_j + ρ = %g", bi, i, v, u+r)
			}
			if bi {
				vm, _ := l.V(-i)
				if vm != -v {
					t.Errorf("bi: V(−%g) = %g, −V = %g", i, vm, -v)
				}
			}
			// The junction's own current law inverts u_j.
			ij, _ := l.current(u)
			if math.Abs(ij-i) > 1e-9*math.Abs(i)+1e-18 {
				t.Errorf("bi=%v: i_j(u_j(%g)) = %g", bi, i, ij)
			}
		}
	}
}

func TestSnapbackSpecErrors(t *testing.T) {
	for _, c := range []struct {
		mod  func(*SnapbackSpec)
		want string
	}{
		{func(s *SnapbackSpec) { s.Vh = 9 }, "vh (9 V) must lie below the trigger voltage vt1 (8.5 V)"},
		{func(s *SnapbackSpec) { s.Ih = 0.01 }, "ih (0.01 A) must exceed the trigger current it1 (0.05 A)"},
		{func(s *SnapbackSpec) { s.Ron = 0 }, "ron must be > 0, got 0"},
		{func(s *SnapbackSpec) { s.Cj = -1 }, "cj must be >= 0, got -1"},
	} {
		s := snapSpec
		c.mod(&s)
		if _, err := NewSnapback(s); err == nil || !contains(err.Error(), c.want) {
			t.Errorf("%+v: %v, want %q", s, err, c.want)
		}
	}
}

func contains(s, sub string) bool {
	return len(sub) == 0 || (len(s) >= len(sub) && (s[:len(sub)] == sub || contains(s[1:], sub)))
}

func TestSnapbackJacobian(t *testing.T) {
	// Finite-difference check of every stamp (the rig's source: the
	// definition of the Jacobian), in blocking, snapback, on-state and
	// reverse, uni and bi.
	for _, bi := range []bool{false, true} {
		s := snapSpec
		s.Bi = bi
		d, err := NewSnapback(s)
		if err != nil {
			t.Fatal(err)
		}
		r := newNLRig(t, d, 0, Ground)
		r.c.Gmin = 1e-12
		// x = (v(a), v(k), i): the junction voltage and the branch current.
		for _, x := range [][]float64{
			{5.0, 0.0, 1e-9},
			{8.4, 0.05, 0.01},
			{7.9, 1.0, 0.3},
			{5.5, 1.9, 2},
			{-0.7, -0.05, -0.05},
			{-0.9, 0.3, 0.4},
		} {
			r.checkJacobian(t, x, "snapback")
		}
	}
}

func TestSnapbackNewtonOnCurve(t *testing.T) {
	// Driven by an ideal current at DC, the rig's Newton lands on V(I) at
	// every current of the S-curve, negative resistance included.
	d, err := NewSnapback(snapSpec)
	if err != nil {
		t.Fatal(err)
	}
	l := d.Law()
	for _, i0 := range []float64{-2, -0.01, 1e-7, 1e-3, 0.049, 0.1, 0.3, 0.59, 0.61, 3, 25} {
		r := newNLRig(t, d, 0, Ground)
		r.c.Gmin = 1e-12
		r.extra = func(c *Context) { c.Inject(0, Ground, i0) }
		x := make([]float64, r.n)
		d.Reset()
		if _, err := r.newton(x, 200); err != nil {
			t.Fatalf("I = %g A: %v", i0, err)
		}
		// The junction shares the current with gmin: the S-curve carries
		// I − gmin·v(a).
		want, _ := l.V(i0 - r.c.Gmin*x[0])
		if math.Abs(x[0]-want) > 1e-9*math.Max(1, math.Abs(want)) {
			t.Errorf("I = %g A: v(a) = %.10g, V(I) = %.10g", i0, x[0], want)
		}
	}
}
