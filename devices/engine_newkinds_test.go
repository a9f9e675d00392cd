package devices_test

// The snapback clamp and the table path solved through the engine. They are
// not kinds of the deck language yet, so this test registers them under
// names of its own and builds the circuits element by element.

import (
	"fmt"
	"math"
	"os"
	"strings"
	"testing"

	"zapnet/devices"
	"zapnet/mna"
	"zapnet/netlist"
	"zapnet/netlist/datafile"
	"zapnet/waveforms"
)

const (
	snapKind  netlist.Kind = "snapback-under-test"
	tableKind netlist.Kind = "table-under-test"
)

// testTables holds the tables the table kind's elements name by Str["table"].
var testTables = map[string]devices.TableSpec{}

func init() {
	devices.Register(snapKind, func(e *netlist.Element) (devices.Device, error) {
		n := e.Num
		return devices.NewSnapback(devices.SnapbackSpec{Name: e.Name, Nodes: e.Nodes,
			Vt1: n["vt1"], It1: n["it1"], Vh: n["vh"], Ih: n["ih"], Ron: n["ron"], Nbr: n["nbr"],
			Bi: e.Str["polarity"] == "bi", Cj: n["cj"], Ls: n["ls"], Ton: n["ton"]})
	})
	devices.Register(tableKind, func(e *netlist.Element) (devices.Device, error) {
		s := testTables[e.Str["table"]]
		s.Name, s.Nodes = e.Name, e.Nodes
		return devices.NewTablePath(s)
	})
}

func elem(kind netlist.Kind, name, a, b string, value float64, kv ...any) *netlist.Element {
	e := &netlist.Element{Kind: kind, Name: name, Nodes: [2]string{a, b},
		Num: map[string]float64{"value": value}, Str: map[string]string{}}
	for i := 0; i+1 < len(kv); i += 2 {
		switch v := kv[i+1].(type) {
		case float64:
			e.Num[kv[i].(string)] = v
		case string:
			e.Str[kv[i].(string)] = v
		}
	}
	return e
}

