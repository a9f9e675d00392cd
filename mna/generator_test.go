package mna

import (
	"fmt"
	"math"
	"strconv"
	"testing"

	"zapnet/internal/refdata"
	"zapnet/waveforms"
)

// generatorRef reads testdata/reference/generators.csv: the calibration of
// the generator networks and their independent solutions by SciPy
// (generators.py beside it; provenance in that folder's README.md).
func generatorRef(t testing.TB) map[string]float64 {
	t.Helper()
	_, rows := refdata.Read(t, "../testdata/reference/generators.csv")
	out := map[string]float64{}
	for _, row := range rows {
		v, err := strconv.ParseFloat(row[2], 64)
		if err != nil {
			t.Fatal(err)
		}
		out[row[0]+"/"+row[1]] = v
	}
	return out
}

// into solves waveform name at level into ohms with IntoLoad's defaults.
func into(t testing.TB, name string, level float64, num map[string]float64, str map[string]string, ohms float64) *LoadResult {
	t.Helper()
	r, err := IntoLoad(stimulus(t, name, level, num, str), ohms, nil)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// pulse measures a current the way generators.py does: the largest sample
// refined by the parabola through its neighbours, the 10–90 % rise, the
// values 30 and 60 ns after the 10 % point, and the steepest rise between
// samples.
type pulse struct{ peak, tPeak, rise, i30, i60, slope float64 }

func measurePulse(t, y []float64) pulse {
	var p pulse
	k := 0
	for j := range y {
		if y[j] > y[k] {
			k = j
		}
	}
	p.peak, p.tPeak = y[k], t[k]
	if k > 0 && k < len(y)-1 {
		a := ((y[k+1]-y[k])/(t[k+1]-t[k]) - (y[k]-y[k-1])/(t[k]-t[k-1])) / (t[k+1] - t[k-1])
		f01 := (y[k] - y[k-1]) / (t[k] - t[k-1])
		if a < 0 {
			x := (t[k-1]+t[k])/2 - f01/(2*a)
			p.peak, p.tPeak = y[k-1]+f01*(x-t[k-1])+a*(x-t[k-1])*(x-t[k]), x
		}
	}
	t10, _ := waveforms.FirstCrossing(t, y, 0.1*p.peak)
	t90, _ := waveforms.FirstCrossing(t, y, 0.9*p.peak)
	p.rise = t90 - t10
	p.i30 = valueAt(t, y, t10+30e-9)
	p.i60 = valueAt(t, y, t10+60e-9)
	for j := 1; j < len(y); j++ {
		p.slope = math.Max(p.slope, (y[j]-y[j-1])/(t[j]-t[j-1]))
	}
	return p
}

func near(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s: %.6g, want %.6g within %g %%", what, got, want, 100*rel)
	} else {
		t.Logf("%s: %.6g (reference %.6g, %+.3f %%)", what, got, want, 100*(got/want-1))
	}
}

// The contact generator network meets every check point of IEC 61000-4-2's
// calibration table into the 2 Ω target at every contact level, within the
// published tolerances [pub: CHECKS.md's table; tolerances mem].
func TestIECNetworkCalibration(t *testing.T) {
	for _, level := range []float64{2000, 4000, 6000, 8000} {
		st := stimulus(t, "iec61000-4-2-network", level, nil, nil)
		solvedChecks(t, fmt.Sprintf("%g V", level), st, waveforms.DefaultLoad, 4)
	}
}

// solvedChecks solves st into load by the engine and fails the test for
// each of its standard's checks outside the tolerance, what naming the
// case; it wants n checks (0: at least one) and returns them.
func solvedChecks(t *testing.T, what string, st *waveforms.Stimulus, load float64, n int) []waveforms.Check {
	t.Helper()
	cs, err := waveforms.SolvedChecks(st, load, LoadSolver(nil))
	if err != nil || len(cs) == 0 || (n > 0 && len(cs) != n) {
		t.Fatalf("%s: %d checks, %v", what, len(cs), err)
	}
	for _, c := range cs {
		if !c.Within {
			t.Errorf("%s: %s = %s outside %s %s", what, c.Quantity, waveforms.FormatValue(c.Computed, c.Unit),
				waveforms.FormatValue(c.Published, c.Unit), c.Tol)
		}
	}
	return cs
}

