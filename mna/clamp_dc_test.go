package mna

import (
	"fmt"
	"math"
	"testing"
)

// clampCurrent is MODELS.md's clamp junction current, written out here from
// the document and not from the model's code [pub: shared design notes,
// MODELS.md "Clamp (TVS)"; Vt = k·T/q at 300 K with the exact SI 2019
// constants]: uni
// i(u) = it·[e^{(u−vbr)/(nbr·Vt)} − e^{−vbr/(nbr·Vt)}] − is·[e^{−u/(n·Vt)} − 1],
// bi i(u) = sign(u)·it·[e^{(|u|−vbr)/(nbr·Vt)} − e^{−vbr/(nbr·Vt)}].
func clampCurrent(u, vbr, it, nbr, is, n float64, bi bool) float64 {
	vt := 1.380649e-23 * 300 / 1.602176634e-19
	if bi {
		s := 1.0
		if u < 0 {
			s = -1
		}
		return s * it * (math.Exp((math.Abs(u)-vbr)/(nbr*vt)) - math.Exp(-vbr/(nbr*vt)))
	}
	return it*(math.Exp((u-vbr)/(nbr*vt))-math.Exp(-vbr/(nbr*vt))) - is*(math.Exp(-u/(n*vt))-1)
}

// A DC sweep through the engine: a supply behind 1 Ω drives the clamp (with
// rdyn) from microamperes to 10 A, in breakdown and, for the uni clamp, in
// forward conduction. At every operating point the current the resistor
// carries must equal MODELS.md's current at the junction voltage
// u = v − i·rdyn to 1e-9 relative [calc: KCL with the equations above].
// Then the static voltage at about 10 A is checked against an independent
// solution of the same equations: bisection on u of
// (V − u − i(u)·rdyn)/R = i(u), in this test, to 1e-9 relative.
func TestClampDCSweep(t *testing.T) {
	const vbr, it, nbr, is, n, rdyn, r = 6.8, 1e-3, 1.2, 1e-14, 1.0, 0.35, 1.0
	tight := &Settings{RelTol: 1e-12, AbsTol: 1e-13, Gmin: 1e-20}
	for _, bi := range []bool{false, true} {
		pol := map[bool]string{false: "uni", true: "bi"}[bi]
		for _, vs := range []float64{-12, -2, -0.9, -0.7, 5, 6.5, 6.9, 7.5, 10, 20} {
			t.Run(fmt.Sprintf("%s/%gV", pol, vs), func(t *testing.T) {
				d := el("clamp", "D1", "s", "gnd", 0, "vbr", vbr, "it", it, "nbr", nbr, "is", is, "n", n, "rdyn", rdyn, "polarity", pol)
				s := compile(t, el("supply", "V1", "s", "gnd", vs, "r", r), d)
				v, err := s.OperatingPoint(tight)
				if err != nil {
					t.Fatal(err)
				}
				va := v[nodeIndex(t, s, "s")]
				i := (vs - va) / r
				if math.Abs(i) < 1e-6 {
					return // below a microampere the sweep has nothing to say
				}
				u := va - i*rdyn
				want := clampCurrent(u, vbr, it, nbr, is, n, bi)
				if rel := math.Abs(i-want) / math.Abs(want); rel > 1e-9 {
					t.Errorf("at %g V: resistor carries %.12g A, MODELS.md gives %.12g A at u = %.9g V (%.2g relative)", vs, i, want, u, rel)
				}
			})
		}
	}
	// The static voltage near 10 A.
	for _, bi := range []bool{false, true} {
		const vs = 20.6 // about 10 A through 1 Ω beside the clamp voltage
		d := el("clamp", "D1", "s", "gnd", 0, "vbr", vbr, "it", it, "nbr", nbr, "is", is, "n", n, "rdyn", rdyn,
			"polarity", map[bool]string{false: "uni", true: "bi"}[bi])
		s := compile(t, el("supply", "V1", "s", "gnd", vs, "r", r), d)
		v, err := s.OperatingPoint(tight)
		if err != nil {
			t.Fatal(err)
		}
		got := v[nodeIndex(t, s, "s")]
		f := func(u float64) float64 {
			i := clampCurrent(u, vbr, it, nbr, is, n, bi)
			return (vs-u-i*rdyn)/r - i
		}
		lo, hi := 0.0, vs // f(lo) > 0 > f(hi)
		for range 200 {
			mid := (lo + hi) / 2
			if f(mid) > 0 {
				lo = mid
			} else {
				hi = mid
			}
		}
		u := (lo + hi) / 2
		i := clampCurrent(u, vbr, it, nbr, is, n, bi)
		want := u + i*rdyn
		if i < 9 || i > 11 {
			t.Fatalf("the independent solution carries %g A, want about 10 A", i)
		}
		if rel := math.Abs(got-want) / want; rel > 1e-9 {
			t.Errorf("bi=%v: clamp voltage at %.6g A is %.12g V, the independent solution %.12g V (%.2g relative)", bi, i, got, want, rel)
		}
	}
}
