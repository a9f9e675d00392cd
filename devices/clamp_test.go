package devices

import (
	"fmt"
	"math"
	"testing"
)

// vtRef is k·T/q at 300 K from the CODATA 2018 exact constants [pub],
// written out here independently of the package's constant.
const vtRef = 1.380649e-23 * 300 / 1.602176634e-19

// clampIRef is the clamp junction current of MODELS.md, written straight
// from the contract's formula (the source of the check).
func clampIRef(u, vbr, it, nbr, is, n float64, bi bool) float64 {
	if bi {
		s := 1.0
		if u < 0 {
			s = -1
		}
		return s * it * (math.Exp((math.Abs(u)-vbr)/(nbr*vtRef)) - math.Exp(-vbr/(nbr*vtRef)))
	}
	return it*(math.Exp((u-vbr)/(nbr*vtRef))-math.Exp(-vbr/(nbr*vtRef))) - is*(math.Exp(-u/(n*vtRef))-1)
}

func TestThermalVoltage(t *testing.T) {
	// k·T/q at 300 K ≈ 25.852 mV (MODELS.md) [calc].
	if math.Abs(ThermalVoltage-0.025852) > 5e-7 {
		t.Fatalf("Vt = %.7g V, want 25.852 mV", ThermalVoltage)
	}
}

func TestClampCurrentMatchesContract(t *testing.T) {
	// MODELS.md clamp junction law, evaluated through the device's stamps
	// at a sweep of u, compared with the formula written in the test.
	for _, pol := range []string{"uni", "bi"} {
		for _, par := range []struct{ vbr, it, nbr, is, n float64 }{
			{6.8, 1e-3, 1, 1e-14, 1},
			{12, 5e-3, 1.3, 3e-12, 1.8},
			{3.3, 1e-4, 2, 1e-9, 1.2},
		} {
			e := nlElement("clamp", "D1", "a", "gnd", map[string]float64{
				"vbr": par.vbr, "it": par.it, "nbr": par.nbr, "is": par.is, "n": par.n,
			}, map[string]string{"polarity": pol})
			r := newNLRig(t, nlMust(t, e), 0, Ground)
			for u := -1.0; u <= par.vbr+0.6; u += 0.01 {
				if pol == "uni" && u < -0.9 {
					continue // keep exp below the tangent cap for every n
				}
				r.settle(t, []float64{u})
				r.eval([]float64{u}, 0)
				want := clampIRef(u, par.vbr, par.it, par.nbr, par.is, par.n, pol == "bi")
				if got := r.c.F[0]; !nlClose(got, want, 1e-9, 1e-20) { // 1e-20 A: rounding of i(0) = 0
					t.Errorf("%s %+v: i(%.3f) = %.12g, MODELS.md formula %.12g", pol, par, u, got, want)
				}
			}
		}
	}
	// The bi law is odd: i(−u) = −i(u) [MODELS.md].
	e := nlElement("clamp", "D2", "a", "gnd", map[string]float64{"vbr": 5}, map[string]string{"polarity": "bi"})
	r := newNLRig(t, nlMust(t, e), 0, Ground)
	for _, u := range []float64{0.3, 4.9, 5.2} {
		r.settle(t, []float64{u})
		ip := r.c.F[0]
		r.settle(t, []float64{-u})
		if im := r.c.F[0]; ip != -im {
			t.Errorf("bi clamp not odd at %g V: %g vs %g", u, ip, im)
		}
	}
}

func TestClampDefaults(t *testing.T) {
	// MODELS.md defaults: it = 1 mA, nbr = 1, is = 1e-14 A, n = 1, uni. At
	// u = vbr the breakdown term is it·(1 − e^(−vbr/Vt)) and the forward
	// term −is·(e^(−vbr/Vt) − 1) ≈ +is [calc].
	e := nlElement("clamp", "D1", "a", "gnd", map[string]float64{"vbr": 5}, nil)
	r := newNLRig(t, nlMust(t, e), 0, Ground)
	r.settle(t, []float64{5})
	want := 1e-3*(1-math.Exp(-5/vtRef)) + 1e-14*(1-math.Exp(-5/vtRef))
	if got := r.c.F[0]; !nlClose(got, want, 1e-12, 0) {
		t.Fatalf("i(vbr) = %.15g, want %.15g", got, want)
	}
	if _, err := build(nlElement("clamp", "D1", "a", "gnd", map[string]float64{}, nil)); err == nil {
		t.Error("clamp without vbr accepted; MODELS.md says vbr is required")
	}
	if _, err := build(nlElement("clamp", "D1", "a", "gnd", map[string]float64{"vbr": 5}, map[string]string{"polarity": "both"})); err == nil {
		t.Error("polarity=both accepted for a clamp")
	}
}

