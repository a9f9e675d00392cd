package fit

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"sort"
)

// BeadParams are a ferrite bead's model parameters (MODELS.md), SI units.
// Isat 0 means no saturation.
type BeadParams struct {
	Rdc, L, C, Rac, Isat float64
}

// BeadZ is the bead's small-signal impedance at frequency f with a DC bias
// current idc through it:
//
//	Z = rdc + 1/(1/rac + 1/(j·2πf·l(idc)) + j·2πf·c),
//	l(idc) = l/(1 + (idc/isat)²)
//
// (MODELS.md: the flux λ(i) = l·isat·atan(i/isat) has the incremental
// inductance dλ/di = l/(1 + (i/isat)²) at the bias).
func BeadZ(p BeadParams, f, idc float64) complex128 {
	w := 2 * math.Pi * f
	l := p.L
	if p.Isat > 0 {
		x := idc / p.Isat
		l /= 1 + x*x
	}
	y := 1/complex(0, w*l) + complex(0, w*p.C)
	if p.Rac > 0 {
		y += complex(1/p.Rac, 0)
	}
	return complex(p.Rdc, 0) + 1/y
}

// SRF is the self-resonant frequency 1/(2π·√(l·c)) at zero bias, where
// the parallel l and c cancel and |Z| = rdc + rac.
func (p BeadParams) SRF() float64 { return 1 / (2 * math.Pi * math.Sqrt(p.L*p.C)) }

// BeadCurve is a measured impedance curve at one DC bias.
type BeadCurve struct {
	Bias    float64      // A
	F       []float64    // Hz, rising
	Z       []complex128 // Ω
	Complex bool         // false: only |Z| is meaningful
	Where   []string     // optional: each point's file:line:col, for messages
}

// BeadOptions tune FitBead. The zero value fits rdc, l, c and rac (and isat
// when the curves have different biases).
type BeadOptions struct {
	// Rdc, when > 0, holds the DC resistance at this value (a datasheet's
	// DC resistance) instead of fitting it.
	Rdc float64
}

// BeadPoint is one data point with the fitted model beside it.
type BeadPoint struct {
	F, Bias  float64
	Measured complex128
	Fitted   complex128
	Complex  bool
	// Residual is |Z_fit − Z_data|/|Z_data| (complex data) or
	// (|Z_fit| − |Z_data|)/|Z_data| (magnitudes).
	Residual float64
	Where    string
}

// BeadFit is the result of FitBead.
type BeadFit struct {
	Params BeadParams
	Sigma  map[string]float64 // relative standard error of each fitted parameter
	Fitted []string           // the parameters that were fitted, in order
	Points []BeadPoint
	SRF    float64    // Hz, of the fitted model at zero bias
	Z100M  complex128 // the fitted model at 100 MHz, zero bias
	// BandLo and BandHi bound the widest run of consecutive points of the
	// lowest-bias curve whose residual is within 10 %, Hz (0 when none).
	BandLo, BandHi float64
	Result         *Result
	Notes          []string
}

// FitBead fits a bead's rdc, l, c, rac (and isat, from curves at several
// DC biases) to impedance curves; see the package doc for the residuals.
func FitBead(curves []BeadCurve, opt *BeadOptions) (*BeadFit, error) {
	if opt == nil {
		opt = &BeadOptions{}
	}
	pts, cplx := beadPoints(curves)
	biases := map[float64]bool{}
	for _, c := range curves {
		biases[c.Bias] = true
	}
	sort.SliceStable(curves, func(i, j int) bool { return curves[i].Bias < curves[j].Bias })
	if len(pts) == 0 {
		return nil, errors.New("no impedance points to fit")
	}
	base := curves[0]
	p0, err := beadStart(base, opt.Rdc)
	if err != nil {
		return nil, err
	}
	var ps paramSet
	ps.add("rdc", p0.Rdc, !(opt.Rdc > 0))
	ps.add("l", p0.L, true)
	ps.add("c", p0.C, true)
	ps.add("rac", p0.Rac, true)
	withSat := len(biases) > 1
	if withSat {
		ps.add("isat", beadStartIsat(curves, p0), true)
	}
	m := 0
	for _, p := range pts {
		if p.Complex {
			m += 2
		} else {
			m++
		}
	}
	if m <= len(ps.free) {
		return nil, fmt.Errorf("%d impedance values for %d parameters: give more frequencies", m, len(ps.free))
	}
	prob := Problem{M: m, Residuals: func(dst, x []float64) {
		ps.set(x)
		beadResiduals(dst, ps.bead(withSat), pts)
	}}
	res, err := Minimize(prob, ps.x(), nil)
	if err != nil {
		return nil, err
	}
	ps.set(res.X)
	f := &BeadFit{Params: ps.bead(withSat), Result: res, Sigma: sigmaByName(res, ps.names()), Fitted: ps.names()}
	f.compare(pts)
	f.SRF = f.Params.SRF()
	f.Z100M = BeadZ(f.Params, 100e6, 0)
	f.band(base.Bias)
	if !cplx {
		f.Notes = append(f.Notes, "the data give |Z| only: the split of the impedance between resistance (rdc, rac) and reactance (l, c) rests on the model's shape, not on the data; a Touchstone file or a phase column settles it")
	}
	if lo, hi := base.F[0], base.F[len(base.F)-1]; f.SRF < lo || f.SRF > hi {
		f.Notes = append(f.Notes, fmt.Sprintf("the fitted self-resonance (%.4g Hz) lies outside the data (%.4g–%.4g Hz): c and rac are extrapolated", f.SRF, lo, hi))
	}
	return f, nil
}

