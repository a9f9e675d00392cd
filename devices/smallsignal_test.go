package devices

import (
	"math"
	"math/cmplx"
	"testing"
)

// [pub: transmission-line theory, e.g. Pozar, Microwave Engineering, the
// admittance matrix of a lossless line section] With the branch current
// eliminated, the line's small-signal stamp is the two-port
// Y11 = Y22 = −j·cot(ωT)/z0, Y12 = Y21 = j/(z0·sin ωT), and at ω = 0 it is
// the wire of the operating point.
func TestLineStampACIsTheTwoPort(t *testing.T) {
	const z0, delay = 75.0, 1.3e-9
	d := nlMust(t, nlElement("line", "TL1", "in", "out", map[string]float64{"z0": z0, "delay": delay}, nil)).(*Line)
	d.Bind(Nodes{Terminals: []int{0, 1}, Branches: []int{2}})
	c := ACContext{Y: make([]complex128, 9), N: 3}
	for _, f := range []float64{1e5, 0.1e9, 0.3e9, 0.77e9, 2e9} {
		w := 2 * math.Pi * f
		clear(c.Y)
		c.Omega = w
		d.StampAC(&c)
		// Schur complement on the branch unknown: Y = A − B·D⁻¹·C.
		y := func(i, j int) complex128 { return c.Y[i*3+j] - c.Y[i*3+2]*c.Y[2*3+j]/c.Y[2*3+2] }
		th := w * delay
		y11 := complex(0, -1/(z0*math.Tan(th)))
		y12 := complex(0, 1/(z0*math.Sin(th)))
		for _, tc := range []struct {
			i, j int
			want complex128
		}{{0, 0, y11}, {1, 1, y11}, {0, 1, y12}, {1, 0, y12}} {
			if got := y(tc.i, tc.j); cmplx.Abs(got-tc.want) > 1e-12*cmplx.Abs(tc.want) {
				t.Errorf("f %g: Y%d%d = %v, want %v", f, tc.i+1, tc.j+1, got, tc.want)
			}
		}
	}
	// ω = 0: v1 = v2 and the out port carries −i1 (the wire of Eval at DC).
	clear(c.Y)
	c.Omega = 0
	d.StampAC(&c)
	want := []complex128{0, 0, 1, -1 / z0, 1 / z0, -1, -2, 2, 0}
	for k, w := range want {
		if cmplx.Abs(c.Y[k]-w) > 1e-15 {
			t.Errorf("ω = 0: entry %d is %v, want %v", k, c.Y[k], w)
		}
	}
	if n := testing.AllocsPerRun(100, func() { c.Omega = 1e9; d.StampAC(&c) }); n != 0 {
		t.Errorf("StampAC allocates %g times", n)
	}
}
