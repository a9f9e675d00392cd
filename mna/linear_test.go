package mna

import (
	"errors"
	"math"
	"strings"
	"testing"

	"zapnet/devices"
	"zapnet/netlist"
	"zapnet/waveforms"
)

// [calc] RC charging through R from a voltage step V:
// v(t) = V·(1 − e^{−t/RC}) (first-order linear ODE, any circuits textbook).
func TestRCChargingStep(t *testing.T) {
	const V, R, C = 5.0, 1e3, 1e-9
	tau := R * C
	s := compile(t, el(testSourceKind, "src", "in", "gnd", 0), el("capacitor", "C1", "in", "gnd", C))
	s.SetStimulus(step(waveforms.Thevenin, V, R, 5*tau), 1)
	res, err := s.Transient(&Settings{Record: true})
	if err != nil {
		t.Fatal(err)
	}
	in := nodeIndex(t, s, "in")
	e := maxErr(res.Time, res.V[in], func(t float64) float64 { return V * (1 - math.Exp(-t/tau)) })
	// The error control works at RelTol = 1e-3 on the charge; the voltage
	// follows within a few RelTol of V [practice].
	if e > 5e-3*V {
		t.Errorf("RC charging: max error %.3g V over %d steps, want ≤ %.3g V", e, res.Stats.Steps, 5e-3*V)
	}
	if res.Stop != 5*tau || res.Time[len(res.Time)-1] != 5*tau {
		t.Errorf("stop: got %g (last point %g), want %g", res.Stop, res.Time[len(res.Time)-1], 5*tau)
	}
}

