package fit

import (
	"math"
	"strings"
	"testing"

	"zapnet/mna"
	"zapnet/netlist"
)

// An invented uni clamp with a soft knee, as TVS clamps have (it leaks
// about 50 nA at 5 V).
var testClamp = ClampParams{Vbr: 6.6, It: 1e-3, Nbr: 6, Is: 1e-12, N: 1.3, Rdyn: 0.35, Vj: 0.7}

// tlpRows samples the clamp's static curve at the currents, with 1 %
// uniform noise on each voltage and current.
func tlpRows(p ClampParams, currents []float64, seed rng) []Datum {
	var out []Datum
	for _, i := range currents {
		v := p.V(i)
		out = append(out, Datum{Kind: TLPRow, V: v * (1 + 0.01*seed.uniform()), I: i * (1 + 0.01*seed.uniform())})
	}
	return out
}

func TestClampStaticCurveThroughEngine(t *testing.T) {
	// ClampParams.V against the engine's operating point of the same part
	// behind a supply and 1 Ω: the supply's current must produce the
	// voltage V gives [calc: KCL with MODELS.md's clamp], uni and bi,
	// breakdown and forward.
	for _, bi := range []bool{false, true} {
		p := testClamp
		p.Bi = bi
		for _, vs := range []float64{-20, -3, -0.9, 6.5, 7, 9, 20, 45} {
			deck := "strike S s gnd waveform=tlp level=1\nsupply V1 s gnd " + FormatValue(vs, "V") + " r=1ohm\n" + p.Part("x").Element("D1", "s", "gnd") + "\n"
			c, err := netlist.Parse("t", []byte(deck))
			if err != nil {
				t.Fatal(err)
			}
			sys, err := mna.Compile(c)
			if err != nil {
				t.Fatal(err)
			}
			x, err := sys.OperatingPoint(&mna.Settings{RelTol: 1e-12, AbsTol: 1e-13, Gmin: 1e-20})
			if err != nil {
				t.Fatal(err)
			}
			v := x[0]
			i := vs - v
			if math.Abs(i) < 1e-6 {
				continue
			}
			if want := p.V(i); math.Abs(v-want) > 1e-9*math.Abs(want) {
				t.Errorf("bi=%v, %g V supply: clamp at %.10g V, %.6g A; V(i) = %.10g V", bi, vs, v, i, want)
			}
		}
	}
}

func TestClampRoundTripTLP(t *testing.T) {
	// Invented clamp → a TLP curve (18 positive rows, 0.1 mA–30 A, 8
	// negative, −1 mA to −20 A) with 1 % noise on every V and I → fit →
	// parameters back within 2 % and every point within 3 % [practice: the
	// work item's round-trip criterion]. The junction's shape parameters
	// are the exception any fit of such data shares: 1 % of 0.7 V is 7 mV,
	// a quarter of n·Vt, so is is known to tens of per cent, and 1 % of
	// 7 V against the knee's 0.6 V leaves nbr to several [calc]. They are
	// checked through the voltages they give and against the standard
	// errors the fit reports.
	var cur []float64
	cur = append(cur, logspace(1e-4, 30, 18)...)
	for _, i := range logspace(1e-3, 20, 8) {
		cur = append(cur, -i)
	}
	fit, err := FitClamp(tlpRows(testClamp, cur, 3), &ClampOptions{Polarity: "uni"})
	if err != nil {
		t.Fatal(err)
	}
	p := fit.Params
	within(t, "vbr", p.Vbr, testClamp.Vbr, 0.02)
	within(t, "rdyn", p.Rdyn, testClamp.Rdyn, 0.02)
	for _, i := range []float64{-1e-3, -0.1, -20, 1e-4, 1e-2} {
		within(t, "voltage", p.V(i), testClamp.V(i), 0.02)
	}
	withinSigma(t, fit.Sigma, "nbr", p.Nbr, testClamp.Nbr)
	withinSigma(t, fit.Sigma, "is", p.Is, testClamp.Is)
	withinSigma(t, fit.Sigma, "n", p.N, testClamp.N)
	worstPoint(t, fit, 0.03)
}

