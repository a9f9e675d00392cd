package devices

import (
	"fmt"
	"math"
	"testing"
)

func TestDiodeCurrentMatchesContract(t *testing.T) {
	// MODELS.md diode law through the device's stamps, forward, reverse and
	// breakdown, against the formula written in the test (diodeIRef).
	for _, par := range []struct{ is, n, bv, ibv float64 }{
		{1e-14, 1, 0, 1e-3},
		{1e-14, 1, 5.1, 1e-3},
		{2e-9, 1.9, 12, 5e-3},
	} {
		num := map[string]float64{"is": par.is, "n": par.n, "it": par.ibv}
		if par.bv > 0 {
			num["vbr"] = par.bv
		}
		r := newNLRig(t, nlMust(t, nlElement("diode", "D1", "a", "gnd", num, nil)), 0, Ground)
		for v := -par.bv - 0.4; v <= 0.85; v += 0.01 {
			r.settle(t, []float64{v})
			want := diodeIRef(v, par.is, par.n, par.bv, par.ibv)
			if got := r.c.F[0]; !nlClose(got, want, 1e-9, 1e-20) {
				t.Errorf("%+v: i(%.3f) = %.12g, MODELS.md formula %.12g", par, v, got, want)
			}
		}
	}
	// Defaults (MODELS.md): is = 1e-14 A, n = 1, no breakdown: at 0.6 V
	// i = 1e-14·(e^(0.6/Vt) − 1) [calc].
	r := newNLRig(t, nlMust(t, nlElement("diode", "D1", "a", "gnd", nil, nil)), 0, Ground)
	r.settle(t, []float64{0.6})
	if want := 1e-14 * (math.Exp(0.6/vtRef) - 1); !nlClose(r.c.F[0], want, 1e-12, 0) {
		t.Errorf("default diode at 0.6 V: %g A, want %g A", r.c.F[0], want)
	}
}

func TestDiodeJacobian(t *testing.T) {
	for vi, num := range []map[string]float64{
		{},
		{"rs": 2, "cj": 5e-12},
		{"vbr": 5.1, "rs": 0.5},
		{"vbr": 12, "it": 5e-3, "is": 2e-9, "n": 1.9, "cj": 1e-12},
	} {
		d := nlMust(t, nlElement("diode", "D1", "a", "c", num, nil)).(*Diode)
		for _, c := range []int{1, Ground} {
			r := newNLRig(t, d, 0, c)
			r.c.Gmin = 1e-12
			for _, v := range []float64{0.72, 0.3, 0, -1, -5.0, -5.2, -5.35, -12.1} {
				x := nlRandom(r.n, 1, uint64(vi*31+2))
				x[d.j] = v
				if d.c >= 0 {
					x[d.j] += x[d.c]
				}
				r.checkJacobian(t, x, fmt.Sprintf("diode %d c=%d v=%g", vi, c, v))
			}
		}
	}
}

func TestDiodeLimitingAndNewton(t *testing.T) {
	// From rest, a forward jump to v is cut to n·Vt·ln(v/(n·Vt)); a jump into
	// breakdown past −bv is cut the same way in w = −v − bv (NUMERICS.md,
	// classic damping) [calc].
	bv, n := 5.1, 1.5
	d := nlMust(t, nlElement("diode", "D1", "a", "gnd", map[string]float64{"vbr": bv, "n": n, "rs": 0.5}, nil)).(*Diode)
	r := newNLRig(t, d, 0, Ground)
	nvt := n * vtRef
	for _, tc := range []struct{ v, want float64 }{
		{5, nvt * math.Log(5/nvt)},
		{-20, -(bv + nvt*math.Log((20-bv)/nvt))},
	} {
		d.Reset()
		x := make([]float64, r.n)
		x[d.j] = tc.v
		r.eval(x, 0)
		if !r.c.Limited || math.Abs(d.vold-tc.want) > 1e-12 {
			t.Errorf("jump to %g V: limited=%v to %.12g, want %.12g", tc.v, r.c.Limited, d.vold, tc.want)
		}
	}
	// Newton with limiting finds the point where a forced current I flows:
	// v(a) = v_j + I·rs with i(v_j) = I (bisection on the formula) [calc].
	for _, curr := range []float64{0.5, -0.02} {
		r.extra = func(c *Context) { c.Inject(0, Ground, curr) }
		d.Reset()
		lo, hi := -10.0, 2.0
		for range 200 {
			mid := (lo + hi) / 2
			if diodeIRef(mid, 1e-14, n, bv, 1e-3) < curr {
				lo = mid
			} else {
				hi = mid
			}
		}
		want := (lo+hi)/2 + curr*0.5
		x := make([]float64, r.n)
		if _, err := r.newton(x, 100); err != nil {
			t.Fatalf("%g A: %v", curr, err)
		}
		if !nlClose(x[0], want, 1e-9, 1e-12) {
			t.Errorf("%g A: v(a) = %.10g, want %.10g", curr, x[0], want)
		}
	}
}