// beadPoints lists the curves' points in order, and says whether every
// curve is complex.
func beadPoints(curves []BeadCurve) ([]BeadPoint, bool) {
	var pts []BeadPoint
	cplx := true
	for _, c := range curves {
		if len(c.F) != len(c.Z) {
			panic("fit: a bead curve's frequencies and impedances differ in length")
		}
		for k := range c.F {
			w := ""
			if k < len(c.Where) {
				w = c.Where[k]
			}
			pts = append(pts, BeadPoint{F: c.F[k], Bias: c.Bias, Measured: c.Z[k], Complex: c.Complex, Where: w})
		}
		cplx = cplx && c.Complex
	}
	return pts, cplx
}

// bead returns the bead the parameters describe; isat is 0 (no
// saturation) unless withSat.
func (s *paramSet) bead(withSat bool) BeadParams {
	bp := BeadParams{Rdc: s.get("rdc"), L: s.get("l"), C: s.get("c"), Rac: s.get("rac")}
	if withSat {
		bp.Isat = s.get("isat")
	}
	return bp
}

// beadResiduals stores bp's residuals at the points in dst, two for a
// complex point (see the package doc).
func beadResiduals(dst []float64, bp BeadParams, pts []BeadPoint) {
	k := 0
	for _, p := range pts {
		z := BeadZ(bp, p.F, p.Bias)
		a := cmplx.Abs(p.Measured)
		if p.Complex {
			d := (z - p.Measured) / complex(a, 0)
			dst[k], dst[k+1] = real(d), imag(d)
			k += 2
		} else {
			dst[k] = (cmplx.Abs(z) - a) / a
			k++
		}
	}
}

// compare sets Points: each point with the fitted model beside it.
func (f *BeadFit) compare(pts []BeadPoint) {
	for _, p := range pts {
		p.Fitted = BeadZ(f.Params, p.F, p.Bias)
		a := cmplx.Abs(p.Measured)
		if p.Complex {
			p.Residual = cmplx.Abs(p.Fitted-p.Measured) / a
		} else {
			p.Residual = (cmplx.Abs(p.Fitted) - a) / a
		}
		f.Points = append(f.Points, p)
	}
}

// band finds the widest run of consecutive points of the curve at bias
// whose residual is within 10 %.
func (f *BeadFit) band(bias float64) {
	bestN, n := 0, 0
	var lo float64
	for _, p := range f.Points {
		if p.Bias != bias {
			continue
		}
		if math.Abs(p.Residual) <= 0.1 {
			if n == 0 {
				lo = p.F
			}
			n++
			if n > bestN {
				bestN, f.BandLo, f.BandHi = n, lo, p.F
			}
		} else {
			n = 0
		}
	}
}

// beadStart estimates the parameters from one curve: rdc from the lowest
// frequency's resistance, the resonance at the highest |Z|, rac from the
// peak, l from the reactance below it, c from the resonance.
func beadStart(c BeadCurve, rdc float64) (BeadParams, error) {
	n := len(c.F)
	if n < 3 {
		return BeadParams{}, fmt.Errorf("an impedance curve needs at least 3 frequencies, got %d", n)
	}
	kp := 0
	for k := range c.Z {
		if cmplx.Abs(c.Z[k]) > cmplx.Abs(c.Z[kp]) {
			kp = k
		}
	}
	zmax := cmplx.Abs(c.Z[kp])
	z0 := c.Z[0]
	if rdc <= 0 {
		if c.Complex {
			rdc = math.Max(real(z0), 1e-4*zmax)
		} else {
			rdc = math.Max(0.1*cmplx.Abs(z0), 1e-4*zmax)
		}
	}
	// The inductance from the lowest frequency whose |Z| is well above
	// rdc and well below the peak.
	l := 0.0
	for k := 0; k < kp || (k == 0 && kp == 0); k++ {
		a := cmplx.Abs(c.Z[k])
		if a > 2*rdc && a < 0.3*zmax || k == kp-1 {
			x := math.Sqrt(math.Max(a*a-rdc*rdc, a*a*1e-4))
			if c.Complex {
				x = math.Max(imag(c.Z[k]), x*1e-2)
			}
			l = x / (2 * math.Pi * c.F[k])
			break
		}
	}
	if !(l > 0) {
		l = zmax / (2 * math.Pi * c.F[kp])
	}
	f0 := c.F[kp]
	if kp == n-1 {
		f0 *= 3 // still rising at the last frequency: resonance beyond it
	}
	return BeadParams{Rdc: rdc, L: l, C: 1 / (math.Pow(2*math.Pi*f0, 2) * l), Rac: math.Max(zmax-rdc, rdc)}, nil
}

// beadStartIsat estimates isat from the inductance at the highest bias.
func beadStartIsat(curves []BeadCurve, p0 BeadParams) float64 {
	hi := curves[len(curves)-1]
	ph, err := beadStart(hi, p0.Rdc)
	if err != nil || hi.Bias <= 0 || ph.L >= p0.L {
		return math.Max(hi.Bias, 1e-3) * 3
	}
	return hi.Bias / math.Sqrt(p0.L/ph.L-1)
}