// withinSigma checks a parameter that 1 % noise leaves loosely determined
// against the standard error the fit reports for it: within 4 of them
// [calc: the reported errors were checked on 24 noise draws, where the
// errors measured in them spread as a unit normal does, the largest 3.2].
func withinSigma(t *testing.T, sigma map[string]float64, name string, got, want float64) {
	t.Helper()
	s := sigma[name]
	if !(s > 0) {
		t.Errorf("%s: no standard error reported", name)
		return
	}
	if e := math.Abs(math.Log(got / want)); e > 4*s {
		t.Errorf("%s = %g, the part's %g: off by %.3g in log, beyond 4 standard errors (%.3g)", name, got, want, e, s)
	}
}

func TestClampRoundTripBi(t *testing.T) {
	p := testClamp
	p.Bi = true
	var cur []float64
	for _, i := range logspace(1e-4, 30, 14) {
		cur = append(cur, i, -i)
	}
	fit, err := FitClamp(tlpRows(p, cur, 8), nil)
	if err != nil {
		t.Fatal(err)
	}
	if !fit.Params.Bi {
		t.Fatalf("mirrored rows not read as bi; notes %v", fit.Notes)
	}
	within(t, "vbr", fit.Params.Vbr, p.Vbr, 0.02)
	within(t, "rdyn", fit.Params.Rdyn, p.Rdyn, 0.02)
	withinSigma(t, fit.Sigma, "nbr", fit.Params.Nbr, p.Nbr)
	worstPoint(t, fit, 0.03)
}

// datasheetOf invents a datasheet for a clamp: its breakdown at 1 mA, its
// leakage at a 5 V stand-off voltage, clamping voltages simulated through
// the engine for 8/20 pulses of 1 and 5 A and a 16 A TLP, each with noise
// of up to 1 %.
func datasheetOf(t *testing.T, p ClampParams, seed rng) []Datum {
	t.Helper()
	noise := func(v float64) float64 { return v * (1 + 0.01*seed.uniform()) }
	vrwm := 5.0
	ir := bisect(func(i float64) float64 { return p.V(i) - vrwm }, 1e-12, 1e-3)
	data := []Datum{
		{Kind: Breakdown, V: noise(p.V(1e-3)), I: 1e-3},
		{Kind: Leakage, V: vrwm, I: noise(ir)},
	}
	for _, c := range []struct {
		pulse Pulse
		i     float64
	}{{Surge8x20, 1}, {Surge8x20, 5}, {TLPPulse, 16}} {
		d := Datum{Kind: Clamping, I: c.i, Pulse: c.pulse}
		v, err := simulatePoint(RunDeck, p.Part("x"), d, p.V)
		if err != nil {
			t.Fatal(err)
		}
		d.V = noise(v)
		data = append(data, d)
	}
	return data
}

