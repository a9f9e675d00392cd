package devices

// Shared pieces of the junction models (clamp, diode, pin): the thermal
// voltage, one exponential term of a junction law with its Newton step
// limiting, the two junction laws of MODELS.md and a few stamping helpers
// that several models share.
//
// Step limiting. Newton on an exponential overshoots badly when it starts far
// below the knee: a linearisation taken at 0 V asks for tens of volts, where
// exp overflows. Each exponential term sat·exp(w/nvt) limits its own argument
// w with the classic logarithmic damping: above the critical voltage
// vcrit = nvt·ln(nvt/(√2·sat)) (where the term's curvature starts to
// dominate), a rise of w by more than 2·nvt is replaced by
// w_old + nvt·ln(1 + (w_new − w_old)/nvt), or by nvt·ln(w_new/nvt) when the
// old point was below the knee (w_old ≤ 0). Only rises are limited: a
// falling exponential cannot overflow, and pulling a falling step back to
// vcrit (as some variants do) only costs iterations.
//
// A breakdown term it·exp((u − vbr)/(nbr·Vt)) is the same exponential in
// w = u − vbr with sat = it, so it is limited around vbr exactly like a
// forward junction is limited around 0. A term that falls with u (a clamp's
// forward conduction, a diode's breakdown) uses w = −u − offset.
//
// The device remembers the junction voltage of its last evaluation (after
// limiting); Reset clears it to 0, the engine's starting point. When limiting
// moves the voltage from u to ul, the device stamps the linearisation taken
// at ul, i(ul) + g(ul)·(u − ul), so the Jacobian and the residual agree and
// the next Newton step starts from ul; it also sets Context.Limited so the
// engine does not take the iterate as converged.

import (
	"math"

	"zapnet/devices/spec"
)

// The junction keys that clamp, diode, pin and snapback share, with
// MODELS.md's defaults, and the pulse ratings of the protectors: declared
// once, so that a default or a rating's wording cannot drift between kinds.
var (
	keyIs  = spec.Default("is", spec.Ampere, spec.Positive, 1e-14).As(spec.Model)
	keyN   = spec.Default("n", spec.Dimensionless, spec.Positive, 1).As(spec.Model)
	keyIt  = spec.Default("it", spec.Ampere, spec.Positive, 1e-3).As(spec.Model)
	keyNbr = spec.Default("nbr", spec.Dimensionless, spec.Positive, 1).As(spec.Model)

	ratingIpp  = spec.Limit("ipp", spec.Ampere, spec.Positive, spec.PeakCurrent, true, "peak current")
	ratingEmax = spec.Limit("emax", spec.Joule, spec.Positive, spec.Energy, true, "energy")
)

// Physical constants (SI, exact since the 2019 redefinition) and the fixed
// junction temperature of MODELS.md.
const (
	boltzmannK  = 1.380649e-23    // J/K
	electronQ   = 1.602176634e-19 // C
	junctionTmp = 300.0           // K

	// ThermalVoltage is k·T/q at 300 K, about 25.852 mV.
	ThermalVoltage = boltzmannK * junctionTmp / electronQ
)

// maxExpArg caps exponent arguments: beyond it exp is continued along its
// tangent, so an iterate far out never produces Inf or NaN. e^80 times any
// saturation current is far beyond any physical current.
const maxExpArg = 80.0

// expLin returns exp(x) and its derivative, continued linearly above
// maxExpArg.
func expLin(x float64) (e, de float64) {
	if x <= maxExpArg {
		e = math.Exp(x)
		return e, e
	}
	e0 := math.Exp(maxExpArg)
	return e0 * (1 + x - maxExpArg), e0
}

// expTerm is one exponential of a junction law, sat·exp(w/nvt) with
// w = dir·u − off, u being the junction voltage.
type expTerm struct {
	sat   float64 // A
	nvt   float64 // emission coefficient times Vt, V
	dir   float64 // +1: rises with u; −1: rises as u falls
	off   float64 // V
	vcrit float64 // critical value of w, V
	rnvt  float64 // 1/nvt, 1/V
	gain  float64 // dir·sat/nvt, A/V: dv/du per unit of exp

	// The last evaluation, v and dv at u: Newton often evaluates a junction
	// at the voltage it evaluated last (the first iteration of a time step
	// starts from the point the previous one converged on, and a junction
	// far from its knee sees the same voltage across several iterations),
	// and the exponential is the dear part of a model.
	u, v, dv float64
	memo     bool
}