func TestClampChargeMatchesContract(t *testing.T) {
	// MODELS.md junction charge: q = sign(u)·cj·vj/(1−m)·[(1+|u|/vj)^(1−m) − 1],
	// C = cj·(1+|u|/vj)^(−m); m = 0 is linear.
	cj, vj := 10e-12, 0.7
	for _, m := range []float64{0, 0.33, 0.5} {
		e := nlElement("clamp", "D1", "a", "gnd", map[string]float64{"vbr": 6, "cj": cj, "vj": vj, "m": m}, nil)
		r := newNLRig(t, nlMust(t, e), 0, Ground)
		for _, u := range []float64{-0.5, 0, 0.2, 3, 5.9} {
			r.settle(t, []float64{u})
			wantQ := cj * u
			if m > 0 {
				s := math.Copysign(1, u)
				wantQ = s * cj * vj / (1 - m) * (math.Pow(1+math.Abs(u)/vj, 1-m) - 1)
			}
			if got := r.c.Q[0]; !nlClose(got, wantQ, 1e-12, 1e-30) {
				t.Errorf("m=%g: q(%g) = %g, want %g", m, u, got, wantQ)
			}
			r.eval([]float64{u}, 1e9)
			gotC := r.c.J[0]
			r.eval([]float64{u}, 0)
			gotC = (gotC - r.c.J[0]) / 1e9
			wantC := cj * math.Pow(1+math.Abs(u)/vj, -m)
			if !nlClose(gotC, wantC, 1e-9, 1e-30) {
				t.Errorf("m=%g: C(%g) = %g, want %g", m, u, gotC, wantC)
			}
		}
	}
}

// clampVariants are the shapes the Jacobian check covers.
func clampVariants() []map[string]float64 {
	return []map[string]float64{
		{"vbr": 6.8},
		{"vbr": 6.8, "rdyn": 0.35},
		{"vbr": 6.8, "ls": 0.4e-9},
		{"vbr": 6.8, "rdyn": 0.35, "ls": 0.4e-9, "cj": 8e-12},
		{"vbr": 6.8, "rdyn": 0.2, "cj": 30e-12, "m": 0.4, "vj": 0.8, "it": 5e-3, "nbr": 1.4, "is": 1e-12, "n": 1.5},
	}
}

func TestClampJacobian(t *testing.T) {
	// Stamped Jacobian and charge derivatives against central differences,
	// forward, near zero, reverse, breakdown (both signs for bi).
	for vi, num := range clampVariants() {
		for _, pol := range []string{"uni", "bi"} {
			for _, gnd := range []bool{false, true} {
				e := nlElement("clamp", "D1", "a", "b", num, map[string]string{"polarity": pol})
				d := nlMust(t, e).(*Clamp)
				b := 1
				if gnd {
					b = Ground
				}
				r := newNLRig(t, d, 0, b)
				r.c.Gmin = 1e-12
				for _, u := range []float64{-0.75, -0.3, -1e-3, 0, 2e-3, 3, 6.8, 6.95, 7.2, -6.95, -7.1} {
					if pol == "uni" && u < -0.8 {
						continue
					}
					x := nlRandom(r.n, 2, uint64(vi*100+len(pol)))
					x[d.j] = u
					if d.b >= 0 {
						x[d.j] += x[d.b]
					}
					r.checkJacobian(t, x, fmt.Sprintf("clamp %d %s gnd=%v u=%g", vi, pol, gnd, u))
				}
			}
		}
	}
}

