package waveforms

import (
	"math"
	"sort"
)

// DefaultLoad asks Checks and Sample for the load the standard prescribes
// for the waveform (see PrescribedLoad). Any negative load means the same.
const DefaultLoad = -1.0

// PrescribedLoad returns the resistive load, in ohms, into which the
// waveform's published values are stated (Waveform.Load; +Inf is an open
// circuit, 0 a short and an unknown waveform's).
func PrescribedLoad(name string) float64 {
	if w := Lookup(name); w != nil {
		return w.Load
	}
	return 0
}

func (s *Stimulus) load(load float64) float64 {
	if load < 0 || math.IsNaN(load) {
		return PrescribedLoad(s.Name)
	}
	return load
}

// Into returns the current into a resistive load (ohms; +Inf is an open
// circuit, a negative load the prescribed one) and the voltage across it at
// time t, computed in closed form: Current forms ignore the load (the
// voltage is then i·load, NaN for an open circuit), a Thevenin source
// divides, a Network discharges through its R (and L) plus the load.
func (s *Stimulus) Into(load float64, t float64) (i, v float64) {
	load = s.load(load)
	open := math.IsInf(load, 1)
	switch s.Form {
	case Current:
		i = s.F(t)
		if open {
			return i, math.NaN()
		}
		return i, i * load
	case Thevenin:
		e := s.F(t)
		if open {
			return 0, e
		}
		i = e / (s.R + load)
		return i, i * load
	case Network:
		if t < 0 {
			return 0, 0
		}
		if open {
			return 0, s.V0
		}
		i = networkCurrent(t, s.V0, s.C, s.R+load, s.L)
		return i, i * load
	}
	return math.NaN(), math.NaN()
}

// Sample returns the stimulus into load (as for Into) on [0, s.Stop] as
// piecewise-linear samples accurate to tol relative to each channel's
// largest magnitude (tol <= 0: 1e-4): every breakpoint is a sample, each
// interval between breakpoints starts with a grid that is geometric towards
// its first breakpoint (where pulses start) and uniform elsewhere, and an
// interval is halved while its midpoint departs from the chord by more than
// tol. v is nil for Current forms.
func Sample(s *Stimulus, load, tol float64) (t, i, v []float64) {
	return sampleSpan(s, load, tol, s.Stop)
}

func sampleSpan(s *Stimulus, load, tol, stop float64) (t, i, v []float64) {
	if tol <= 0 {
		tol = 1e-4
	}
	knots := []float64{0}
	for _, b := range s.Breakpoints {
		if b > 0 && b < stop {
			knots = append(knots, b)
		}
	}
	knots = append(knots, stop)
	sort.Float64s(knots)

	// First pass: the initial grid, to learn each channel's scale.
	var grid []float64
	for k := 1; k < len(knots); k++ {
		a, b := knots[k-1], knots[k]
		if b <= a {
			continue
		}
		seg := []float64{a}
		for j := 40; j >= 1; j-- {
			seg = append(seg, a+(b-a)*math.Ldexp(1, -j))
		}
		for j := 1; j < 32; j++ {
			seg = append(seg, a+(b-a)*float64(j)/32)
		}
		sort.Float64s(seg)
		for j, x := range seg {
			if j == 0 || x > seg[j-1] {
				grid = append(grid, x)
			}
		}
	}
	grid = append(grid, stop)
	si, sv := 0.0, 0.0
	for _, x := range grid {
		a, b := s.Into(load, x)
		si = math.Max(si, math.Abs(a))
		if !math.IsNaN(b) {
			sv = math.Max(sv, math.Abs(b))
		}
	}
	ti, tv := tol*si, tol*sv
	withV := s.Form != Current
	var refine func(a, ia, va, b, ib, vb float64, depth int)
	refine = func(a, ia, va, b, ib, vb float64, depth int) {
		m := a + (b-a)/2
		if depth < 48 && m > a && m < b {
			im, vm := s.Into(load, m)
			ei := math.Abs(im - (ia+ib)/2)
			ev := 0.0
			if withV {
				ev = math.Abs(vm - (va+vb)/2)
			}
			if ei > ti || ev > tv {
				refine(a, ia, va, m, im, vm, depth+1)
				refine(m, im, vm, b, ib, vb, depth+1)
				return
			}
		}
		t = append(t, b)
		i = append(i, ib)
		v = append(v, vb)
	}
	ia, va := s.Into(load, grid[0])
	t, i, v = append(t, grid[0]), append(i, ia), append(v, va)
	for k := 1; k < len(grid); k++ {
		ib, vb := s.Into(load, grid[k])
		refine(grid[k-1], ia, va, grid[k], ib, vb, 0)
		ia, va = ib, vb
	}
	if !withV {
		v = nil
	}
	return t, i, v
}