func compile(t testing.TB, els ...*netlist.Element) *mna.System {
	t.Helper()
	s, err := mna.Compile(&netlist.Circuit{Elements: els})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func index(t testing.TB, names []string, name string) int {
	t.Helper()
	for i, n := range names {
		if n == name {
			return i
		}
	}
	t.Fatalf("no %q in %v", name, names)
	return -1
}

// The invented snapback clamp of these tests.
var snapNum = []any{"vt1", 8.5, "it1", 0.05, "vh", 4.2, "ih", 0.6, "ron", 1.2, "nbr", 1.5}

// snapV is the S-curve written from the model's documentation (the
// defining equations in devices/snapback.go's doc comment), independently
// of the model's code: uni, I ≥ 0 and the forward branch below 0.
func snapV(i float64) float64 {
	const vt1, it1, vh, ih, ron, nbr, is, n = 8.5, 0.05, 4.2, 0.6, 1.2, 1.5, 1e-14, 1.0
	vt := 1.380649e-23 * 300 / 1.602176634e-19
	a := nbr * vt
	if i < 0 {
		return -n*vt*math.Log(1-i/is) + ron*i
	}
	// ub from V(it1) = vt1, by bisection on ub.
	vAtIt1 := func(ub float64) float64 {
		eps := math.Exp(-ub / a)
		s1 := a/(it1*(1+eps)) + ron
		return ub + a*math.Log(1+eps) + ron*it1 - s1*it1/2
	}
	lo, hi := 0.0, 2*vt1
	for range 200 {
		mid := (lo + hi) / 2
		if vAtIt1(mid) < vt1 {
			lo = mid
		} else {
			hi = mid
		}
	}
	ub := (lo + hi) / 2
	eps := math.Exp(-ub / a)
	switch {
	case i <= it1:
		s1 := a/(it1*(1+eps)) + ron
		return ub + a*math.Log(i/it1+eps) + ron*i - s1*i*i/(2*it1)
	case i <= ih:
		t := (i - it1) / (ih - it1)
		return vt1 + (vh-vt1)*(3*t*t-2*t*t*t)
	}
	w := ron * (ih - it1) * (ih - it1) / (6 * (vt1 - vh))
	return vh + ron*((i-ih)-w*(1-math.Exp(-(i-ih)/w)))
}

func TestSnapbackDCThroughEngine(t *testing.T) {
	// A supply behind 50 Ω drives the clamp from reverse conduction through
	// blocking, trigger, snapback and the on-state. At every operating point
	// the current the resistor carries and the clamp's voltage must lie on
	// the defining S-curve [calc: KCL with the equations of the model's
	// documentation, written out in snapV] to 1e-9. 50 Ω is stiffer than no
	// part of the curve (its steepest fall is 1.5·(vt1 − vh)/(ih − it1) =
	// 11.7 Ω), so each supply meets it once.
	tight := &mna.Settings{RelTol: 1e-12, AbsTol: 1e-13, Gmin: 1e-20}
	const r = 50.0
	for _, vs := range []float64{-60, -5, -0.5, 3, 8, 8.6, 10, 11, 15, 20, 25, 31, 40, 80, 200, 600} {
		s := compile(t, elem(netlist.Supply, "V1", "s", "gnd", vs, "r", r), elem(snapKind, "S1", "s", "gnd", 0, snapNum...))
		v, err := s.OperatingPoint(tight)
		if err != nil {
			t.Fatalf("%g V: %v", vs, err)
		}
		va := v[index(t, s.Nodes(), "s")]
		i := (vs - va) / r
		if va > 0 && va < 8.5 && math.Abs(i) < 1e-12 {
			// Blocking: V(I) is too steep to compare voltages; the curve's
			// current at va (bisection on the rising branch below it1) must
			// be as negligible as the resistor's.
			lo, hi := 0.0, 0.05
			for range 200 {
				if mid := (lo + hi) / 2; snapV(mid) < va {
					lo = mid
				} else {
					hi = mid
				}
			}
			if lo > 1e-12 {
				t.Errorf("%g V supply: blocking at %.6g V with %g A, the S-curve carries %g A there", vs, va, i, lo)
			}
			continue
		}
		want := snapV(i)
		if math.Abs(va-want) > 1e-9*math.Max(1, math.Abs(want)) {
			t.Errorf("%g V supply: clamp at %.12g V carrying %.6g A; the S-curve gives %.12g V", vs, va, i, want)
		}
	}
}

// tlpPoint runs a TLP pulse of the given level (A into a short) into the
// element and averages its voltage and current over 70–90 % of the width,
// as a TLP measurement does [pub: ANSI/ESD STM5.5.1, 70–90 ns of 100 ns].
func tlpPoint(t testing.TB, level float64, dut *netlist.Element, extra ...*netlist.Element) (v, i float64) {
	t.Helper()
	els := append([]*netlist.Element{elem(netlist.Strike, "zap", "a", "gnd", 0, "waveform", "tlp")}, extra...)
	els = append(els, dut)
	s := compile(t, els...)
	st, err := waveforms.New("tlp", level, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	s.SetStimulus(st, 1)
	a, d := index(t, s.Nodes(), "a"), index(t, s.Elements(), dut.Name)
	var sv, si, sw float64
	var tPrev, vPrev, iPrev float64
	set := &mna.Settings{RelTol: 1e-6, MaxStep: 1e-9, Observe: func(p *mna.Point) {
		if p.T > 70e-9 && tPrev >= 70e-9 && p.T <= 90e-9 {
			h := p.T - tPrev
			sv += h * (p.V[a] + vPrev) / 2
			si += h * (p.I[d] + iPrev) / 2
			sw += h
		}
		tPrev, vPrev, iPrev = p.T, p.V[a], p.I[d]
	}}
	if _, err := s.Transient(set); err != nil {
		t.Fatalf("TLP %g A: %v", level, err)
	}
	return sv / sw, si / sw
}

func TestSnapbackTLPReproducesCurve(t *testing.T) {
	// TLP pulses at several levels land on the S-curve's quasi-static points:
	// the intersection of the 50 Ω load line v = 50·(L − i) with V(i),
	// found here by bisection on snapV [calc]. The levels span blocking
	// (0.1 A), the trigger and snapback (0.2–0.3 A), holding and the
	// on-state.
	for _, level := range []float64{0.1, 0.18, 0.22, 0.3, 0.5, 1, 4, 16} {
		v, i := tlpPoint(t, level, elem(snapKind, "S1", "a", "gnd", 0, append(snapNum, "cj", 3e-12, "ls", 0.5e-9)...))
		lo, hi := -1.0, level
		for range 200 {
			mid := (lo + hi) / 2
			if snapV(mid)+50*mid < 50*level {
				lo = mid
			} else {
				hi = mid
			}
		}
		wi := (lo + hi) / 2
		wv := snapV(wi)
		if math.Abs(v-wv) > 1e-4*wv || math.Abs(i-wi) > 1e-4*wi+1e-9 {
			t.Errorf("TLP %g A: averaged %.6g V, %.6g A; the S-curve's point %.6g V, %.6g A", level, v, i, wv, wi)
		}
	}
}

func TestSnapbackConvergesEverywhere(t *testing.T) {
	// 200 strikes at random levels through random series impedances, both
	// polarities, uni and bi, with and without a capacitor at the clamp:
	// every transient must finish. Half are TLP pulses (0.01–40 A), half
	// IEC 61000-4-2 currents (0.2–16 kV), fed through a series inductor of
	// 0.05–20 nH and a resistor of 0.01–100 Ω.
	seed := uint64(17)
	rnd := func() float64 {
		seed = seed*6364136223846793005 + 1442695040888963407
		return float64(seed>>11) / float64(1<<53)
	}
	logU := func(lo, hi float64) float64 { return lo * math.Pow(hi/lo, rnd()) }
	fails := 0
	for k := range 200 {
		wave, level := "tlp", logU(0.01, 40)
		if k%2 == 1 {
			wave, level = "iec61000-4-2", logU(200, 16000)
		}
		sign := 1.0
		if rnd() < 0.5 {
			sign = -1
		}
		pol := "uni"
		if rnd() < 0.5 {
			pol = "bi"
		}
		r, l := logU(0.01, 100), logU(0.05e-9, 20e-9)
		els := []*netlist.Element{
			elem(netlist.Strike, "zap", "in", "gnd", 0, "waveform", wave),
			elem(netlist.Resistor, "R1", "in", "m", r),
			elem(netlist.Inductor, "L1", "m", "a", l),
			elem(snapKind, "S1", "a", "gnd", 0, append(snapNum, "polarity", pol, "cj", logU(0.1e-12, 50e-12), "ls", logU(0.01e-9, 2e-9))...),
		}
		if rnd() < 0.5 {
			els = append(els, elem(netlist.Capacitor, "C1", "a", "gnd", logU(1e-12, 10e-9)))
		}
		s := compile(t, els...)
		st, err := waveforms.New(wave, level, nil, nil)
		if err != nil {
			t.Fatal(err)
		}
		s.SetStimulus(st, sign)
		if _, err := s.Transient(&mna.Settings{RelTol: 1e-4}); err != nil {
			fails++
			t.Errorf("run %d (%s %.4g, sign %+g, %s, R %.3g Ω, L %.3g H): %v", k, wave, level, sign, pol, r, l, err)
		}
	}
	if fails > 0 {
		t.Logf("%d of 200 runs failed", fails)
	}
}

func TestTablePathDCThroughEngine(t *testing.T) {
	// A supply behind 10 Ω drives a table path; at each operating point the
	// resistor's current equals the table's interpolant at the path's
	// voltage, and at the table's own points the table's current itself
	// [calc: KCL; the interpolant passes through every point].
	v := []float64{-3, -1.2, -0.9, -0.7, -0.5, 0, 3.3, 6.0, 6.5, 7.0, 8.0, 10.0}
	i := []float64{-1.9, -0.45, -0.2, -0.02, -1e-4, 0, 1e-8, 1e-4, 0.05, 0.3, 0.95, 2.4}
	tab, err := devices.NewIVTable(v, i)
	if err != nil {
		t.Fatal(err)
	}
	testTables["pin"] = devices.TableSpec{Low: tab}
	const r = 10.0
	tight := &mna.Settings{RelTol: 1e-12, AbsTol: 1e-13, Gmin: 1e-20}
	for k := range v {
		vs := v[k] + r*i[k] // puts the path exactly on point k
		s := compile(t, elem(netlist.Supply, "V1", "s", "gnd", vs, "r", r), elem(tableKind, "U1", "s", "gnd", 0, "table", "pin"))
		x, err := s.OperatingPoint(tight)
		if err != nil {
			t.Fatalf("point %d: %v", k, err)
		}
		got := x[index(t, s.Nodes(), "s")]
		if math.Abs(got-v[k]) > 1e-9*math.Max(1, math.Abs(v[k])) {
			t.Errorf("point %d: path at %.10g V, table %g V (%g A)", k, got, v[k], i[k])
		}
	}
	for _, vs := range []float64{-40, -2, 1, 7, 12, 45} {
		s := compile(t, elem(netlist.Supply, "V1", "s", "gnd", vs, "r", r), elem(tableKind, "U1", "s", "gnd", 0, "table", "pin"))
		x, err := s.OperatingPoint(tight)
		if err != nil {
			t.Fatalf("%g V: %v", vs, err)
		}
		va := x[index(t, s.Nodes(), "s")]
		want, _ := tab.Eval(va)
		if got := (vs - va) / r; math.Abs(got-want) > 1e-9*math.Max(1e-3, math.Abs(want)) {
			t.Errorf("%g V: the resistor carries %.10g A, the table %.10g A at %.8g V", vs, got, want, va)
		}
	}
}

func TestTablePathConvergesEverywhere(t *testing.T) {
	// The table path of an IBIS-like input (package, C_comp, both clamp
	// tables) under 100 random strikes through random series impedances.
	low, _ := devices.NewIVTable([]float64{-3.3, -1, -0.8, -0.6, -0.4, 0, 3.3, 6.6}, []float64{-0.455, -0.097, -0.043, -2.2e-3, -1.8e-5, 0, 0.9e-9, 5e-9})
	up, _ := devices.NewIVTable([]float64{-3.3, 0, 0.3, 0.4, 0.6, 0.8, 1, 3.3}, []float64{0, 0, 1.7e-6, 2e-5, 2.4e-3, 0.046, 0.102, 0.48})
	testTables["ibis"] = devices.TableSpec{Low: low, Up: up, UpRef: 3.3, Rs: 0.3, Ls: 2.6e-9, C: 3.1e-12, Cpkg: 0.5e-12}
	seed := uint64(5)
	rnd := func() float64 {
		seed = seed*6364136223846793005 + 1442695040888963407
		return float64(seed>>11) / float64(1<<53)
	}
	logU := func(lo, hi float64) float64 { return lo * math.Pow(hi/lo, rnd()) }
	for k := range 100 {
		wave, level := "tlp", logU(0.01, 20)
		if k%2 == 1 {
			wave, level = "iec61000-4-2", logU(100, 8000)
		}
		sign := 1.0
		if k%4 >= 2 {
			sign = -1
		}
		r, l := logU(0.1, 200), logU(0.1e-9, 20e-9)
		s := compile(t,
			elem(netlist.Strike, "zap", "in", "gnd", 0, "waveform", wave),
			elem(netlist.Resistor, "R1", "in", "m", r),
			elem(netlist.Inductor, "L1", "m", "a", l),
			elem(tableKind, "U1", "a", "gnd", 0, "table", "ibis"))
		st, _ := waveforms.New(wave, level, nil, nil)
		s.SetStimulus(st, sign)
		if _, err := s.Transient(&mna.Settings{RelTol: 1e-4}); err != nil {
			t.Errorf("run %d (%s %.4g, sign %+g, R %.3g Ω, L %.3g H): %v", k, wave, level, sign, r, l, err)
		}
	}
}

func TestIBISPinDCThroughEngine(t *testing.T) {
	// The invented IBIS input of testdata/fit, pin 1 (its own R_pin, L_pin,
	// C_pin), typ corner, as a table path behind a supply and 1 Ω. Where
	// one clamp table conducts and the other only leaks, the pin's DC
	// current at the die voltage of a table row must be that row's current
	// within 0.1 % [calc: KCL; the file's rows are the I–V it states].
	src, err := os.ReadFile("../testdata/fit/sensor-input.ibs")
	if err != nil {
		t.Fatal(err)
	}
	ib, err := datafile.ReadIBIS("sensor-input.ibs", src)
	if err != nil {
		t.Fatal(err)
	}
	pm, err := ib.PinModel("1", datafile.Typ)
	if err != nil {
		t.Fatal(err)
	}
	spec, notes, err := devices.IBISPin("U1", [2]string{"s", "gnd"}, "", pm)
	if err != nil {
		t.Fatal(err)
	}
	if len(notes) == 0 || !strings.Contains(notes[len(notes)-1], "no failure data") {
		t.Errorf("notes %q", notes)
	}
	testTables["ibis-file"] = spec
	const r = 1.0
	tight := &mna.Settings{RelTol: 1e-12, AbsTol: 1e-13, Gmin: 1e-20}
	check := func(u, i float64, what string) {
		t.Helper()
		// Put the die at u: the supply drives i through r and R_pin.
		vs := u + (r+pm.Rpkg)*i
		s := compile(t, elem(netlist.Supply, "V1", "s", "gnd", vs, "r", r), elem(tableKind, "U1", "s", "gnd", 0, "table", "ibis-file"))
		x, err := s.OperatingPoint(tight)
		if err != nil {
			t.Fatalf("%s: %v", what, err)
		}
		got := (vs - x[index(t, s.Nodes(), "s")]) / r
		if math.Abs(got-i) > 1e-3*math.Abs(i) {
			t.Errorf("%s: the pin draws %.6g A, the table %.6g A", what, got, i)
		}
	}
	n := 0
	for k, v := range pm.GNDV {
		if v <= -0.5 {
			check(v, pm.GNDI[k], fmt.Sprintf("GND clamp row %g V", v))
			n++
		}
	}
	for k, w := range pm.PowerV {
		if w >= 0.5 {
			check(w+pm.PowerRef, pm.PowerI[k], fmt.Sprintf("POWER clamp row %g V above the %g V rail", w, pm.PowerRef))
			n++
		}
	}
	if n < 16 {
		t.Errorf("only %d rows compared", n)
	}
}
