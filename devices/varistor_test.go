package devices

import (
	"fmt"
	"math"
	"testing"
)

// varistorIRef is the varistor law of MODELS.md written straight from the
// formula: i(u) = sign(u)·i1·(|u|/v1)^alpha.
func varistorIRef(u, v1, i1, alpha float64) float64 {
	return math.Copysign(i1*math.Pow(math.Abs(u)/v1, alpha), u)
}

// The current through the stamps is MODELS.md's law, both polarities
// alike, and i(v1) = i1 [MODELS.md: v1 is the voltage at i1].
func TestVaristorCurrentMatchesContract(t *testing.T) {
	for _, p := range []struct{ v1, i1, alpha float64 }{{27, 1e-3, 30}, {470, 1e-3, 40}, {6.8, 1e-4, 12}, {10, 1e-3, 1}} {
		d := nlMust(t, nlElement("varistor", "RV1", "a", "gnd", map[string]float64{"v1": p.v1, "i1": p.i1, "alpha": p.alpha}, nil))
		r := newNLRig(t, d, 0, Ground)
		for _, f := range []float64{-1.2, -1, -0.5, -1e-3, 0, 1e-3, 0.3, 0.9, 1, 1.1, 1.25} {
			u := f * p.v1
			r.settle(t, []float64{u})
			r.eval([]float64{u}, 0)
			if got, want := r.c.F[0], varistorIRef(u, p.v1, p.i1, p.alpha); !nlClose(got, want, 1e-12, 1e-30) {
				t.Errorf("%+v: i(%g V) = %.15g A, MODELS.md gives %.15g A", p, u, got, want)
			}
		}
	}
}

// The stamped Jacobian and charge derivative agree with central differences
// [the definition of the derivative], with and without rs and c.
func TestVaristorJacobian(t *testing.T) {
	for vi, num := range []map[string]float64{
		{"v1": 27},
		{"v1": 27, "rs": 0.5, "c": 1e-9, "alpha": 25},
		{"v1": 5.6, "alpha": 1},
	} {
		for _, gnd := range []bool{false, true} {
			d := nlMust(t, nlElement("varistor", "RV1", "a", "b", num, nil)).(*Varistor)
			b := 1
			if gnd {
				b = Ground
			}
			r := newNLRig(t, d, 0, b)
			for _, f := range []float64{-1.1, -0.7, 0.01, 0.5, 0.98, 1.05} {
				x := nlRandom(r.n, 2, uint64(vi*10+1))
				x[d.j] = f * num["v1"]
				if d.b >= 0 {
					x[d.j] += x[d.b]
				}
				r.checkJacobian(t, x, fmt.Sprintf("varistor %d gnd=%v u=%g·v1", vi, gnd, f))
			}
		}
	}
}

// A varistor across a 1 kV source behind 10 Ω: Newton from 0 V converges
// (the limiting holds the power law in check) onto the root of
// (V − u)/R = i(u), found here by bisection on the scalar equation [calc].
func TestVaristorNewtonFromFar(t *testing.T) {
	const vs, rsrc = 1000.0, 10.0
	for _, p := range []struct{ v1, alpha float64 }{{27, 30}, {390, 45}, {100, 20}} {
		d := nlMust(t, nlElement("varistor", "RV1", "a", "gnd", map[string]float64{"v1": p.v1, "alpha": p.alpha}, nil))
		r := newNLRig(t, d, 0, Ground)
		r.extra = func(c *Context) { c.Current(0, Ground, (c.V(0)-vs)/rsrc, 1/rsrc) }
		x := []float64{0}
		it, err := r.newton(x, 100)
		if err != nil {
			t.Fatalf("%+v: %v", p, err)
		}
		lo, hi := 0.0, vs
		for range 200 {
			m := (lo + hi) / 2
			if varistorIRef(m, p.v1, 1e-3, p.alpha) > (vs-m)/rsrc {
				hi = m
			} else {
				lo = m
			}
		}
		if want := (lo + hi) / 2; math.Abs(x[0]-want) > 1e-9*want {
			t.Errorf("%+v: %.12g V after %d iterations, the root is %.12g V", p, x[0], it, want)
		}
	}
}

// The model's Eval allocates nothing (STYLE.md: no allocation in the hot
// loop), and an alpha below 1 is refused by the model.
func TestVaristorNoAllocAndBadAlpha(t *testing.T) {
	d := nlMust(t, nlElement("varistor", "RV1", "a", "b", map[string]float64{"v1": 27, "rs": 0.1, "c": 1e-9}, nil))
	r := newNLRig(t, d, 0, 1)
	x := []float64{30, 1, 29}
	r.c.Alpha = 1e9
	if n := testing.AllocsPerRun(100, func() { r.residual(x) }); n != 0 {
		t.Errorf("Eval allocates %g times", n)
	}
	if _, err := build(nlElement("varistor", "RV1", "a", "b", map[string]float64{"v1": 27, "alpha": 0.5}, nil)); err == nil {
		t.Error("alpha 0.5 accepted")
	}
}
