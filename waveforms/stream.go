package waveforms

import "math"

// Tracker measures a waveform point by point without keeping it: extremes
// and their times, the largest magnitude, the time spent above and below two
// thresholds. Its results equal those of Peak, Min, AbsPeak, WidthAbove
// and WidthBelow (reference_test.go) on the same samples, bit for
// bit. The zero Tracker is ready to use with both thresholds at zero. Add
// does not allocate, so a sweep can keep one Tracker per watched node.
type Tracker struct {
	// Above is the threshold of WidthAbove. Zero: time spent above 0.
	// Set it before the first Add.
	Above float64
	// Below is the threshold of WidthBelow. Zero: time spent below 0.
	// Set it before the first Add.
	Below float64

	n              int
	t, y           float64
	max, tmax      float64
	min, tmin      float64
	abs, tabs      float64
	wAbove, wBelow float64
}

// Add feeds the next sample. Times must not decrease (an equal time is a
// jump); a decreasing time is a programmer error and panics.
func (r *Tracker) Add(t, y float64) {
	if r.n == 0 {
		r.max, r.tmax = y, t
		r.min, r.tmin = y, t
		r.abs, r.tabs = math.Abs(y), t
	} else {
		h := t - r.t
		if h < 0 {
			panic("waveforms: Tracker.Add with a decreasing time")
		}
		if y > r.max {
			r.max, r.tmax = y, t
		}
		if y < r.min {
			r.min, r.tmin = y, t
		}
		if a := math.Abs(y); a > r.abs {
			r.abs, r.tabs = a, t
		}
		r.wAbove += timeAbove(h, r.y, y, r.Above)
		r.wBelow += timeAbove(h, -r.y, -y, -r.Below)
	}
	r.n++
	r.t, r.y = t, y
}

// Reset forgets every sample, keeping the thresholds.
func (r *Tracker) Reset() { *r = Tracker{Above: r.Above, Below: r.Below} }

// Max returns the largest value and the time of its first occurrence (NaN
// before any sample).
func (r *Tracker) Max() (v, at float64) {
	if r.n == 0 {
		return math.NaN(), math.NaN()
	}
	return r.max, r.tmax
}

// Min returns the smallest value and the time of its first occurrence.
func (r *Tracker) Min() (v, at float64) {
	if r.n == 0 {
		return math.NaN(), math.NaN()
	}
	return r.min, r.tmin
}

// AbsPeak returns the largest magnitude and the time of its first occurrence.
func (r *Tracker) AbsPeak() (v, at float64) {
	if r.n == 0 {
		return math.NaN(), math.NaN()
	}
	return r.abs, r.tabs
}

// WidthAbove returns the time spent above the Above threshold so far.
func (r *Tracker) WidthAbove() float64 { return r.wAbove }

// WidthBelow returns the time spent below the Below threshold so far.
func (r *Tracker) WidthBelow() float64 { return r.wBelow }
