package devices

import (
	"fmt"
	"math"
	"math/cmplx"
	"testing"
)

// An invented bead, not any real part's data.
var beadNum = map[string]float64{"rdc": 0.15, "rac": 520, "l": 1.1e-6, "c": 1.3e-12}

func TestBeadJacobian(t *testing.T) {
	for vi, num := range []map[string]float64{
		beadNum,
		{"rdc": 0, "rac": 300, "l": 0.5e-6, "c": 2e-12},
		{"rdc": 0.05, "l": 1e-6},
		{"rdc": 0.1, "rac": 600, "l": 2e-6, "c": 1e-12, "isat": 0.3},
	} {
		d := nlMust(t, nlElement("bead", "FB1", "a", "b", num, nil))
		for _, b := range []int{1, Ground} {
			r := newNLRig(t, d, 0, b)
			for k, i := range []float64{0, 0.1, -0.45, 2} {
				x := nlRandom(r.n, 1, uint64(10*vi+k+1))
				x[r.nd.Branches[0]] = i
				r.checkJacobian(t, x, fmt.Sprintf("bead %d b=%d i=%g", vi, b, i))
			}
		}
	}
}

// beadImpedance is the small-signal impedance between a and gnd of the
// linearised stamps at the operating point x: Y(ω) = G + jω·C, where G is
// the static Jacobian and C the charge Jacobian, and Z = (Y⁻¹)[a][a].
func beadImpedance(t *testing.T, r *nlRig, x []float64, f float64) complex128 {
	t.Helper()
	n := r.n
	r.eval(x, 0)
	g := append([]float64(nil), r.c.J...)
	const alpha = 1e6
	r.eval(x, alpha)
	y := make([]complex128, n*n)
	w := 2 * math.Pi * f
	for k := range y {
		y[k] = complex(g[k], w*(r.c.J[k]-g[k])/alpha)
	}
	rhs := make([]complex128, n)
	rhs[0] = 1
	// Gaussian elimination with partial pivoting on complex numbers.
	for k := range n {
		p := k
		for i := k + 1; i < n; i++ {
			if cmplx.Abs(y[i*n+k]) > cmplx.Abs(y[p*n+k]) {
				p = i
			}
		}
		for j := range n {
			y[k*n+j], y[p*n+j] = y[p*n+j], y[k*n+j]
		}
		rhs[k], rhs[p] = rhs[p], rhs[k]
		for i := k + 1; i < n; i++ {
			m := y[i*n+k] / y[k*n+k]
			for j := k; j < n; j++ {
				y[i*n+j] -= m * y[k*n+j]
			}
			rhs[i] -= m * rhs[k]
		}
	}
	for k := n - 1; k >= 0; k-- {
		s := rhs[k]
		for j := k + 1; j < n; j++ {
			s -= y[k*n+j] * rhs[j]
		}
		rhs[k] = s / y[k*n+k]
	}
	return rhs[0]
}