// The engine's solution of the contact network agrees with SciPy's exact
// solution of the same linear circuit [calc: generators.csv] within 0.3 %
// into 2 Ω and into a short at 4 kV; its steepest rise stays at the annex's
// 18.7 A/ns [calc: CHECKS.md, maximum di/dt of the annex current at 4 kV];
// and into 1 kΩ (a high-impedance pin) it delivers 3.14 A where the ideal
// current delivers its 14.92 A whatever the load [calc].
func TestIECNetworkAgainstReference(t *testing.T) {
	ref := generatorRef(t)
	for _, c := range []struct {
		tag  string
		ohms float64
	}{{"2ohm", 2}, {"short", 0}} {
		r := into(t, "iec61000-4-2-network", 4000, nil, nil, c.ohms)
		p := measurePulse(r.Time, r.I)
		key := "iec-network/" + c.tag + "-4k-"
		near(t, c.tag+" peak", p.peak, ref[key+"peak"], 3e-3)
		near(t, c.tag+" time of peak", p.tPeak, ref[key+"t-peak"], 3e-3)
		near(t, c.tag+" rise", p.rise, ref[key+"rise"], 3e-3)
		near(t, c.tag+" i(30 ns)", p.i30, ref[key+"i30"], 3e-3)
		near(t, c.tag+" i(60 ns)", p.i60, ref[key+"i60"], 3e-3)
		near(t, c.tag+" steepest rise", p.slope, ref[key+"max-didt"], 2e-2)
		if p.slope > 1.03*18.74e9 {
			t.Errorf("%s: rises at %.4g A/ns, steeper than the annex's 18.74 A/ns", c.tag, p.slope/1e9)
		}
	}
	r := into(t, "iec61000-4-2-network", 4000, nil, nil, 1000)
	p := measurePulse(r.Time, r.I)
	near(t, "1 kΩ peak", p.peak, ref["iec-network/1kohm-4k-peak"], 3e-3)
	if p.peak > 0.25*14.921 {
		t.Errorf("into 1 kΩ the network delivers %.4g A, not far below the ideal current's 14.92 A", p.peak)
	}
}

// Air discharge: against SciPy's Radau solution of the same spark law and
// network [calc: generators.csv] within 0.5 % at 2, 4, 8 and 15 kV, for a
// slow (approach 1) and a fast (0.25) approach; and the first peak rises
// less than in proportion to the level [pub: CHECKS.md, second round — the
// first peak of an air discharge is not proportional to the level].
func TestAirDischarge(t *testing.T) {
	ref := generatorRef(t)
	for _, a := range []float64{1, 0.25} {
		prev := math.Inf(1)
		for _, level := range []float64{2000, 4000, 8000, 15000} {
			r := into(t, "iec61000-4-2-air", level, map[string]float64{"approach": a}, nil, 2)
			p := measurePulse(r.Time, r.I)
			key := "air/" + strconv.FormatFloat(level/1000, 'g', -1, 64) + "k-a" + strconv.FormatFloat(a, 'g', -1, 64) + "-"
			near(t, key+"peak", p.peak, ref[key+"peak"], 5e-3)
			near(t, key+"t-peak", p.tPeak, ref[key+"t-peak"], 5e-3)
			near(t, key+"rise", p.rise, ref[key+"rise"], 5e-3)
			perKV := p.peak / (level / 1000)
			if !(perKV < prev) {
				t.Errorf("approach %g, %g V: %.4g A/kV, not below the lower level's %.4g A/kV", a, level, perKV, prev)
			}
			prev = perKV
		}
	}
}

