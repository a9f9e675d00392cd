package devices

import (
	"fmt"
	"math"
	"sort"
)

// IVTable is a current–voltage relation given by points, for the table
// paths of a clamp or a pin: i(v) through (v_k, i_k), monotone piecewise
// cubic Hermite interpolation between them and a straight line beyond
// them.
//
// Interpolation: the slopes d_k at the points are those of Fritsch and
// Butland's monotone scheme as SciPy's PchipInterpolator sets them
// [pub: F. N. Fritsch and J. Butland, SIAM J. Sci. Stat. Comput. 5 (1984);
// SciPy's documentation of PchipInterpolator]: with h_k = v_{k+1} − v_k
// and δ_k = (i_{k+1} − i_k)/h_k, an inner d_k is 0 where δ_{k−1} and δ_k
// differ in sign or either is 0, and otherwise the weighted harmonic mean
// (w1 + w2)/d_k = w1/δ_{k−1} + w2/δ_k, w1 = 2h_k + h_{k−1},
// w2 = h_k + 2h_{k−1}; an end slope is the three-point one-sided estimate
// ((2h_0 + h_1)·δ_0 − h_0·δ_1)/(h_0 + h_1), set to 0 when its sign differs
// from δ_0's and to 3·δ_0 when δ_0 and δ_1 differ in sign and it exceeds
// 3·|δ_0|. Two points make a straight line. Monotone data give a monotone
// curve through every point, without the overshoot of a plain spline.
//
// Extension: beyond the first and last points the current continues along
// the straight line with the end slope (the secant of the end interval
// where that slope is 0), so the curve and its slope are continuous there.
// Extrapolation is reported by the device that uses the table.
type IVTable struct {
	v, i, d []float64
	gLo     float64 // slope of the extension below v[0], S
	gHi     float64 // slope of the extension above v[n−1], S
}

// NewIVTable builds a table from voltages that rise strictly and currents
// that never fall (a passive path conducts more as its voltage rises). It
// copies its arguments.
func NewIVTable(v, i []float64) (*IVTable, error) {
	n := len(v)
	if n != len(i) {
		panic("devices: NewIVTable: voltages and currents differ in length")
	}
	if n < 2 {
		return nil, fmt.Errorf("an I–V table needs at least 2 points, got %d", n)
	}
	for k := range n {
		if math.IsNaN(v[k]) || math.IsInf(v[k], 0) || math.IsNaN(i[k]) || math.IsInf(i[k], 0) {
			return nil, fmt.Errorf("I–V table point %d (%g V, %g A) is not finite", k+1, v[k], i[k])
		}
		if k > 0 && v[k] <= v[k-1] {
			return nil, fmt.Errorf("I–V table point %d: voltage %g V does not rise above %g V", k+1, v[k], v[k-1])
		}
		if k > 0 && i[k] < i[k-1] {
			return nil, fmt.Errorf("I–V table point %d: current falls from %g A to %g A as the voltage rises from %g V to %g V: a table path must conduct more at a higher voltage", k+1, i[k-1], i[k], v[k-1], v[k])
		}
	}
	t := &IVTable{v: append([]float64(nil), v...), i: append([]float64(nil), i...)}
	t.d = pchipSlopes(t.v, t.i)
	t.gLo, t.gHi = t.d[0], t.d[n-1]
	if t.gLo == 0 {
		t.gLo = (t.i[1] - t.i[0]) / (t.v[1] - t.v[0])
	}
	if t.gHi == 0 {
		t.gHi = (t.i[n-1] - t.i[n-2]) / (t.v[n-1] - t.v[n-2])
	}
	return t, nil
}

// pchipSlopes returns the Fritsch–Butland slopes at the points.
func pchipSlopes(x, y []float64) []float64 {
	n := len(x)
	d := make([]float64, n)
	h := make([]float64, n-1)
	del := make([]float64, n-1)
	for k := range n - 1 {
		h[k] = x[k+1] - x[k]
		del[k] = (y[k+1] - y[k]) / h[k]
	}
	if n == 2 {
		d[0], d[1] = del[0], del[0]
		return d
	}
	for k := 1; k < n-1; k++ {
		if del[k-1]*del[k] <= 0 {
			continue
		}
		w1, w2 := 2*h[k]+h[k-1], h[k]+2*h[k-1]
		d[k] = (w1 + w2) / (w1/del[k-1] + w2/del[k])
	}
	d[0] = pchipEnd(h[0], h[1], del[0], del[1])
	d[n-1] = pchipEnd(h[n-2], h[n-3], del[n-2], del[n-3])
	return d
}

// pchipEnd is the shape-preserving one-sided slope at an end.
func pchipEnd(h0, h1, m0, m1 float64) float64 {
	d := ((2*h0+h1)*m0 - h0*m1) / (h0 + h1)
	switch {
	case sign(d) != sign(m0):
		return 0
	case sign(m0) != sign(m1) && math.Abs(d) > 3*math.Abs(m0):
		return 3 * m0
	}
	return d
}

func sign(x float64) float64 {
	switch {
	case x > 0:
		return 1
	case x < 0:
		return -1
	}
	return 0
}

// Range returns the voltages of the first and last points.
func (t *IVTable) Range() (lo, hi float64) { return t.v[0], t.v[len(t.v)-1] }

// Beyond returns how far v lies outside the table: v − hi above it, v − lo
// below it, 0 inside.
func (t *IVTable) Beyond(v float64) float64 {
	lo, hi := t.Range()
	switch {
	case v > hi:
		return v - hi
	case v < lo:
		return v - lo
	}
	return 0
}

// Eval returns i(v) and di/dv.
func (t *IVTable) Eval(v float64) (i, g float64) {
	n := len(t.v)
	if v <= t.v[0] {
		return t.i[0] + t.gLo*(v-t.v[0]), t.gLo
	}
	if v >= t.v[n-1] {
		return t.i[n-1] + t.gHi*(v-t.v[n-1]), t.gHi
	}
	k := sort.SearchFloat64s(t.v, v) - 1 // v[k] < v <= v[k+1]
	h := t.v[k+1] - t.v[k]
	s := (v - t.v[k]) / h
	s2, s3 := s*s, s*s*s
	h00, h10, h01, h11 := 2*s3-3*s2+1, s3-2*s2+s, -2*s3+3*s2, s3-s2
	i = h00*t.i[k] + h10*h*t.d[k] + h01*t.i[k+1] + h11*h*t.d[k+1]
	dh00, dh10, dh01, dh11 := 6*s2-6*s, 3*s2-4*s+1, -6*s2+6*s, 3*s2-2*s
	g = (dh00*t.i[k]+dh01*t.i[k+1])/h + dh10*t.d[k] + dh11*t.d[k+1]
	return i, g
}