func TestBeadImpedance(t *testing.T) {
	// MODELS.md: Z(f) = rdc + 1/(1/rac + 1/(j2πf·l) + j2πf·c); |Z| peaks
	// near f0 = 1/(2π√(lc)) at about rdc + rac (CHECKS.md [practice]; at f0
	// exactly the l and c admittances cancel, so Z(f0) = rdc + rac [calc]).
	rdc, rac, l, c := beadNum["rdc"], beadNum["rac"], beadNum["l"], beadNum["c"]
	d := nlMust(t, nlElement("bead", "FB1", "a", "gnd", beadNum, nil))
	r := newNLRig(t, d, 0, Ground)
	x := make([]float64, r.n)
	formula := func(f float64) complex128 {
		w := complex(0, 2*math.Pi*f)
		return complex(rdc, 0) + 1/(complex(1/rac, 0)+1/(w*complex(l, 0))+w*complex(c, 0))
	}
	for _, f := range []float64{1e3, 1e6, 30e6, 100e6, 1e9, 10e9} {
		z, want := beadImpedance(t, r, x, f), formula(f)
		if cmplx.Abs(z-want) > 1e-8*cmplx.Abs(want) {
			t.Errorf("Z(%g Hz) = %v, MODELS.md formula %v", f, z, want)
		}
	}
	f0 := 1 / (2 * math.Pi * math.Sqrt(l*c))
	if z := beadImpedance(t, r, x, f0); math.Abs(cmplx.Abs(z)-(rdc+rac)) > 1e-6*(rdc+rac) {
		t.Errorf("|Z(f0)| = %g, want rdc+rac = %g", cmplx.Abs(z), rdc+rac)
	}
	best, fBest := 0.0, 0.0
	for f := f0 / 10; f < f0*10; f *= 1.01 {
		if m := cmplx.Abs(beadImpedance(t, r, x, f)); m > best {
			best, fBest = m, f
		}
	}
	if math.Abs(fBest/f0-1) > 0.05 || math.Abs(best/(rdc+rac)-1) > 0.01 {
		t.Errorf("|Z| peaks at %g Ω, %g Hz; want about %g Ω near %g Hz", best, fBest, rdc+rac, f0)
	}
	// Low frequency: nearly a short, its rdc [CHECKS.md, practice].
	if z := beadImpedance(t, r, x, 1); math.Abs(cmplx.Abs(z)-rdc) > 1e-3*rdc {
		t.Errorf("|Z(1 Hz)| = %g, want about rdc = %g", cmplx.Abs(z), rdc)
	}
}

func TestBeadSaturationFlux(t *testing.T) {
	// MODELS.md: λ(i) = l·isat·atan(i/isat), dλ/di = l/(1+(i/isat)²). The
	// magnetic energy W(I) = ∫₀^I i·dλ must be a function of I alone; with
	// this flux W(I) = ½·l·isat²·ln(1+x²), x = I/isat [calc].
	// Integrating the stamped dλ/di reproduces both λ and W, so no current
	// cycle creates energy.
	l, isat := 2e-6, 0.3
	num := map[string]float64{"l": l, "isat": isat}
	d := nlMust(t, nlElement("bead", "FB1", "a", "gnd", num, nil))
	r := newNLRig(t, d, 0, Ground)
	br := r.nd.Branches[0]
	x := make([]float64, r.n)
	dlam := func(i float64) float64 {
		x[br] = i
		r.eval(x, 1e6)
		a := r.c.J[br*r.n+br]
		r.eval(x, 0)
		return -(a - r.c.J[br*r.n+br]) / 1e6 // branch row carries −dλ/dt
	}
	for _, top := range []float64{0.01, 0.3, 1.7, -2.5} {
		x[br] = top
		r.eval(x, 0)
		lam := r.c.Q[0]
		if want := l * isat * math.Atan(top/isat); !nlClose(lam, want, 1e-12, 0) {
			t.Errorf("λ(%g) = %g, want %g", top, lam, want)
		}
		// Simpson's rule on the stamped dλ/di, 2000 panels.
		const m = 2000
		var lamInt, wInt float64
		h := top / m
		for k := 0; k <= m; k++ {
			i := float64(k) * h
			wgt := 2.0
			switch {
			case k == 0 || k == m:
				wgt = 1
			case k%2 == 1:
				wgt = 4
			}
			dl := dlam(i)
			lamInt += wgt * dl
			wInt += wgt * i * dl
		}
		lamInt *= h / 3
		wInt *= h / 3
		xs := top / isat
		wantW := 0.5 * l * isat * isat * math.Log1p(xs*xs)
		if !nlClose(lamInt, lam, 1e-9, 0) || !nlClose(wInt, wantW, 1e-9, 1e-30) {
			t.Errorf("I=%g: ∫dλ = %g (λ %g), W = %g, want %g", top, lamInt, lam, wInt, wantW)
		}
	}
	// Small currents see the plain inductance.
	if got := dlam(1e-6); !nlClose(got, l, 1e-9, 0) {
		t.Errorf("dλ/di(0) = %g, want l = %g", got, l)
	}
}