// The spark law has a closed-form solution for a capacitor C charged to V0
// discharging through a linear resistance R and a spark of fixed gap d
// [calc: derived here]. With W = ∫i²dt + W0 (W0 = (d/R0)²/(2a), the
// spark's seed), s = √W and c1 = d/√(2a), the spark's resistance is c1/s;
// the capacitor's energy pays both dissipations, dE = −(R + c1/s)·dW =
// −(2R·s + 2c1)·ds, so
//
//	E(s) = E0 − R·s² − 2c1·s,  E0 = ½CV0² + R·s0² + 2c1·s0,
//
// the current is i = √(2E/C)/(R + c1/s), and dt = dW/i² gives
//
//	dt/ds = C·(R·s + c1)² / (s·E(s)).
//
// E(s) = −R(s − s1)(s − s2) with s1,2 = (−c1 ± Δ)/R, Δ = √(c1² + R·E0);
// partial fractions give
//
//	t(s) = A·ln(s/s0) + B·ln((s1 − s)/(s1 − s0)) + D·ln((s − s2)/(s0 − s2)),
//	A = C·c1²/E0,  B = −C·Δ/(2s1),  D = C·Δ/(2s2),
//
// monotone from s0 to s1, inverted here by bisection. The engine's current
// agrees within 0.2 % of the peak at every accepted point, and the load's
// share of the energy, RL·(s1² − s0²) in the end, within 0.2 %.
func TestSparkClosedForm(t *testing.T) {
	const (
		c, v0, rg, rl = 150e-12, 8000.0, 330.0, 2.0
		d, a, r0      = 1e-3, 1e-4, 1e6
	)
	frag := &waveforms.Fragment{
		Nodes: []waveforms.Node{{Name: "c", Held: true, V0: v0}},
		Parts: []waveforms.Part{
			{Kind: waveforms.PartCapacitor, Name: "cs", A: 0, B: waveforms.Ref, Value: c},
			{Kind: waveforms.PartSwitch, Name: "gap", A: 0, B: waveforms.Out, R: rg, Spark: &waveforms.Spark{Gap: d, A: a, R0: r0}},
		},
	}
	const stop = 400e-9
	st := &waveforms.Stimulus{Name: "spark-test", Form: waveforms.Generator, Gen: frag, Breakpoints: []float64{0}, Stop: stop}
	// No waveform builds this circuit: the strike is built for its shape.
	s := compileFragment(t, frag, rl)
	s.SetStimulus(st, 1)
	res, err := s.Transient(&Settings{Stop: stop, MaxStep: stop / 4000, RelTol: 1e-7, Record: true})
	if err != nil {
		t.Fatal(err)
	}

	R := rg + rl
	c1 := d / math.Sqrt(2*a)
	s0 := math.Sqrt((d / r0) * (d / r0) / (2 * a))
	e0 := 0.5*c*v0*v0 + R*s0*s0 + 2*c1*s0
	delta := math.Sqrt(c1*c1 + R*e0)
	s1, s2 := (delta-c1)/R, -(delta+c1)/R
	A, B, D := c*c1*c1/e0, -c*delta/(2*s1), c*delta/(2*s2)
	tOf := func(x float64) float64 {
		return A*math.Log(x/s0) + B*math.Log((s1-x)/(s1-s0)) + D*math.Log((x-s2)/(s0-s2))
	}
	current := func(tm float64) float64 {
		lo, hi := s0, s1
		for range 200 {
			m := (lo + hi) / 2
			if tOf(m) < tm {
				lo = m
			} else {
				hi = m
			}
		}
		x := (lo + hi) / 2
		e := e0 - R*x*x - 2*c1*x
		return math.Sqrt(2*math.Max(e, 0)/c) / (R + c1/x)
	}
	load := elemIndex(t, s, "load")
	peak, worst := 0.0, 0.0
	for k, tm := range res.Time {
		want := current(tm)
		peak = math.Max(peak, want)
		worst = math.Max(worst, math.Abs(res.I[load][k]-want))
	}
	t.Logf("closed-form peak %.5g A; worst difference %.3g A", peak, worst)
	if worst > 2e-3*peak {
		t.Errorf("engine departs from the closed form by %.3g A of a %.4g A peak", worst, peak)
	}
	// By the stop time the discharge is over to well under 0.1 %: s has
	// reached s1 but for its tail.
	wantE := rl * (s1*s1 - s0*s0)
	near(t, "energy into the load", res.Energy[load], wantE, 2e-3)
}

// compileFragment compiles a strike built for frag's shape (a circuit no
// waveform of the catalogue builds) into a resistor load of rl ohms.
func compileFragment(t *testing.T, frag *waveforms.Fragment, rl float64) *struck {
	t.Helper()
	testShapes = append(testShapes, frag)
	return compile(t,
		el(testStrikeKind, "zap", "out", "gnd", float64(len(testShapes)-1)),
		el("resistor", "load", "out", "gnd", rl))
}

// valueAt is the samples' piecewise-linear value at time at.
func valueAt(t, y []float64, at float64) float64 {
	k := 1
	for k < len(t)-1 && t[k] < at {
		k++
	}
	return y[k-1] + (y[k]-y[k-1])*(at-t[k-1])/(t[k]-t[k-1])
}