func newExpTerm(sat, nvt, dir, off float64) expTerm {
	t := expTerm{sat: sat, nvt: nvt, dir: dir, off: off, vcrit: math.Inf(1),
		rnvt: 1 / nvt, gain: dir * sat / nvt}
	if sat > 0 {
		t.vcrit = nvt * math.Log(nvt/(math.Sqrt2*sat))
	}
	return t
}

// eval returns sat·exp(w/nvt) and its derivative with respect to u.
func (t *expTerm) eval(u float64) (v, dv float64) {
	if t.memo && u == t.u {
		return t.v, t.dv
	}
	// Multiplications by constants formed once: a division costs as much
	// as the rest of the arithmetic here.
	e, de := expLin((t.dir*u - t.off) * t.rnvt)
	t.u, t.v, t.dv, t.memo = u, t.sat*e, t.gain*de, true
	return t.v, t.dv
}

// limit damps the step of u from uold; it reports whether it changed u.
func (t *expTerm) limit(u, uold float64) (float64, bool) {
	w, lim := limitStep(t.dir*u-t.off, t.dir*uold-t.off, t.nvt, t.vcrit)
	if !lim {
		return u, false
	}
	return t.dir * (w + t.off), true
}

// limitStep is the logarithmic damping of an exponential's argument w.
func limitStep(wnew, wold, nvt, vcrit float64) (float64, bool) {
	if wnew <= vcrit || wnew-wold <= 2*nvt {
		return wnew, false
	}
	if wold > 0 {
		return wold + nvt*math.Log(1+(wnew-wold)/nvt), true
	}
	if wnew <= nvt {
		// Below one nvt the term is at most e·sat: nothing to fear, and
		// the logarithm below would move the point the wrong way.
		return wnew, false
	}
	return nvt * math.Log(wnew/nvt), true
}

// clampLaw is the clamp junction of MODELS.md: current from j to b and
// charge as functions of u = v(j) − v(b).
//
//	uni: i(u) = it·[exp((u−vbr)/(nbr·Vt)) − exp(−vbr/(nbr·Vt))] − is·[exp(−u/(n·Vt)) − 1]
//	bi:  i(u) = sign(u)·it·[exp((|u|−vbr)/(nbr·Vt)) − exp(−vbr/(nbr·Vt))]
//	q(u) = cj·u (m = 0), else sign(u)·cj·vj/(1−m)·[(1+|u|/vj)^(1−m) − 1]
//	C(u) = dq/du = cj·(1+|u|/vj)^(−m)
//
// The bi law is odd in u; the uni law's forward term is the diode that
// conducts when the line goes below the reference. For m = 1 the charge is
// the limit of the formula, sign(u)·cj·vj·ln(1+|u|/vj).
type clampLaw struct {
	bi    bool
	br    expTerm // it·exp((w−vbr)/(nbr·Vt)), w = u (uni) or |u| (bi)
	brOff float64 // it·exp(−vbr/(nbr·Vt)), makes i(0) = 0
	fw    expTerm // is·exp(−u/(n·Vt)), uni only
	cj    float64 // F
	vj    float64 // V
	m     float64

	// The last charge evaluation with a graded junction (m > 0), q and c
	// at qu: two powers saved whenever the voltage repeats (see expTerm).
	qu, qv, qc float64
	qmemo      bool
}

func newClampLaw(vbr, it, nbr, is, n float64, bi bool) clampLaw {
	nbrVt := nbr * ThermalVoltage
	l := clampLaw{
		bi: bi,
		br: newExpTerm(it, nbrVt, 1, vbr),
		fw: newExpTerm(is, n*ThermalVoltage, -1, 0),
	}
	// The offset as the term itself evaluates it at u = 0, rounding and
	// all, so that i(0) is exactly zero: a circuit at rest then rests at
	// exactly zero, not at the 1e-117 V its rounding would leave.
	l.brOff, _ = l.br.eval(0)
	l.br.memo = false
	return l
}

// current returns i(u) and di/du.
func (l *clampLaw) current(u float64) (i, g float64) {
	if l.bi {
		if u < 0 {
			e, de := l.br.eval(-u)
			return -(e - l.brOff), de
		}
		e, de := l.br.eval(u)
		return e - l.brOff, de
	}
	e, de := l.br.eval(u)
	f, df := l.fw.eval(u)
	return e - l.brOff - (f - l.fw.sat), de - df
}

