package waveforms

import "math"

// The measurements below treat samples (t[k], y[k]) as the piecewise-linear
// function through them, and are exact for it: crossings are interpolated,
// integrals are trapezoids (exact for linear pieces), and the energy of two
// piecewise-linear waveforms integrates the product of two linear functions
// exactly on each interval. Times must be ascending (equal neighbours are
// allowed and mean a jump). Slices of different lengths are a programmer
// error and panic; empty slices give NaN (or ok = false).
//
// The streaming Tracker gives bit-identical results on the same samples
// without keeping them: both use the helpers below and add the same terms in
// the same order.

func mustSameLength(t, y []float64) {
	if len(t) != len(y) {
		panic("waveforms: time and value slices differ in length")
	}
}

// Peak returns the largest value and the time of its first occurrence.
func Peak(t, y []float64) (v, at float64) {
	mustSameLength(t, y)
	if len(y) == 0 {
		return math.NaN(), math.NaN()
	}
	v, at = y[0], t[0]
	for k := 1; k < len(y); k++ {
		if y[k] > v {
			v, at = y[k], t[k]
		}
	}
	return v, at
}

func lerp(t0, y0, t1, y1, at float64) float64 {
	return y0 + (y1-y0)*(at-t0)/(t1-t0)
}

// crossing returns where the segment from (t0, y0) to (t1, y1) meets level,
// given that it does.
func crossing(t0, y0, t1, y1, level float64) float64 {
	if y1 == y0 {
		return t0
	}
	return t0 + (t1-t0)*(level-y0)/(y1-y0)
}

// FirstCrossing returns the first instant the waveform reaches level, from
// either side: t[0] when it starts at the level, otherwise the interpolated
// point of the first interval whose end touches or passes it.
func FirstCrossing(t, y []float64, level float64) (at float64, ok bool) {
	mustSameLength(t, y)
	if len(y) == 0 {
		return math.NaN(), false
	}
	if y[0] == level {
		return t[0], true
	}
	below := y[0] < level
	for k := 1; k < len(y); k++ {
		if (below && y[k] >= level) || (!below && y[k] <= level) {
			return crossing(t[k-1], y[k-1], t[k], y[k], level), true
		}
	}
	return math.NaN(), false
}

// timeAbove is how long the linear piece from y0 to y1 over a duration h
// spends strictly above level.
func timeAbove(h, y0, y1, level float64) float64 {
	a0, a1 := y0 > level, y1 > level
	switch {
	case a0 && a1:
		return h
	case !a0 && !a1:
		return 0
	case a0:
		return h * (y0 - level) / (y0 - y1)
	default:
		return h * (y1 - level) / (y1 - y0)
	}
}

// WidthAbove returns the total time the waveform spends above level.
func WidthAbove(t, y []float64, level float64) float64 {
	mustSameLength(t, y)
	w := 0.0
	for k := 1; k < len(y); k++ {
		w += timeAbove(t[k]-t[k-1], y[k-1], y[k], level)
	}
	return w
}

// trapezoid is the exact integral of one linear piece.
func trapezoid(h, y0, y1 float64) float64 { return h * (y0 + y1) / 2 }

// Integral returns ∫ y dt over the samples (a charge, for a current).
func Integral(t, y []float64) float64 {
	mustSameLength(t, y)
	s := 0.0
	for k := 1; k < len(y); k++ {
		s += trapezoid(t[k]-t[k-1], y[k-1], y[k])
	}
	return s
}
