package waveforms

import "math"

// Straightforward measurements of sampled waveforms that the streaming
// Tracker and the engine's ledger are checked against (the definitions of
// measure.go, applied to a whole waveform at once).

// Min returns the smallest value and the time of its first occurrence.
func Min(t, y []float64) (v, at float64) {
	mustSameLength(t, y)
	if len(y) == 0 {
		return math.NaN(), math.NaN()
	}
	v, at = y[0], t[0]
	for k := 1; k < len(y); k++ {
		if y[k] < v {
			v, at = y[k], t[k]
		}
	}
	return v, at
}

// AbsPeak returns the largest magnitude |y| and the time of its first
// occurrence; the magnitude, not the signed value, so that both polarities
// compare alike.
func AbsPeak(t, y []float64) (v, at float64) {
	mustSameLength(t, y)
	if len(y) == 0 {
		return math.NaN(), math.NaN()
	}
	v, at = math.Abs(y[0]), t[0]
	for k := 1; k < len(y); k++ {
		if a := math.Abs(y[k]); a > v {
			v, at = a, t[k]
		}
	}
	return v, at
}

// ValueAt returns the interpolated value at time at; before the first sample
// it is the first value, after the last the last value. At a jump (two
// samples at the same time) it is the value before the jump.
func ValueAt(t, y []float64, at float64) float64 {
	mustSameLength(t, y)
	n := len(t)
	if n == 0 {
		return math.NaN()
	}
	if at <= t[0] {
		return y[0]
	}
	if at >= t[n-1] {
		return y[n-1]
	}
	// Smallest k with t[k] >= at; t[0] < at so k >= 1.
	lo, hi := 0, n-1
	for hi-lo > 1 {
		mid := (lo + hi) / 2
		if t[mid] >= at {
			hi = mid
		} else {
			lo = mid
		}
	}
	k := hi
	if t[k] == at {
		return y[k]
	}
	return lerp(t[k-1], y[k-1], t[k], y[k], at)
}

// Rise returns the rise time between the fractions lo and hi of the peak
// (0.1 and 0.9 for the usual 10–90 %): the first crossings of lo·peak and
// hi·peak on the way to the (first) peak. ok is false when the peak is not
// positive or the waveform starts above lo·peak.
func Rise(t, y []float64, lo, hi float64) (rise float64, ok bool) {
	mustSameLength(t, y)
	pv, _ := Peak(t, y)
	if !(pv > 0) || !(lo < hi) {
		return math.NaN(), false
	}
	p := 0
	for k := range y {
		if y[k] == pv {
			p = k
			break
		}
	}
	if y[0] > lo*pv {
		return math.NaN(), false
	}
	tl, ok1 := FirstCrossing(t[:p+1], y[:p+1], lo*pv)
	th, ok2 := FirstCrossing(t[:p+1], y[:p+1], hi*pv)
	if !ok1 || !ok2 {
		return math.NaN(), false
	}
	return th - tl, true
}

// WidthBelow returns the total time the waveform spends below level.
func WidthBelow(t, y []float64, level float64) float64 {
	mustSameLength(t, y)
	w := 0.0
	for k := 1; k < len(y); k++ {
		w += timeAbove(t[k]-t[k-1], -y[k-1], -y[k], -level)
	}
	return w
}

// productIntegral is the exact ∫ v·i dt over one interval of length h on
// which both v and i are linear: h·(2v0i0 + v0i1 + v1i0 + 2v1i1)/6.
func productIntegral(h, v0, i0, v1, i1 float64) float64 {
	return h * (2*v0*i0 + v0*i1 + v1*i0 + 2*v1*i1) / 6
}

// Energy returns ∫ v·i dt for piecewise-linear v and i on the same times.
func Energy(t, v, i []float64) float64 {
	mustSameLength(t, v)
	mustSameLength(t, i)
	s := 0.0
	for k := 1; k < len(t); k++ {
		s += productIntegral(t[k]-t[k-1], v[k-1], i[k-1], v[k], i[k])
	}
	return s
}
