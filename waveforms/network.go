package waveforms

import "math"

// Human-body model network of ANSI/ESDA/JEDEC JS-001 [pub]: 100 pF through
// 1.5 kΩ.
const (
	hbmC = 100e-12
	hbmR = 1500.0
	// hbmL is the default series inductance. The standard specifies the
	// current into a short (rise 2–10 ns), not a circuit; a series
	// inductance of a few µH is how simulation models commonly reach that
	// rise [practice]. 2.5 µH gives a 10–90 % rise of about 3.7 ns into a
	// short, inside the window with room on both sides, and lowers the peak
	// about 4 % below V/R (0.64 A/kV, inside 0.67 A/kV ±10 %) [calc: the
	// series RLC discharge, see networkCurrent].
	hbmL = 2.5e-6
)

// ISO 10605 default network [pub/mem, CHECKS.md]: 150 pF, 330 Ω. The
// standard also uses 330 pF and 2 kΩ (keys c and r).
const (
	isoC = 150e-12
	isoR = 330.0
)

// newHBM is the JS-001 network: C charged to the level, discharging through
// R and a series L (key l, henries, default hbmL; l = 0 gives the ideal RC).
func newHBM(level float64, p params) (*Stimulus, error) {
	l, err := p.nonNegative("l", hbmL)
	if err != nil {
		return nil, err
	}
	return newNetwork(level, hbmC, hbmR, l), nil
}

// newISO10605 is the ISO 10605 network: keys c (default 150 pF), r (default
// 330 Ω) and an optional series l (default 0). The simple RC lacks the first
// fast spike of a real generator; its later points (30 and 60 ns at
// 150 pF/330 Ω, and so on) follow the RC time constant.
func newISO10605(level float64, p params) (*Stimulus, error) {
	c, err := p.positive("c", isoC)
	if err != nil {
		return nil, err
	}
	r, err := p.positive("r", isoR)
	if err != nil {
		return nil, err
	}
	l, err := p.nonNegative("l", 0)
	if err != nil {
		return nil, err
	}
	return newNetwork(level, c, r, l), nil
}

// newNetwork builds a Network stimulus. Its default span is 5·R·C + 10·L/R:
// five RC time constants leave under 1 % of the peak current (e^−5 ≈ 0.7 %)
// and the inductive term covers the slower start of an RLC discharge.
func newNetwork(v0, c, r, l float64) *Stimulus {
	return &Stimulus{
		Form:        Network,
		R:           r,
		L:           l,
		C:           c,
		V0:          v0,
		Gen:         NetworkFragment(v0, c, r, l),
		Breakpoints: []float64{0},
		Stop:        5*r*c + 10*l/r,
	}
}

// networkCurrent returns the exact current at time t of a capacitor c
// charged to v0 discharging through the series resistance r (the network's
// own plus the load) and inductance l, switched at t = 0. With l = 0 it is
// the RC exponential; otherwise the series RLC with i(0) = 0 and
// L·di/dt(0) = v0:
//
//	i(t) = v0/L · e^(−αt) · sinh(βt)/β,  α = r/(2L), β² = α² − 1/(LC),
//
// which is sin(ωt)/ω when β² < 0 (underdamped) and t when β = 0
// (critically damped) [calc: any circuit-theory textbook]. With an open load
// (r = +Inf) no current flows.
func networkCurrent(t, v0, c, r, l float64) float64 {
	if t < 0 || math.IsInf(r, 1) {
		return 0
	}
	if l == 0 {
		if t == 0 {
			return v0 / r // the switch closes at t = 0: the jump belongs to 0+
		}
		return v0 / r * math.Exp(-t/(r*c))
	}
	alpha := r / (2 * l)
	b2 := alpha*alpha - 1/(l*c)
	switch {
	case b2 > 0:
		beta := math.Sqrt(b2)
		// e^(−αt)·sinh(βt) written as two decaying exponentials so that a
		// long span overflows neither factor.
		return v0 / l * (math.Exp((beta-alpha)*t) - math.Exp(-(alpha+beta)*t)) / (2 * beta)
	case b2 < 0:
		w := math.Sqrt(-b2)
		return v0 / l * math.Exp(-alpha*t) * math.Sin(w*t) / w
	default:
		return v0 / l * math.Exp(-alpha*t) * t
	}
}