func TestClampLimiting(t *testing.T) {
	// The classic logarithmic damping (NUMERICS.md): from rest (memory 0 V,
	// below the knee) a jump of the breakdown argument w = u − vbr to w_new
	// is cut to nbr·Vt·ln(w_new/(nbr·Vt)); the forward term likewise with
	// w = −u. The stamp is the linearisation at the limited point [calc].
	vbr, nbr := 6.8, 1.2
	e := nlElement("clamp", "D1", "a", "gnd", map[string]float64{"vbr": vbr, "nbr": nbr}, nil)
	d := nlMust(t, e).(*Clamp)
	r := newNLRig(t, d, 0, Ground)
	for _, u := range []float64{50, -5} {
		d.Reset()
		r.eval([]float64{u}, 0)
		if !r.c.Limited {
			t.Fatalf("step 0 → %g V not limited", u)
		}
		var ul float64
		if u > 0 {
			nv := nbr * vtRef
			ul = vbr + nv*math.Log((u-vbr)/nv)
		} else {
			ul = -vtRef * math.Log(-u/vtRef)
		}
		if math.Abs(d.uold-ul) > 1e-12 {
			t.Errorf("limited %g V to %.12g, want %.12g", u, d.uold, ul)
		}
		il := clampIRef(ul, vbr, 1e-3, nbr, 1e-14, 1, false)
		h := 1e-6
		g := (clampIRef(ul+h, vbr, 1e-3, nbr, 1e-14, 1, false) - clampIRef(ul-h, vbr, 1e-3, nbr, 1e-14, 1, false)) / (2 * h)
		want := il + g*(u-ul)
		if got := r.c.F[0]; !nlClose(got, want, 1e-6, 1e-15) {
			t.Errorf("stamp at %g V: F = %.10g, linearisation at the limited point %.10g", u, got, want)
		}
		if r.c.J[0] <= 0 || !nlClose(r.c.J[0], g, 1e-6, 0) {
			t.Errorf("stamp at %g V: G = %g, want %g", u, r.c.J[0], g)
		}
	}
	// Repeated evaluations at one point walk the memory there in a few
	// damped steps, then stop limiting.
	for _, u := range []float64{7.3, -0.85} {
		d.Reset()
		steps := 0
		for r.eval([]float64{u}, 0); r.c.Limited; r.eval([]float64{u}, 0) {
			if steps++; steps > 50 {
				t.Fatalf("limiting toward %g V never ends", u)
			}
		}
		if steps == 0 || d.uold != u {
			t.Errorf("toward %g V: %d limited steps, memory %g", u, steps, d.uold)
		}
	}
}

func TestClampNewtonAt10A(t *testing.T) {
	// 10 A forced into a clamp with rdyn: the static clamping voltage is
	// u + I·rdyn where i(u) = I (MODELS.md law; u found by bisection on the
	// formula in the test) [calc]. Newton from 0 V with limiting must find
	// it, with the last iteration unlimited.
	for _, pol := range []string{"uni", "bi"} {
		for _, curr := range []float64{10, -10} {
			vbr, rdyn := 6.8, 0.35
			e := nlElement("clamp", "D1", "a", "gnd", map[string]float64{"vbr": vbr, "rdyn": rdyn, "ls": 1e-9, "cj": 5e-12}, map[string]string{"polarity": pol})
			d := nlMust(t, e).(*Clamp)
			r := newNLRig(t, d, 0, Ground)
			r.c.Gmin = 1e-12
			r.extra = func(c *Context) { c.Inject(0, Ground, curr) }
			lo, hi := -20.0, 20.0
			for range 200 {
				mid := (lo + hi) / 2
				if clampIRef(mid, vbr, 1e-3, 1, 1e-14, 1, pol == "bi")+1e-12*mid < curr {
					lo = mid
				} else {
					hi = mid
				}
			}
			u := (lo + hi) / 2
			want := u + curr*rdyn
			x := make([]float64, r.n)
			iters, err := r.newton(x, 100)
			if err != nil {
				t.Fatalf("%s %g A: %v", pol, curr, err)
			}
			if !nlClose(x[0], want, 1e-9, 1e-12) {
				t.Errorf("%s %g A: v(a) = %.10g V, want %.10g V (%d iterations)", pol, curr, x[0], want, iters)
			}
			if !nlClose(x[d.br], curr, 1e-9, 0) {
				t.Errorf("%s %g A: ls current %g", pol, curr, x[d.br])
			}
		}
	}
}