// [calc] Norton step I into R ∥ C: v(t) = I·R·(1 − e^{−t/RC}).
func TestCurrentStepIntoRC(t *testing.T) {
	const I, R, C = 2e-3, 500.0, 4e-9
	tau := R * C
	s := compile(t,
		el(testSourceKind, "src", "n", "gnd", 0),
		el("resistor", "R1", "n", "gnd", R),
		el("capacitor", "C1", "n", "gnd", C))
	s.SetStimulus(step(waveforms.Current, I, 0, 6*tau), 1)
	res, err := s.Transient(&Settings{Record: true})
	if err != nil {
		t.Fatal(err)
	}
	n := nodeIndex(t, s, "n")
	e := maxErr(res.Time, res.V[n], func(t float64) float64 { return I * R * (1 - math.Exp(-t/tau)) })
	if e > 5e-3*I*R {
		t.Errorf("current step into RC: max error %.3g V, want ≤ %.3g V", e, 5e-3*I*R)
	}
	// Negative polarity mirrors the response [calc: linearity].
	s.SetStimulus(step(waveforms.Current, I, 0, 6*tau), -1)
	neg, err := s.Transient(&Settings{Record: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(neg.Time) != len(res.Time) || neg.V[n][len(neg.Time)-1] != -res.V[n][len(res.Time)-1] {
		t.Errorf("negative polarity does not mirror the positive run")
	}
}

// seriesRLC is a step V behind R into L then C to gnd; it returns the
// capacitor voltage and the loop current over time.
func seriesRLC(t *testing.T, V, R, L, C, stop float64) (*struck, *Result) {
	s := compile(t,
		el(testSourceKind, "src", "in", "gnd", 0),
		el("inductor", "L1", "in", "m", L),
		el("capacitor", "C1", "m", "gnd", C))
	s.SetStimulus(step(waveforms.Thevenin, V, R, stop), 1)
	res, err := s.Transient(&Settings{Record: true, MaxStep: stop / 400})
	if err != nil {
		t.Fatal(err)
	}
	return s, res
}

// [calc] Series RLC step response, underdamped (R < 2√(L/C)):
// α = R/2L, ω0 = 1/√(LC), ωd = √(ω0² − α²),
// v_C(t) = V·[1 − e^{−αt}(cos ωd t + (α/ωd) sin ωd t)].
func TestSeriesRLCUnderdamped(t *testing.T) {
	const V, R, L, C = 1.0, 2.0, 10e-9, 1e-9
	a := R / (2 * L)
	w0 := 1 / math.Sqrt(L*C)
	wd := math.Sqrt(w0*w0 - a*a)
	stop := 8 * 2 * math.Pi / wd
	s, res := seriesRLC(t, V, R, L, C, stop)
	m := nodeIndex(t, s, "m")
	want := func(t float64) float64 {
		return V * (1 - math.Exp(-a*t)*(math.Cos(wd*t)+a/wd*math.Sin(wd*t)))
	}
	if e := maxErr(res.Time, res.V[m], want); e > 1e-2*V {
		t.Errorf("underdamped RLC: max error %.3g V, want ≤ %.3g V", e, 1e-2*V)
	}
	// Ringing frequency and decay rate from the simulated peaks of v_C − V:
	// successive maxima are 2π/ωd apart and shrink by e^{−α·2π/ωd}.
	var tp, vp []float64
	v := res.V[m]
	for k := 1; k+1 < len(v); k++ {
		if v[k] > v[k-1] && v[k] >= v[k+1] && v[k] > V {
			tp, vp = append(tp, res.Time[k]), append(vp, v[k]-V)
		}
	}
	if len(tp) < 4 {
		t.Fatalf("found %d ringing peaks, want ≥ 4", len(tp))
	}
	period := (tp[3] - tp[0]) / 3
	if d := math.Abs(period*wd/(2*math.Pi) - 1); d > 5e-3 {
		t.Errorf("ringing period %.4g s, want %.4g s (off by %.2g)", period, 2*math.Pi/wd, d)
	}
	decay := math.Log(vp[0]/vp[3]) / (tp[3] - tp[0])
	if d := math.Abs(decay/a - 1); d > 2e-2 {
		t.Errorf("decay rate %.4g 1/s, want α = %.4g 1/s (off by %.2g)", decay, a, d)
	}
}

// [calc] Series RLC step response, overdamped (R > 2√(L/C)):
// s1,2 = −α ± √(α² − ω0²), v_C(t) = V·[1 − (s2·e^{s1 t} − s1·e^{s2 t})/(s2 − s1)].
func TestSeriesRLCOverdamped(t *testing.T) {
	const V, R, L, C = 1.0, 50.0, 10e-9, 1e-9
	a := R / (2 * L)
	w0 := 1 / math.Sqrt(L*C)
	r := math.Sqrt(a*a - w0*w0)
	s1, s2 := -a+r, -a-r
	stop := 8 / -s1
	s, res := seriesRLC(t, V, R, L, C, stop)
	m := nodeIndex(t, s, "m")
	want := func(t float64) float64 {
		return V * (1 - (s2*math.Exp(s1*t)-s1*math.Exp(s2*t))/(s2-s1))
	}
	if e := maxErr(res.Time, res.V[m], want); e > 5e-3*V {
		t.Errorf("overdamped RLC: max error %.3g V, want ≤ %.3g V", e, 5e-3*V)
	}
}

// [calc] A current step I into a lossless parallel LC tank:
// v(t) = I·√(L/C)·sin(t/√(LC)). The trapezoidal rule conserves the energy of
// a lossless oscillator (it maps the imaginary axis onto the unit circle), so
// the amplitude holds over many cycles; only the phase drifts.
func TestLCResonanceAmplitude(t *testing.T) {
	const I, L, C = 1e-3, 100e-9, 1e-9
	w := 1 / math.Sqrt(L*C)
	z0 := math.Sqrt(L / C)
	T := 2 * math.Pi / w
	cycles := 20.0
	s := compile(t,
		el(testSourceKind, "src", "n", "gnd", 0),
		el("inductor", "L1", "n", "gnd", L),
		el("capacitor", "C1", "n", "gnd", C))
	s.SetStimulus(step(waveforms.Current, I, 0, cycles*T), 1)
	res, err := s.Transient(&Settings{Record: true, MaxStep: T / 50})
	if err != nil {
		t.Fatal(err)
	}
	n := nodeIndex(t, s, "n")
	v := res.V[n]
	var up []float64 // upward zero crossings, interpolated
	first, last := 0.0, 0.0
	for k := 1; k < len(v); k++ {
		if v[k-1] < 0 && v[k] >= 0 {
			tc := res.Time[k-1] + (res.Time[k]-res.Time[k-1])*(-v[k-1])/(v[k]-v[k-1])
			up = append(up, tc)
		}
		if res.Time[k] < 2*T {
			first = math.Max(first, math.Abs(v[k]))
		}
		if res.Time[k] > (cycles-2)*T {
			last = math.Max(last, math.Abs(v[k]))
		}
	}
	if len(up) < int(cycles)-2 {
		t.Fatalf("%d zero crossings, want ≥ %d", len(up), int(cycles)-2)
	}
	period := (up[len(up)-1] - up[0]) / float64(len(up)-1)
	if d := math.Abs(period/T - 1); d > 2e-3 {
		t.Errorf("LC period %.5g s, want 2π√(LC) = %.5g s (off by %.2g)", period, T, d)
	}
	// Sampled peaks understate the amplitude by up to 1 − cos(ω·h/2).
	for _, a := range []float64{first, last} {
		if d := math.Abs(a/(I*z0) - 1); d > 1e-2 {
			t.Errorf("LC amplitude %.5g V, want I·√(L/C) = %.5g V", a, I*z0)
		}
	}
	if d := math.Abs(last/first - 1); d > 5e-3 {
		t.Errorf("amplitude changed by %.2g over %g cycles", d, cycles)
	}
}

// sineRC is the exact response of R ∥ C to a current I·sin(ωt) from rest [calc:
// particular plus homogeneous solution of C·v' + v/R = I·sin ωt, v(0) = 0]:
// v = I·R/(1+(ωτ)²)·[sin ωt − ωτ·cos ωt + ωτ·e^{−t/τ}].
func sineRC(I, R, C, w float64) func(float64) float64 {
	tau := R * C
	wt := w * tau
	return func(t float64) float64 {
		return I * R / (1 + wt*wt) * (math.Sin(w*t) - wt*math.Cos(w*t) + wt*math.Exp(-t/tau))
	}
}

const sineI, sineR, sineC = 1e-3, 1e3, 1e-9

// sineRCProblem is R ∥ C driven by I·sin(ωt) with ω = 2π/(2RC) over 4RC:
// the compiled system, the exact node voltage, the node's index, the span.
func sineRCProblem(t *testing.T) (*struck, func(float64) float64, int, float64) {
	w := 2 * math.Pi / (2 * sineR * sineC)
	stop := 4 * sineR * sineC
	s := compile(t,
		el(testSourceKind, "src", "n", "gnd", 0),
		el("resistor", "R1", "n", "gnd", sineR),
		el("capacitor", "C1", "n", "gnd", sineC))
	s.SetStimulus(sine(waveforms.Current, sineI, w, 0, stop), 1)
	return s, sineRC(sineI, sineR, sineC, w), nodeIndex(t, s, "n"), stop
}

// [pub: circuit-simulation textbooks] The trapezoidal rule is second order:
// halving a fixed step quarters the global error on a smooth problem.
func TestTrapezoidalSecondOrder(t *testing.T) {
	s, want, n, stop := sineRCProblem(t)
	var errs []float64
	for _, h := range []float64{stop / 100, stop / 200, stop / 400} {
		res, err := s.Transient(&Settings{Record: true, FixedStep: h, RelTol: 1e-9, AbsTol: 1e-12})
		if err != nil {
			t.Fatal(err)
		}
		errs = append(errs, maxErr(res.Time, res.V[n], want))
	}
	t.Logf("fixed-step errors: %.3g", errs)
	for k := 1; k < len(errs); k++ {
		if r := errs[k-1] / errs[k]; r < 3.5 || r > 4.5 {
			t.Errorf("error ratio on halving the step: %.3g (errors %.3g, %.3g), want ≈ 4", r, errs[k-1], errs[k])
		}
	}
}

// extremeOf is the largest value of sign·f over [t0, t1]: a scan of 20 000
// points, then golden-section refinement between the best point's
// neighbours.
func extremeOf(f func(float64) float64, t0, t1, sign float64) float64 {
	const n = 20000
	best, bt := math.Inf(-1), t0
	for k := 0; k <= n; k++ {
		t := t0 + (t1-t0)*float64(k)/n
		if v := sign * f(t); v > best {
			best, bt = v, t
		}
	}
	lo, hi := math.Max(t0, bt-(t1-t0)/n), math.Min(t1, bt+(t1-t0)/n)
	g := (math.Sqrt(5) - 1) / 2
	for range 100 {
		a, b := hi-g*(hi-lo), lo+g*(hi-lo)
		if sign*f(a) > sign*f(b) {
			hi = b
		} else {
			lo = a
		}
	}
	return sign * math.Max(best, sign*f((lo+hi)/2))
}

// The adaptive run meets its accuracy against the exact answer (same
// problem as above) on what Accuracy is about: the highest and lowest value
// of the node, refined between points as a report refines them
// (waveforms.Tracker), within Accuracy of the exact ones [calc: scanned and
// refined on the exact solution], at the default and at a tenth of it, and
// the tighter run at least five times closer (about ten is the design), so
// that the difference between the two runs is the first run's error to
// within a quarter: what makes a run repeated at Accuracy/10 an error bar.
func TestAdaptiveMeetsAccuracy(t *testing.T) {
	s, want, n, stop := sineRCProblem(t)
	hi, lo := extremeOf(want, 0, stop, 1), extremeOf(want, 0, stop, -1)
	var errs []float64
	for _, acc := range []float64{DefaultAccuracy, DefaultAccuracy / 10} {
		tr := waveforms.Tracker{Refine: true}
		obs := func(p *Point) {
			tr.Add(p.T, p.V[n])
			if p.Corner {
				tr.Corner()
			}
		}
		res, err := s.Transient(&Settings{Accuracy: acc, Stop: stop, Observe: obs})
		if err != nil {
			t.Fatal(err)
		}
		gh, _ := tr.Max()
		gl, _ := tr.Min()
		e := math.Max(math.Abs(gh-hi)/math.Abs(hi), math.Abs(gl-lo)/math.Abs(lo))
		t.Logf("accuracy %g: %d steps, highest %.7g V (exact %.7g V), lowest %.7g V (exact %.7g V): %.3g", acc, res.Stats.Steps, gh, hi, gl, lo, e)
		if e > acc {
			t.Errorf("accuracy %g: extremes off by %.3g of themselves", acc, e)
		}
		errs = append(errs, e)
	}
	if errs[1] > errs[0]/5 {
		t.Errorf("a tenfold tighter accuracy left an error of %.3g against %.3g: want at most a fifth", errs[1], errs[0])
	}
}

// [calc] Energy ledger of a current step into R ∥ C, τ = RC, v = I·R(1 − e^{−t/τ}):
// capacitor ½·C·v(T)²; resistor ∫v²/R dt = I²R[T − 2τ(1−e^{−T/τ}) + (τ/2)(1−e^{−2T/τ})];
// source −∫v·I dt = −I²R[T − τ(1−e^{−T/τ})].
func TestEnergyLedgerRC(t *testing.T) {
	const I, R, C = 1.0, 10.0, 1e-9
	tau := R * C
	T := 5 * tau
	s := compile(t,
		el(testSourceKind, "src", "n", "gnd", 0),
		el("resistor", "R1", "n", "gnd", R),
		el("capacitor", "C1", "n", "gnd", C))
	s.SetStimulus(step(waveforms.Current, I, 0, T), 1)
	res, err := s.Transient(nil)
	if err != nil {
		t.Fatal(err)
	}
	eT := math.Exp(-T / tau)
	vT := I * R * (1 - eT)
	want := map[string]float64{
		"C1":  0.5 * C * vT * vT,
		"R1":  I * I * R * (T - 2*tau*(1-eT) + tau/2*(1-eT*eT)),
		"src": -I * I * R * (T - tau*(1-eT)),
	}
	for name, w := range want {
		got := res.Energy[elemIndex(t, s, name)]
		if d := math.Abs(got/w - 1); d > 5e-3 {
			t.Errorf("energy of %s: %.6g J, want %.6g J (off by %.2g)", name, got, w, d)
		}
	}
	if b := math.Abs(res.Balance / want["src"]); b > 1e-3 {
		t.Errorf("balance %.3g J is %.2g of the source energy, want < 0.1 %%", res.Balance, b)
	}
	if p := res.PeakCurrent[elemIndex(t, s, "src")]; math.Abs(p-I) > 1e-12 {
		t.Errorf("peak source current %g A, want %g A", p, I)
	}
}

// [calc] Energy ledger of the series RLC step response: at the end the
// inductor holds ½·L·i², the capacitor ½·C·v², and the external resistor has
// dissipated R·∫i² dt with i = C·dv_C/dt from the closed form (integrated
// here by composite Simpson on a fine grid).
func TestEnergyLedgerRLC(t *testing.T) {
	const V, Rs, R, L, C = 1.0, 1.0, 3.0, 10e-9, 1e-9
	Rt := Rs + R
	a := Rt / (2 * L)
	w0 := 1 / math.Sqrt(L*C)
	wd := math.Sqrt(w0*w0 - a*a)
	T := 0.8 * 2 * math.Pi / wd // the inductor still holds energy
	s := compile(t,
		el(testSourceKind, "src", "in", "gnd", 0),
		el("resistor", "R1", "in", "x", R),
		el("inductor", "L1", "x", "m", L),
		el("capacitor", "C1", "m", "gnd", C))
	s.SetStimulus(step(waveforms.Thevenin, V, Rs, T), 1)
	res, err := s.Transient(&Settings{MaxStep: T / 200})
	if err != nil {
		t.Fatal(err)
	}
	vC := func(t float64) float64 {
		return V * (1 - math.Exp(-a*t)*(math.Cos(wd*t)+a/wd*math.Sin(wd*t)))
	}
	// dv_C/dt = V·(ω0²/ωd)·e^{−αt}·sin ωd t.
	iL := func(t float64) float64 { return C * V * w0 * w0 / wd * math.Exp(-a*t) * math.Sin(wd*t) }
	const n = 20000
	hq := T / n
	sum := 0.0
	for k := 0; k <= n; k++ {
		wk := 2.0
		if k == 0 || k == n {
			wk = 1
		} else if k%2 == 1 {
			wk = 4
		}
		i := iL(float64(k) * hq)
		sum += wk * i * i
	}
	eR := R * sum * hq / 3
	want := map[string]float64{
		"C1": 0.5 * C * vC(T) * vC(T),
		"L1": 0.5 * L * iL(T) * iL(T),
		"R1": eR,
	}
	// The ledger is second order in the step: within 1 % of each entry
	// plus 0.3 % of the capacitor's final energy at T/200 [practice].
	for name, w := range want {
		got := res.Energy[elemIndex(t, s, name)]
		if d := math.Abs(got - w); d > 1e-2*math.Abs(w)+3e-3*0.5*C*V*V {
			t.Errorf("energy of %s: %.6g J, want %.6g J", name, got, w)
		}
	}
	src := res.Energy[elemIndex(t, s, "src")]
	if b := math.Abs(res.Balance / src); b > 1e-3 {
		t.Errorf("balance %.3g J is %.2g of the source energy, want < 0.1 %%", res.Balance, b)
	}
}

// Two runs of one system, and a run of a fresh system, give identical
// results bit for bit.
func TestReproducible(t *testing.T) {
	build := func() *struck {
		s := compile(t,
			el(testSourceKind, "src", "in", "gnd", 0),
			el("inductor", "L1", "in", "m", 10e-9, "r", 0.5),
			el("capacitor", "C1", "m", "gnd", 1e-9, "esr", 0.1, "esl", 1e-9),
			el("resistor", "R1", "m", "gnd", 100.0))
		s.SetStimulus(step(waveforms.Thevenin, 3, 2, 100e-9), 1)
		return s
	}
	s := build()
	a, err := s.Transient(&Settings{Record: true})
	if err != nil {
		t.Fatal(err)
	}
	b, err := s.Transient(&Settings{Record: true})
	if err != nil {
		t.Fatal(err)
	}
	c, err := build().Transient(&Settings{Record: true})
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range []*Result{b, c} {
		if len(r.Time) != len(a.Time) || r.Stats.Steps != a.Stats.Steps || r.Balance != a.Balance {
			t.Fatalf("runs differ: %d vs %d points", len(r.Time), len(a.Time))
		}
		for i := range a.V {
			for k := range a.V[i] {
				if a.V[i][k] != r.V[i][k] {
					t.Fatalf("node %d differs at point %d", i, k)
				}
			}
		}
		for i := range a.Energy {
			if a.Energy[i] != r.Energy[i] {
				t.Fatalf("energy of element %d differs", i)
			}
		}
	}
}

// With Observe and without Record, the allocations of a run do not depend
// on its length.
func TestAllocationsIndependentOfSteps(t *testing.T) {
	s := compile(t,
		el(testSourceKind, "src", "in", "gnd", 0),
		el("inductor", "L1", "in", "m", 10e-9, "r", 0.5),
		el("capacitor", "C1", "m", "gnd", 1e-9, "esr", 0.1, "esl", 1e-9),
		el("supply", "V1", "p", "gnd", 3.0),
		el("resistor", "R2", "p", "m", 50.0))
	s.SetStimulus(sine(waveforms.Thevenin, 3, 2*math.Pi/20e-9, 2, 0), 1)
	peak := 0.0
	obs := func(p *Point) { peak = math.Max(peak, p.V[0]) }
	var steps [2]int
	var allocs [2]float64
	for i, stop := range []float64{50e-9, 1000e-9} {
		set := &Settings{Stop: stop, Observe: obs}
		allocs[i] = testing.AllocsPerRun(5, func() {
			r, err := s.Transient(set)
			if err != nil {
				t.Fatal(err)
			}
			steps[i] = r.Stats.Steps
		})
	}
	if steps[1] < 5*steps[0] {
		t.Fatalf("the long run took %d steps against %d: not a test of step count", steps[1], steps[0])
	}
	t.Logf("allocations per run: %v (%d steps), %v (%d steps)", allocs[0], steps[0], allocs[1], steps[1])
	if allocs[0] != allocs[1] {
		t.Errorf("allocations per run: %v for %d steps, %v for %d steps", allocs[0], steps[0], allocs[1], steps[1])
	}
}

// [calc] Divider: a 10 V supply with r = 1 kΩ into 4 kΩ gives 8 V; an ideal
// supply gives its value; an inductor is a short and a capacitor open at DC.
func TestOperatingPoint(t *testing.T) {
	s := compile(t,
		el("supply", "V1", "a", "gnd", 10.0, "r", 1e3),
		el("inductor", "L1", "a", "b", 1e-6, "r", 1e3),
		el("resistor", "R1", "b", "gnd", 3e3),
		el("capacitor", "C1", "b", "gnd", 1e-9, "esr", 1.0, "esl", 1e-9),
		el("supply", "V2", "c", "gnd", -2.5),
		el("resistor", "R2", "c", "gnd", 7.0))
	v, err := s.OperatingPoint(nil)
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]float64{"a": 10 * 4e3 / 5e3, "b": 10 * 3e3 / 5e3, "c": -2.5}
	for name, w := range want {
		if got := v[nodeIndex(t, s, name)]; math.Abs(got-w) > 1e-6*math.Abs(w) {
			t.Errorf("v(%s) = %.9g V, want %.9g V", name, got, w)
		}
	}
	if got := s.Nodes(); len(got) != 3 || got[0] != "a" || got[1] != "b" || got[2] != "c" {
		t.Errorf("nodes %v, want [a b c] in order of appearance", got)
	}
	if got := s.Elements(); len(got) != 6 || got[3] != "C1" {
		t.Errorf("elements %v, want deck order", got)
	}
}

// A node reached only through a capacitor is tied to gnd by Gmin and
// solves to 0 V; a transient through it still works.
func TestFloatingNodeThroughGmin(t *testing.T) {
	s := compile(t,
		el("supply", "V1", "a", "gnd", 5.0),
		el("capacitor", "C1", "a", "f", 1e-9),
		el("resistor", "R1", "f", "g", 1e3),
		el("capacitor", "C2", "g", "gnd", 1e-9))
	v, err := s.OperatingPoint(nil)
	if err != nil {
		t.Fatal(err)
	}
	if f := v[nodeIndex(t, s, "f")]; math.Abs(f) > 1e-9 {
		t.Errorf("floating node at %g V, want 0", f)
	}
}

// A loop of ideal supplies fixes no current: the error names the branch and
// says what to do.
func TestSupplyLoopIsNamed(t *testing.T) {
	s := compile(t,
		el("supply", "V1", "a", "gnd", 5.0),
		el("supply", "V2", "a", "gnd", 5.0),
		el("resistor", "R1", "a", "gnd", 1e3))
	_, err := s.OperatingPoint(nil)
	var se *SolveError
	if !errors.As(err, &se) {
		t.Fatalf("got %v, want a *SolveError", err)
	}
	if se.Where != "branch V2.i" || se.Hint == "" || se.Time >= 0 {
		t.Errorf("error %q: want it at the operating point near branch V2.i, with a hint", se)
	}
	// Two inductors in parallel are a loop of shorts at DC.
	s = compile(t,
		el("supply", "V1", "a", "gnd", 5.0, "r", 10.0),
		el("inductor", "L1", "a", "gnd", 1e-9),
		el("inductor", "L2", "a", "gnd", 1e-9))
	_, err = s.OperatingPoint(nil)
	if !errors.As(err, &se) || se.Where != "branch L2.i" || !strings.Contains(se.Hint, "loop") {
		t.Errorf("inductor loop: got %v, want a *SolveError near branch L2.i naming the loop", err)
	}
}

// Values the models cannot use never reach Compile: an element's value set
// refuses them by its kind's rules. An element without a node is an error
// from Compile, not a silent ground.
func TestCompileErrors(t *testing.T) {
	for _, c := range []struct {
		kind, key string
		v         float64
	}{{"resistor", "value", -1}, {"capacitor", "esr", -1}, {"inductor", "value", math.Inf(1)}, {"supply", "value", math.NaN()}} {
		v := devices.Lookup(c.kind).Values()
		if err := v.Set(c.key, c.v); err == nil {
			t.Errorf("%s %s = %g accepted", c.kind, c.key, c.v)
		}
	}
	_, err := Compile(&netlist.Circuit{Elements: []*netlist.Element{
		el("resistor", "R2", "a", "", 1),
	}})
	if err == nil || !strings.Contains(err.Error(), "R2") {
		t.Errorf("got %v, want an error naming R2", err)
	}
}

// A transient that cannot keep its step above MinStep stops with a
// *SolveError that carries the time and what to try.
func TestTransientErrorIsNamed(t *testing.T) {
	s := compile(t,
		el(testSourceKind, "src", "n", "gnd", 0),
		el("resistor", "R1", "n", "gnd", 1e3),
		el("capacitor", "C1", "n", "gnd", 1e-9))
	s.SetStimulus(step(waveforms.Current, 1e-3, 0, 1e-6), 1)
	_, err := s.Transient(&Settings{MinStep: 1e-7})
	var se *SolveError
	if !errors.As(err, &se) {
		t.Fatalf("got %v, want a *SolveError", err)
	}
	if se.Time < 0 || se.Where == "" || !strings.Contains(se.Hint, "maxstep") {
		t.Errorf("error %q: want a time, a place and a hint about maxstep", se)
	}
	// Without a stimulus or a stop time there is no span to solve.
	s.SetStimulus(nil, 1)
	if _, err := s.Transient(nil); err == nil {
		t.Error("no error without a stop time")
	}
}

// When the error control cannot meet its tolerance above MinStep, the error
// names the element whose charge or flux it could not follow.
func TestTruncationErrorIsNamed(t *testing.T) {
	s := compile(t,
		el(testSourceKind, "src", "n", "gnd", 0),
		el("resistor", "R1", "n", "gnd", 1.0),
		el("capacitor", "C1", "n", "gnd", 1e-9))
	s.SetStimulus(step(waveforms.Current, 1, 0, 1e-6), 1)
	_, err := s.Transient(&Settings{MinStep: 15e-12, RelTol: 1e-6, ChargeTol: 1e-20})
	var se *SolveError
	if !errors.As(err, &se) {
		t.Fatalf("got %v, want a *SolveError", err)
	}
	if se.Where != "element C1" || !strings.Contains(se.Reason, "truncation") || !strings.Contains(se.Hint, "C1") {
		t.Errorf("error %q: want the truncation error of element C1", se)
	}
}
