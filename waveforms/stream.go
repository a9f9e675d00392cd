package waveforms

import "math"

// Tracker measures a waveform point by point without keeping it: extremes
// and their times, the largest magnitude, the time spent above and below two
// thresholds. Its results equal those of Peak, Min, AbsPeak, WidthAbove
// and WidthBelow (reference_test.go) on the same samples, bit for bit,
// unless Refine is set. The zero Tracker is ready to use with both
// thresholds at zero. Add does not allocate, so a sweep can keep one
// Tracker per watched node.
type Tracker struct {
	// Above is the threshold of WidthAbove. Zero: time spent above 0.
	// Set it before the first Add.
	Above float64
	// Below is the threshold of WidthBelow. Zero: time spent below 0.
	// Set it before the first Add.
	Below float64
	// Refine interpolates the extremes (Max, Min, AbsPeak) between the
	// samples: where the samples have a local highest or lowest value, the
	// cubic through the four samples around it (the parabola through three
	// where fewer lie since the last corner) gives the extreme and its
	// time. A peak of a waveform sampled every h falls between samples and
	// reads low by up to 1 − cos(ω·h/2) of a ringing at ω (0.5 % at 25
	// samples a period); the cubic leaves about (ω·h)⁴/100 of it. Mark
	// every sample where the waveform may change slope or jump with
	// Corner: an interpolation across a corner would overshoot it. Set
	// Refine before the first Add. Zero: the extremes are the samples'.
	Refine bool

	n              int
	t, y           float64
	max, tmax      float64
	min, tmin      float64
	abs, tabs      float64
	wAbove, wBelow float64

	// The samples of the current smooth stretch, up to the last four,
	// oldest first, and how many there are (for Refine).
	wt, wy [4]float64
	seg    int
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
		if r.Refine && t == r.t {
			// A jump ends a smooth stretch as a corner does.
			r.seg = 0
		}
	}
	r.n++
	r.t, r.y = t, y
	if r.Refine {
		r.push(t, y)
	}
}

// Corner marks the last sample as a corner of the waveform, a point where
// its slope may change or where it may jump (a breakpoint of the stimulus):
// no extreme is interpolated across it. The sample itself still counts as
// it is.
func (r *Tracker) Corner() { r.seg = 0 }

// push adds a sample to the smooth stretch and refines the extreme the
// samples show at the one before it.
func (r *Tracker) push(t, y float64) {
	if r.seg == len(r.wt) {
		// Three moves written out: a copy of three numbers costs a call of
		// the runtime's memmove, at every sample of every tracked waveform.
		r.wt[0], r.wt[1], r.wt[2] = r.wt[1], r.wt[2], r.wt[3]
		r.wy[0], r.wy[1], r.wy[2] = r.wy[1], r.wy[2], r.wy[3]
		r.seg--
	}
	r.wt[r.seg], r.wy[r.seg] = t, y
	r.seg++
	if r.seg < 3 {
		return
	}
	m := r.seg
	yl, yc, yr := r.wy[m-3], r.wy[m-2], r.wy[m-1]
	switch {
	case yc >= yl && yc >= yr && (yc > yl || yc > yr):
		// The interpolated peak can pass the samples by no more than the
		// drop to the lower neighbour (see refine): only then can it beat
		// the largest value so far.
		if 2*yc-math.Min(yl, yr) > r.max {
			if v, at, ok := r.refine(1); ok && v > r.max {
				r.max, r.tmax = v, at
				if v > r.abs {
					r.abs, r.tabs = v, at
				}
			}
		}
	case yc <= yl && yc <= yr && (yc < yl || yc < yr):
		if 2*yc-math.Max(yl, yr) < r.min {
			if v, at, ok := r.refine(-1); ok && v < r.min {
				r.min, r.tmin = v, at
				if -v > r.abs {
					r.abs, r.tabs = -v, at
				}
			}
		}
	}
}

// refine is the extreme of sign·y (the largest for +1, the smallest for −1)
// of the polynomial through the samples of the stretch, between the
// neighbours of the next-to-last sample. It refuses (ok = false) an extreme
// that passes that sample by more than the drop to its lower neighbour: a
// smooth peak sampled at any rate passes by far less (an eighth of that
// drop at most for a sinusoid), so such a result means samples that are
// not smooth enough to interpolate.
func (r *Tracker) refine(sign float64) (v, at float64, ok bool) {
	m := r.seg
	tc, yc := r.wt[m-2], sign*r.wy[m-2]
	lo, hi := r.wt[m-3], r.wt[m-1]
	span := hi - lo
	if !(span > 0) {
		return 0, 0, false
	}
	// Newton's divided differences in s = (t − tc)/span, then the
	// coefficients of p(s) = a + b·s + c·s² + d·s³.
	var s, y [4]float64
	for k := 0; k < m; k++ {
		s[k] = (r.wt[k] - tc) / span
		y[k] = sign * r.wy[k]
	}
	d1 := [3]float64{}
	for k := 0; k+1 < m; k++ {
		d1[k] = (y[k+1] - y[k]) / (s[k+1] - s[k])
	}
	d2 := (d1[1] - d1[0]) / (s[2] - s[0])
	a, b, c, d := y[0]-d1[0]*s[0]+d2*s[0]*s[1], d1[0]-d2*(s[0]+s[1]), d2, 0.0
	if m == 4 {
		d2b := (d1[2] - d1[1]) / (s[3] - s[1])
		d3 := (d2b - d2) / (s[3] - s[0])
		// + d3·(s − s0)(s − s1)(s − s2)
		e1 := s[0] + s[1] + s[2]
		e2 := s[0]*s[1] + s[0]*s[2] + s[1]*s[2]
		e3 := s[0] * s[1] * s[2]
		a -= d3 * e3
		b += d3 * e2
		c -= d3 * e1
		d = d3
	}
	p := func(x float64) float64 { return a + x*(b+x*(c+x*d)) }
	sl, sr := s[m-3], s[m-1]
	best, bs := yc, 0.0
	try := func(x float64) {
		if x > sl && x < sr {
			if v := p(x); v > best {
				best, bs = v, x
			}
		}
	}
	// Stationary points: roots of b + 2c·s + 3d·s².
	if d == 0 {
		if c != 0 {
			try(-b / (2 * c))
		}
	} else {
		A, B, C := 3*d, 2*c, b
		if disc := B*B - 4*A*C; disc >= 0 {
			q := -0.5 * (B + math.Copysign(math.Sqrt(disc), B))
			if q != 0 {
				try(q / A)
				try(C / q)
			}
		}
	}
	if best == yc {
		return 0, 0, false
	}
	if best-yc > yc-math.Min(sign*r.wy[m-3], sign*r.wy[m-1]) {
		return 0, 0, false
	}
	return sign * best, tc + bs*span, true
}

// Reset forgets every sample, keeping the thresholds and Refine.
func (r *Tracker) Reset() { *r = Tracker{Above: r.Above, Below: r.Below, Refine: r.Refine} }

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
