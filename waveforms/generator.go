package waveforms

import (
	"fmt"
	"math"

	"zapnet/devices/spec"
)

func init() {
	Register(&Waveform{Name: "iec61000-4-2-network", Unit: spec.Volt, Level: 4000, Discharge: true, Rise: iecRiseMin,
		Summary: "IEC 61000-4-2 contact discharge from the generator network: 150 pF, 330 Ω and its fast parasitic branch",
		build:   newIECNetwork,
		Order:   11, Load: iecTarget, generator: true,
		checks: checksIECNetwork,
	})
}

func init() {
	Register(&Waveform{Name: "iec61000-4-2-air", Unit: spec.Volt, Level: 8000, Discharge: true, Rise: airRiseMin,
		Summary: "IEC 61000-4-2 air discharge: the generator network through a spark (Rompe–Weizel) across the Paschen gap",
		Table: spec.Table{Params: []spec.Param{
			spec.Default("approach", spec.Dimensionless, spec.Positive, 1).
				Noted("the fraction of the breakdown gap left when the spark forms"),
		}},
		build: newIECAir,
		Order: 12, Load: iecTarget, generator: true,
		checks: checksAir,
	})
}

// The IEC 61000-4-2 generator as a network, for contact and air discharge.
//
// The standard publishes the generator's energy storage and discharge
// resistance, 150 pF and 330 Ω [pub], and the current its discharge must
// drive into the 2 Ω target (CHECKS.md's table); a real generator's fast
// first peak comes from the capacitance of its tip and relay, which the
// standard does not give as a circuit. This network adds, of our own design:
//
//	m ──330 Ω──lm──┐                cm = 150 pF from m to ref (the published network)
//	f ──rf─────lf──┴─ t ──relay── p ──lt── the struck node
//	cf from f to ref (the fast branch)     cp from p to ref (the tip)
//
// with m, f and t charged to the level before the relay (or, for air
// discharge, the spark) closes; in contact mode the tip already touches the
// struck node, so p sits at that node's DC voltage. cf, rf, lf, lm, cp and
// lt were chosen by least squares, within physical bounds, so that the
// current into 2 Ω (and, with half the weight, into a short) follows the
// annex's ideal current, meets each check point of the table at its nominal
// value and rises no more steeply than the annex does (18.7 A/ns at 4 kV:
// the overshoot across a clamp's inductance is L·di/dt), then rounded to
// three digits [calc: testdata/reference/generators.py, values in
// generators.csv]. Into 2 Ω at 4 kV the rounded network gives a 14.98 A
// first peak (3.744 A/kV), a 0.800 ns rise, 7.96 A at 30 ns, 4.05 A at
// 60 ns and at most 18.7 A/ns; into a short nearly the same; into 1 kΩ a
// 3.14 A peak where the ideal current stays 15 A.
const (
	iecCm = 150e-12 // F [pub]
	iecRm = 330.0   // Ω [pub]
	iecLm = 1.74e-6 // H, and the rest [calc: fitted]
	iecCf = 7.51e-12
	iecRf = 204.0
	iecLf = 34.5e-9
	iecCp = 1.5e-12
	iecLt = 150e-9
)

// Air discharge: the same generator through a spark gap. The gap length is
// where air breaks down at the level, from Paschen's law
//
//	V = B·p·d / (ln(A·p·d) − ln(ln(1 + 1/γ)))
//
// with air's A = 15 /(cm·Torr), B = 365 V/(cm·Torr) and γ = 0.01 at
// 760 Torr [pub: the commonly quoted coefficients for air, in textbooks of
// gas discharges and high-voltage engineering]; it gives 0.31 mm at 2 kV,
// 1.75 mm at 8 kV and 3.68 mm at 15 kV. For millimetre gaps these
// coefficients put the breakdown 15–25 % above the empirical
// 30 kV/cm·d + 1.35 kV [pub, quoted beside them], so the gaps come out that
// much short: the error lies on the side of faster sparks and higher first
// peaks. A spark forms there when the tip
// approaches slowly; a fast approach closes the gap further before the
// spark forms (the statistical delay of breakdown), which the approach
// parameter models as a fraction of that gap. The spark then follows
// Rompe–Weizel (Spark) with a = 1e-4 m²/(V²·s) [mem: about 1 cm²/(V²·s)
// for air at atmospheric pressure; fitted values from 0.22 to 2.32
// cm²/(V²·s) are published for ESD sparks, Schrama et al., arXiv:2509.05791]
// from R0 = 1 MΩ [practice: a seed for a law that starts at infinity; from
// 10 kΩ to 100 MΩ it moves the first peak by under 0.05 % and only delays
// the discharge, by about 1 ns a decade].
const (
	paschenA     = 15.0  // 1/(cm·Torr)
	paschenB     = 365.0 // V/(cm·Torr)
	paschenGamma = 0.01
	airTorr      = 760.0
	sparkA       = 1e-4 // m²/(V²·s)
	sparkR0      = 1e6  // Ω
)

// AirNote is the caution carried by the air-discharge stimulus.
const AirNote = "Air discharge is not repeatable, in the lab either: the spark's length depends on how fast the tip " +
	"approaches, on humidity and on the tip, so the first peak scatters from test to test. approach=1 (the default) " +
	"strikes at the static breakdown gap (a slow approach: a long spark, a slow rise and a low first peak); smaller " +
	"values model a faster approach with a higher and faster first peak. The first peak is not proportional to the level."