// limit applies the step limiting of every exponential term.
func (l *clampLaw) limit(u, uold float64) (float64, bool) {
	if l.bi {
		if u < 0 {
			w, lim := l.br.limit(-u, -uold)
			return -w, lim
		}
		return l.br.limit(u, uold)
	}
	u1, lb := l.br.limit(u, uold)
	u2, lf := l.fw.limit(u1, uold)
	return u2, lb || lf
}

// charge returns q(u) and C(u).
func (l *clampLaw) charge(u float64) (q, c float64) {
	if l.m == 0 {
		return l.cj * u, l.cj
	}
	if l.qmemo && u == l.qu {
		return l.qv, l.qc
	}
	q, c = l.gradedCharge(u)
	l.qu, l.qv, l.qc, l.qmemo = u, q, c, true
	return q, c
}

// gradedCharge is charge for m > 0.
func (l *clampLaw) gradedCharge(u float64) (q, c float64) {
	s, au := 1.0, u
	if u < 0 {
		s, au = -1, -u
	}
	base := 1 + au/l.vj
	c = l.cj * math.Pow(base, -l.m)
	if l.m == 1 {
		return s * l.cj * l.vj * math.Log(base), c
	}
	return s * l.cj * l.vj / (1 - l.m) * (math.Pow(base, 1-l.m) - 1), c
}

// diodeLaw is the diode of MODELS.md, current from anode to cathode as a
// function of v = v(anode) − v(cathode):
//
//	i(v) = is·[exp(v/(n·Vt)) − 1] − it·exp(−(v+vbr)/(n·Vt))   (last term only when vbr > 0)
type diodeLaw struct {
	fw    expTerm // is·exp(v/(n·Vt))
	hasBv bool
	bv    expTerm // it·exp((−v−vbr)/(n·Vt))
}

func newDiodeLaw(is, n, vbr, it float64) diodeLaw {
	nVt := n * ThermalVoltage
	l := diodeLaw{fw: newExpTerm(is, nVt, 1, 0)}
	if vbr > 0 {
		l.hasBv = true
		l.bv = newExpTerm(it, nVt, -1, vbr)
	}
	return l
}

// current returns i(v) and di/dv.
func (l *diodeLaw) current(v float64) (i, g float64) {
	f, df := l.fw.eval(v)
	i, g = f-l.fw.sat, df
	if l.hasBv {
		b, db := l.bv.eval(v)
		i -= b
		g -= db
	}
	return i, g
}

// limit applies the step limiting of every exponential term.
func (l *diodeLaw) limit(v, vold float64) (float64, bool) {
	v1, lf := l.fw.limit(v, vold)
	if !l.hasBv {
		return v1, lf
	}
	v2, lb := l.bv.limit(v1, vold)
	return v2, lf || lb
}

// junctionLaw is what stampJunction needs of a law.
type junctionLaw interface {
	current(u float64) (i, g float64)
	limit(u, uold float64) (float64, bool)
}

// stampJunction evaluates law across (a, b) with limiting from *uold,
// stamps the current (with gmin in parallel) and returns the junction
// voltage u read from the iterate.
func stampJunction(c *Context, law junctionLaw, a, b int, uold *float64) float64 {
	u := c.V(a) - c.V(b)
	ul, lim := law.limit(u, *uold)
	*uold = ul
	if lim {
		c.Limited = true
	}
	i, g := law.current(ul)
	i += g * (u - ul)
	c.Current(a, b, i+c.Gmin*u, g+c.Gmin)
	return u
}

// branchKCL stamps the topology of a branch current unknown br flowing
// from a to b: +i leaves a, enters b, and the branch row gets v(a) − v(b).
// The caller adds the rest of the branch equation (−R·i, the flux state).
func branchKCL(c *Context, a, b, br int) {
	i := c.V(br)
	va, vb := c.V(a), c.V(b)
	if c.Local != nil || br < 0 {
		c.AddF(a, i)
		c.AddF(b, -i)
		c.AddJ(a, br, 1)
		c.AddJ(b, br, -1)
		c.AddF(br, va-vb)
		c.AddJ(br, a, 1)
		c.AddJ(br, b, -1)
		return
	}
	// Every inductive branch goes through here: written out for the plain
	// form.
	F, J, n := c.F, c.J, c.N
	F[br] += va - vb
	if a >= 0 {
		F[a] += i
		J[a*n+br]++
		J[br*n+a]++
	}
	if b >= 0 {
		F[b] -= i
		J[b*n+br]--
		J[br*n+b]--
	}
}