// The seed of the spark law (its resistance when the spark forms) only
// delays the discharge: from 10 kΩ to 100 MΩ the first peak of an 8 kV air
// discharge moves by under 0.05 % [practice claim of generator.go, checked].
func TestSparkSeed(t *testing.T) {
	base := stimulus(t, "iec61000-4-2-air", 8000, nil, nil)
	var peaks []float64
	for _, r0 := range []float64{1e4, 1e6, 1e8} {
		frag := *base.Gen
		frag.Parts = append([]waveforms.Part(nil), base.Gen.Parts...)
		for k := range frag.Parts {
			if sp := frag.Parts[k].Spark; sp != nil {
				c := *sp
				c.R0 = r0
				frag.Parts[k].Spark = &c
			}
		}
		st := *base
		st.Gen = &frag
		r, err := IntoLoad(&st, 2, nil)
		if err != nil {
			t.Fatal(err)
		}
		peaks = append(peaks, measurePulse(r.Time, r.I).peak)
	}
	for _, p := range peaks {
		if math.Abs(p/peaks[1]-1) > 5e-4 {
			t.Errorf("first peaks %v move by more than 0.05 %% with the seed", peaks)
		}
	}
}

// The combination wave generator at its output meets the published wave
// parameters [pub: IEC 61000-4-5 1.2/50 µs open circuit, 8/20 µs short
// circuit; tolerances mem], its effective output impedance is 2 Ω ±10 %
// [pub value, mem tolerance], and the engine agrees with SciPy's exact
// solution [calc: generators.csv] within 0.3 %.
func TestCombinationWave(t *testing.T) {
	ref := generatorRef(t)
	st := stimulus(t, "surge-cwg", 1000, nil, nil)
	for _, load := range []float64{math.Inf(1), 0} {
		cs := solvedChecks(t, fmt.Sprintf("load %g", load), st, load, 4)
		for _, c := range cs {
			t.Logf("load %g: %s = %s", load, c.Quantity, waveforms.FormatValue(c.Computed, c.Unit))
		}
		want := map[string]string{"open-circuit peak": "open-peak-per-V", "open-circuit front 1.67x(30-90 %)": "open-front",
			"open-circuit time to half": "open-half", "short-circuit peak": "short-peak-per-V",
			"short-circuit front 1.25x(10-90 %)": "short-front", "short-circuit time to half": "short-half",
			"effective output impedance": "ratio"}
		for _, c := range cs {
			r := ref["cwg/"+want[c.Quantity]]
			if c.Unit == "V" || c.Unit == "A" {
				r *= 1000
			}
			near(t, c.Quantity, c.Computed, r, 3e-3)
		}
	}
}

// Through the coupling paths into a short at 1 kV: SciPy's solution of the
// same circuits [calc: generators.csv] within 0.5 %, and about 1 kV over the
// path's total impedance, 500 A, 83 A and 24 A [calc: 2, 12 and 42 Ω] —
// within 12 %, because the coupling capacitor charges during the front
// (18 µF takes up about 150 V while 450 A flow for some microseconds,
// [calc: Q/C]).
func TestCouplingPathsIntoShort(t *testing.T) {
	ref := generatorRef(t)
	for _, p := range waveforms.CouplingPaths[1:] {
		r := into(t, "surge-cwg", 1000, nil, map[string]string{"path": p.Name}, 0)
		pk := measurePulse(r.Time, r.I).peak
		near(t, p.Name+" peak (reference)", pk, ref["cwg/"+p.Name+"-1k-short-peak"], 5e-3)
		near(t, p.Name+" peak (1 kV / total)", pk, 1000/p.Total(), 0.12)
	}
}

// Every generator waveform (and the charged networks) passes its own
// standard's check points at each of its calibration loads when solved by
// the engine [pub/mem/calc per check: CHECKS.md].
func TestEveryNetworkPassesItsStandard(t *testing.T) {
	for _, c := range []struct {
		name  string
		level float64
		num   map[string]float64
		str   map[string]string
	}{
		{"iec61000-4-2-network", 8000, nil, nil},
		{"iec61000-4-2-air", 15000, nil, nil},
		{"surge-cwg", 2000, nil, nil},
		{"surge-cwg", 2000, nil, map[string]string{"path": "line-earth"}},
		{"eft", 4000, map[string]float64{"burst": 5e3}, nil},
		{"eft", 4000, map[string]float64{"burst": 100e3}, nil},
		{"hbm", 2000, nil, nil},
		{"iso10605", 8000, nil, nil},
	} {
		st := stimulus(t, c.name, c.level, c.num, c.str)
		w := waveforms.Lookup(c.name)
		for _, load := range append([]float64{w.Load}, w.Loads...) {
			solvedChecks(t, fmt.Sprintf("%s %v into %g Ω", c.name, c.str, load), st, load, 0)
		}
	}
}
