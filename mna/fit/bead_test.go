package fit

import (
	"math"
	"math/cmplx"
	"testing"
)

// rng is a small deterministic generator for the tests' invented noise.
type rng uint64

func (r *rng) uniform() float64 { // in [−1, 1)
	*r = *r*6364136223846793005 + 1442695040888963407
	return 2*float64(uint64(*r)>>11)/float64(1<<53) - 1
}

// logspace returns n frequencies from lo to hi, evenly on a log scale.
func logspace(lo, hi float64, n int) []float64 {
	f := make([]float64, n)
	for k := range f {
		f[k] = lo * math.Pow(hi/lo, float64(k)/float64(n-1))
	}
	return f
}

// noisy multiplies each value by (1 + 1 %·u)·e^(j·0.01·u'), u and u'
// uniform in [−1, 1]: "1 % noise" read as an error of up to 1 % in
// magnitude and 0.01 rad in phase [practice: the round-trip test's noise].
func noisy(z []complex128, seed rng) []complex128 {
	out := make([]complex128, len(z))
	for k := range z {
		out[k] = z[k] * complex(1+0.01*seed.uniform(), 0) * cmplx.Rect(1, 0.01*seed.uniform())
	}
	return out
}

// An invented bead: 0.15 Ω, 1.1 µH, 1.3 pF, 650 Ω, saturating at 0.3 A.
var testBead = BeadParams{Rdc: 0.15, L: 1.1e-6, C: 1.3e-12, Rac: 650, Isat: 0.3}

func beadCurve(p BeadParams, bias float64, f []float64, seed rng) BeadCurve {
	z := make([]complex128, len(f))
	for k := range f {
		z[k] = BeadZ(p, f[k], bias)
	}
	return BeadCurve{Bias: bias, F: f, Z: noisy(z, seed), Complex: true}
}

func TestBeadZClosedForms(t *testing.T) {
	p := testBead
	p.Isat = 0
	// At self-resonance the parallel l and c cancel: Z = rdc + rac, real
	// [calc: MODELS.md's Z(f); CHECKS.md, a bead peaks at about rdc + rac].
	f0 := p.SRF()
	if want := 1 / (2 * math.Pi * math.Sqrt(1.1e-6*1.3e-12)); math.Abs(f0-want) > 1e-9*want {
		t.Errorf("SRF %g, 1/(2π√(lc)) = %g", f0, want)
	}
	z := BeadZ(p, f0, 0)
	if math.Abs(real(z)-650.15) > 1e-9 || math.Abs(imag(z)) > 1e-9 {
		t.Errorf("Z(f0) = %v, want 650.15 + j0 Ω", z)
	}
	// Against the R–L–C–Rac formula written out: the parallel block's
	// admittance G + j(ωC − 1/(ωL)) [calc].
	for _, f := range []float64{1e3, 1e6, 30e6, 133e6, 700e6, 5e9} {
		w := 2 * math.Pi * f
		g, b := 1/p.Rac, w*p.C-1/(w*p.L)
		want := complex(p.Rdc+g/(g*g+b*b), -b/(g*g+b*b))
		if got := BeadZ(p, f, 0); cmplx.Abs(got-want) > 1e-12*cmplx.Abs(want) {
			t.Errorf("Z(%g Hz) = %v, formula %v", f, got, want)
		}
	}
	// Bias lowers the inductance as l/(1 + (i/isat)²) [MODELS.md]: at
	// i = isat the bead is one of half the inductance.
	half := p
	half.L /= 2
	sat := testBead
	if a, b := BeadZ(sat, 10e6, 0.3), BeadZ(half, 10e6, 0); cmplx.Abs(a-b) > 1e-12*cmplx.Abs(b) {
		t.Errorf("at isat: %v, half the inductance: %v", a, b)
	}
}

func TestBeadRoundTrip(t *testing.T) {
	// Invented bead → its impedance with 1 % noise → fit → parameters back
	// within 2 % and every point within 3 % [practice: the work item's
	// round-trip criterion].
	p := testBead
	p.Isat = 0
	c := beadCurve(p, 0, logspace(10e3, 3e9, 61), 11)
	fit, err := FitBead([]BeadCurve{c}, nil)
	if err != nil {
		t.Fatal(err)
	}
	checkBead(t, fit, p)
	// The report's numbers: self-resonance, |Z| at 100 MHz, the band.
	if math.Abs(fit.SRF/p.SRF()-1) > 0.02 {
		t.Errorf("SRF %g Hz, the part's %g Hz", fit.SRF, p.SRF())
	}
	if a, b := cmplx.Abs(fit.Z100M), cmplx.Abs(BeadZ(p, 100e6, 0)); math.Abs(a/b-1) > 0.02 {
		t.Errorf("|Z(100 MHz)| %g Ω, the part's %g Ω", a, b)
	}
	if fit.BandLo != 10e3 || fit.BandHi != 3e9 {
		t.Errorf("band %g–%g Hz, want the whole data", fit.BandLo, fit.BandHi)
	}
}

func TestBeadRoundTripWithBias(t *testing.T) {
	// Three curves at 0, 0.15 and 0.4 A fit isat as well.
	f := logspace(10e3, 3e9, 41)
	var curves []BeadCurve
	for k, bias := range []float64{0, 0.15, 0.4} {
		curves = append(curves, beadCurve(testBead, bias, f, rng(21+k)))
	}
	fit, err := FitBead(curves, nil)
	if err != nil {
		t.Fatal(err)
	}
	checkBead(t, fit, testBead)
	if math.Abs(fit.Params.Isat/testBead.Isat-1) > 0.02 {
		t.Errorf("isat %g, the part's %g", fit.Params.Isat, testBead.Isat)
	}
}

func checkBead(t *testing.T, fit *BeadFit, p BeadParams) {
	t.Helper()
	for _, c := range []struct {
		name      string
		got, want float64
	}{{"rdc", fit.Params.Rdc, p.Rdc}, {"l", fit.Params.L, p.L}, {"c", fit.Params.C, p.C}, {"rac", fit.Params.Rac, p.Rac}} {
		if math.Abs(c.got/c.want-1) > 0.02 {
			t.Errorf("%s = %g, the part's %g (%.2f %%)", c.name, c.got, c.want, 100*(c.got/c.want-1))
		}
	}
	worst := 0.0
	for _, pt := range fit.Points {
		worst = math.Max(worst, math.Abs(pt.Residual))
	}
	if worst > 0.03 {
		t.Errorf("worst point residual %.2f %%, want within 3 %%", 100*worst)
	}
	t.Logf("fitted %+v, worst residual %.2f %%, %d iterations, %d evaluations", fit.Params, 100*worst, fit.Result.Iterations, fit.Result.Evaluations)
}