// PaschenGap returns the gap length (m) at which air at atmospheric
// pressure breaks down at v volts, from Paschen's law with the constants
// above; v must lie above the law's minimum (about 330 V).
func PaschenGap(v float64) (float64, error) {
	if !(v > paschenMin) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("no spark gap breaks down at %s in air (Paschen's law: above about %s)", spec.FormatSI(v, "V"), spec.FormatSI(paschenMin, "V"))
	}
	// Bisection on the rising branch of the law, in metres: the minimum
	// lies near 7.5 µm, and no discharge level needs more than 10 cm.
	lo, hi := paschenDmin, 0.1
	if PaschenVoltage(hi) < v {
		return 0, fmt.Errorf("a discharge of %s needs a gap beyond 10 cm: outside Paschen's law for small gaps", spec.FormatSI(v, "V"))
	}
	for range 200 {
		m := (lo + hi) / 2
		if PaschenVoltage(m) < v {
			lo = m
		} else {
			hi = m
		}
		if hi-lo <= 1e-15 {
			break
		}
	}
	return (lo + hi) / 2, nil
}

// PaschenVoltage is the breakdown voltage (V) of a gap of d metres in air at
// atmospheric pressure.
func PaschenVoltage(d float64) float64 {
	pd := airTorr * d * 100 // Torr·cm
	return paschenB * pd / (math.Log(paschenA*pd) - math.Log(math.Log(1+1/paschenGamma)))
}

// The minimum of Paschen's law: at A·p·d = e·ln(1 + 1/γ).
var (
	paschenDmin = math.E * math.Log(1+1/paschenGamma) / paschenA / airTorr / 100
	paschenMin  = PaschenVoltage(paschenDmin)
)

// iecFragment is the generator charged to v0, closing through sw.
func iecFragment(v0 float64, sw Part) *Fragment {
	const m, f, t, p = 0, 1, 2, 3
	sw.A, sw.B = t, p
	return &Fragment{
		Nodes: []Node{{Name: "m", Held: true, V0: v0}, {Name: "f", Held: true, V0: v0}, {Name: "t", Held: true, V0: v0}, {Name: "p"}},
		Parts: []Part{
			{Kind: PartCapacitor, Name: "cm", A: m, B: Ref, Value: iecCm},
			{Kind: PartInductor, Name: "lm", A: m, B: t, Value: iecLm, R: iecRm},
			{Kind: PartCapacitor, Name: "cf", A: f, B: Ref, Value: iecCf},
			{Kind: PartInductor, Name: "lf", A: f, B: t, Value: iecLf, R: iecRf},
			sw,
			{Kind: PartCapacitor, Name: "cp", A: p, B: Ref, Value: iecCp},
			{Kind: PartInductor, Name: "lt", A: p, B: Out, Value: iecLt},
		},
	}
}

// iecNetStop is the span of the networks: five time constants of the main
// discharge and ten of its inductance, as for the other networks.
const iecNetStop = 5*iecRm*iecCm + 10*iecLm/iecRm

// newIECNetwork is the contact discharge: the generator through its relay.
func newIECNetwork(level float64, _ *spec.Values) (*Stimulus, error) {
	f := iecFragment(level, Part{Kind: PartSwitch, Name: "relay"})
	return &Stimulus{Form: Generator, Gen: f, Breakpoints: []float64{0}, Stop: iecNetStop}, nil
}

// newIECAir is the air discharge: the generator through a spark gap of
// approach × the Paschen gap of the level (key approach, 0 < approach <= 1,
// default 1).
func newIECAir(level float64, v *spec.Values) (*Stimulus, error) {
	approach := v.Num("approach")
	if !(approach > 0 && approach <= 1) {
		return nil, fmt.Errorf("iec61000-4-2-air: approach is the fraction of the breakdown gap left when the spark forms, from above 0 to 1, got %g", approach)
	}
	d, err := PaschenGap(level)
	if err != nil {
		return nil, fmt.Errorf("iec61000-4-2-air: %v", err)
	}
	sw := Part{Kind: PartSwitch, Name: "gap", Spark: &Spark{Gap: approach * d, A: sparkA, R0: sparkR0}}
	return &Stimulus{Form: Generator, Gen: iecFragment(level, sw), Breakpoints: []float64{0},
		Stop: iecNetStop + airDelay, Note: AirNote}, nil
}

// airDelay is added to the span for the time the spark takes to form: about
// 20 ns at a slow approach [calc: generators.csv, peaks at 18–23 ns].
const airDelay = 100e-9

// GeneratorShape returns the generator circuit a strike's waveform builds
// with the strike's values v (of the waveform's table), at the waveform's
// typical level: the strike builds its unknowns for it, and every level of
// a study has the same shape. For a waveform without a generator circuit
// of its own (an ideal current, a Thevenin source, hbm and iso10605) or no
// values at all it is the charged network of hbm and iso10605, whose two
// unknowns the other forms leave idle.
func GeneratorShape(v *spec.Values) *Fragment {
	if v != nil {
		for _, w := range registry {
			if &w.Table != v.Table() || !w.generator {
				continue
			}
			if s, err := w.New(w.Level, v); err == nil && s.Gen != nil {
				return s.Gen
			}
		}
	}
	return NetworkFragment(1, 1, 1, 0)
}