// bisect finds x in [lo, hi] (log scale) where f changes sign, f rising.
func bisect(f func(float64) float64, lo, hi float64) float64 {
	for range 200 {
		mid := math.Sqrt(lo * hi)
		if f(mid) < 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	return math.Sqrt(lo * hi)
}

func TestClampRoundTripDatasheet(t *testing.T) {
	// Invented clamp → datasheet points (vbr@1mA, ir@5V, vc@1A and vc@5A
	// 8/20, vc@16A TLP, the clamping voltages solved through the engine,
	// with lead inductance) → fit, simulating the pulses again → vbr, rdyn
	// back within 2 %, nbr within its standard errors, every point within
	// 3 %.
	p := testClamp
	p.Ls = 0.8e-9
	data := datasheetOf(t, p, 5)
	fit, err := FitClamp(data, &ClampOptions{Ls: p.Ls})
	if err != nil {
		t.Fatal(err)
	}
	within(t, "vbr", fit.Params.Vbr, p.Vbr, 0.02)
	within(t, "rdyn", fit.Params.Rdyn, p.Rdyn, 0.02)
	within(t, "nbr", fit.Params.Nbr, p.Nbr, 0.02)
	worstPoint(t, fit, 0.03)
	if fit.Shots == 0 {
		t.Error("no pulse was simulated")
	}
	if len(fit.Notes) != 0 {
		t.Errorf("consistent data drew notes: %v", fit.Notes)
	}
}

func TestClampConflictTLPAndSurge(t *testing.T) {
	// A TLP curve and an 8/20 clamping voltage 12 % above it at 5 A (the
	// self-heating of a microsecond surge [practice]): the fit says so and
	// keeps the TLP curve; asked to, it keeps the surge point instead.
	rows := tlpRows(testClamp, logspace(1e-3, 30, 12), 4)
	surge := Datum{Kind: Clamping, Pulse: Surge8x20, I: 5, V: 1.12 * testClamp.V(5), Where: "ds:3:1"}
	data := append(append([]Datum(nil), rows...), Datum{Kind: Breakdown, V: testClamp.V(1e-3), I: 1e-3}, surge)
	fit, err := FitClamp(data, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(fit.Notes) != 1 || !strings.Contains(fit.Notes[0], "ds:3:1: the 8/20 clamping voltage") || !strings.Contains(fit.Notes[0], "honours the TLP points") {
		t.Fatalf("notes %q", fit.Notes)
	}
	last := fit.Points[len(fit.Points)-1]
	if last.Used || math.Abs(last.Residual+0.107) > 0.02 {
		t.Errorf("the surge point: used %v, residual %.3f (the model sits about 11 %% below it)", last.Used, last.Residual)
	}
	within(t, "vbr", fit.Params.Vbr, testClamp.Vbr, 0.02)
	within(t, "rdyn", fit.Params.Rdyn, testClamp.Rdyn, 0.02)

	fit, err = FitClamp(data, &ClampOptions{Honour: HonourSurge})
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(fit.Notes[0], "honours the surge points") {
		t.Errorf("notes %q", fit.Notes)
	}
	for _, p := range fit.Points[:len(rows)] {
		if p.Used {
			t.Fatal("a TLP row was fitted although the surge point was to win")
		}
	}
	// Without the breakdown point the surge point alone cannot make a
	// clamp: the fit says so rather than guessing.
	_, err = FitClamp(append(append([]Datum(nil), rows...), surge), &ClampOptions{Honour: HonourSurge})
	if err == nil || !strings.Contains(err.Error(), "1 points for 2 parameters") || !strings.Contains(err.Error(), "set aside") {
		t.Errorf("surge point alone: %v", err)
	}
	if r := fit.Points[len(fit.Points)-1].Residual; math.Abs(r) > 1e-6 {
		t.Errorf("the honoured surge point misses by %.3g", r)
	}
}

func TestClampCapacitance(t *testing.T) {
	// C(v) = cj·(1 + |v|/vj)^(−m) [MODELS.md] sampled at four biases gives
	// cj and m back exactly (no noise) [calc].
	want := ClampParams{Cj: 40e-12, M: 0.33, Vj: 0.7}
	data := tlpRows(testClamp, logspace(1e-3, 10, 6), 1)
	for _, v := range []float64{0, 1, 2.5, 5} {
		data = append(data, Datum{Kind: Capacitance, V: v, C: want.C(v)})
	}
	fit, err := FitClamp(data, nil)
	if err != nil {
		t.Fatal(err)
	}
	within(t, "cj", fit.Params.Cj, 40e-12, 1e-9)
	within(t, "m", fit.Params.M, 0.33, 1e-9)
	part := fit.Params.Part("tvs").Line()
	for _, w := range []string{"cj=40pF", "m=0.33"} {
		if !strings.Contains(part, w) {
			t.Errorf("part line %q lacks %s", part, w)
		}
	}
}

func TestClampTooFewPoints(t *testing.T) {
	_, err := FitClamp([]Datum{{Kind: Capacitance, V: 0, C: 1e-12}}, nil)
	if err == nil || !strings.Contains(err.Error(), "no point in breakdown") {
		t.Errorf("%v", err)
	}
}

func within(t *testing.T, name string, got, want, rel float64) {
	t.Helper()
	if math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s = %.6g, want %.6g within %g %% (off %.3g %%)", name, got, want, 100*rel, 100*(got/want-1))
	}
}

func worstPoint(t *testing.T, fit *ClampFit, limit float64) {
	t.Helper()
	worst := 0.0
	for _, p := range fit.Points {
		if p.Used {
			worst = math.Max(worst, math.Abs(p.Residual))
		}
	}
	if worst > limit {
		t.Errorf("worst point %.2f %%, want within %g %%", 100*worst, 100*limit)
	}
}
