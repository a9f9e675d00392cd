package devices_test

// The snapback clamp and the table paths solved through the engine, from
// decks as a user writes them.

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"zapnet/mna"
	"zapnet/netlist"
	"zapnet/netlist/datafile"
	"zapnet/waveforms"
)

// compileDeck reads a deck from text and compiles it.
func compileDeck(t testing.TB, text string) *mna.System {
	t.Helper()
	c, err := netlist.Parse("t.zap", []byte(text))
	if err != nil {
		t.Fatalf("%v\n%s", err, text)
	}
	s, err := mna.Compile(c)
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

// num writes a value for a deck.
func num(v float64, unit string) string { return fmt.Sprintf("%.12g%s", v, unit) }

// The invented snapback clamp of these tests.
const snapParams = "vt1=8.5V it1=50mA vh=4.2V ih=0.6A ron=1.2ohm nbr=1.5"

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
		s := compileDeck(t, "strike zap s gnd waveform=tlp level=1\nsupply V1 s gnd "+num(vs, "V")+" r=50ohm\nsnapback S1 s gnd "+snapParams+"\n")
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
// deck's node a and averages the voltage there and the current of element
// dut over 70–90 % of the width, as a TLP measurement does [pub: ANSI/ESD
// STM5.5.1, 70–90 ns of 100 ns].
func tlpPoint(t testing.TB, level float64, lines string, dut string) (v, i float64) {
	t.Helper()
	s := compileDeck(t, "strike zap a gnd waveform=tlp level=1\n"+lines)
	st, err := waveforms.Lookup("tlp").New(level, nil)
	if err != nil {
		t.Fatal(err)
	}
	a, d := index(t, s.Nodes(), "a"), index(t, s.Elements(), dut)
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
	if _, err := s.Transient(st, 1, set); err != nil {
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
		v, i := tlpPoint(t, level, "snapback S1 a gnd "+snapParams+" cj=3pF ls=0.5nH\n", "S1")
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

// rnd is a small deterministic generator for the random runs.
type rnd uint64

func (r *rnd) next() float64 {
	*r = *r*6364136223846793005 + 1442695040888963407
	return float64(uint64(*r)>>11) / float64(1<<53)
}

// logU is log-uniform in [lo, hi].
func (r *rnd) logU(lo, hi float64) float64 { return lo * math.Pow(hi/lo, r.next()) }

func TestSnapbackConvergesEverywhere(t *testing.T) {
	// 200 strikes at random levels through random series impedances, both
	// polarities, uni and bi, with and without a capacitor at the clamp:
	// every transient must finish. Half are TLP pulses (0.01–40 A), half
	// IEC 61000-4-2 currents (0.2–16 kV), fed through a series inductor of
	// 0.05–20 nH and a resistor of 0.01–100 Ω.
	g := rnd(17)
	fails := 0
	for k := range 200 {
		wave, level := "tlp", g.logU(0.01, 40)
		if k%2 == 1 {
			wave, level = "iec61000-4-2", g.logU(200, 16000)
		}
		sign := 1.0
		if g.next() < 0.5 {
			sign = -1
		}
		pol := "uni"
		if g.next() < 0.5 {
			pol = "bi"
		}
		r, l := g.logU(0.01, 100), g.logU(0.05e-9, 20e-9)
		deck := "strike zap in gnd waveform=" + wave + " level=1\n" +
			"resistor R1 in m " + num(r, "ohm") + "\n" +
			"inductor L1 m a " + num(l, "H") + "\n" +
			"snapback S1 a gnd " + snapParams + " polarity=" + pol + " cj=" + num(g.logU(0.1e-12, 50e-12), "F") + " ls=" + num(g.logU(0.01e-9, 2e-9), "H") + "\n"
		if g.next() < 0.5 {
			deck += "capacitor C1 a gnd " + num(g.logU(1e-12, 10e-9), "F") + "\n"
		}
		s := compileDeck(t, deck)
		st, err := waveforms.Lookup(wave).New(level, nil)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := s.Transient(st, sign, &mna.Settings{RelTol: 1e-4}); err != nil {
			fails++
			t.Errorf("run %d (%s %.4g, sign %+g, %s, R %.3g Ω, L %.3g H): %v", k, wave, level, sign, pol, r, l, err)
		}
	}
	if fails > 0 {
		t.Logf("%d of 200 runs failed", fails)
	}
}

// writeTable writes a TLP-style table (v, i) for a deck's table=.
func writeTable(t *testing.T, v, i []float64) string {
	t.Helper()
	var b strings.Builder
	b.WriteString("v [V],i [A]\n")
	for k := range v {
		fmt.Fprintf(&b, "%.17g,%.17g\n", v[k], i[k])
	}
	path := filepath.Join(t.TempDir(), "table.csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestTablePathDCThroughEngine(t *testing.T) {
	// A supply behind 10 Ω drives a clamp and a pin given by a table; at
	// each operating point the resistor's current equals the table's
	// interpolant at the path's voltage, and at the table's own points the
	// table's current itself [calc: KCL; the interpolant passes through
	// every point].
	v := []float64{-3, -1.2, -0.9, -0.7, -0.5, 0, 3.3, 6.0, 6.5, 7.0, 8.0, 10.0}
	i := []float64{-1.9, -0.45, -0.2, -0.02, -1e-4, 0, 1e-8, 1e-4, 0.05, 0.3, 0.95, 2.4}
	path := writeTable(t, v, i)
	const r = 10.0
	tight := &mna.Settings{RelTol: 1e-12, AbsTol: 1e-13, Gmin: 1e-20}
	for _, kind := range []string{"clamp", "pin"} {
		for k := range v {
			vs := v[k] + r*i[k] // puts the path exactly on point k
			s := compileDeck(t, fmt.Sprintf("strike zap s gnd waveform=tlp level=1\nsupply V1 s gnd %s r=10ohm\n%s U1 s gnd table=%q\n", num(vs, "V"), kind, path))
			x, err := s.OperatingPoint(tight)
			if err != nil {
				t.Fatalf("%s point %d: %v", kind, k, err)
			}
			got := x[index(t, s.Nodes(), "s")]
			if math.Abs(got-v[k]) > 1e-9*math.Max(1, math.Abs(v[k])) {
				t.Errorf("%s point %d: path at %.10g V, table %g V (%g A)", kind, k, got, v[k], i[k])
			}
		}
	}
}

func TestIBISPinDCThroughEngine(t *testing.T) {
	// The invented IBIS input of testdata/fit, pin 1 (its own R_pin, L_pin,
	// C_pin), typ corner, read by a deck's pin behind a supply and 1 Ω.
	// Where one clamp table conducts and the other only leaks, the pin's DC
	// current at the die voltage of a table row must be that row's current
	// within 0.1 % [calc: KCL; the file's rows are the I–V it states].
	file, err := filepath.Abs("../testdata/fit/sensor-input.ibs")
	if err != nil {
		t.Fatal(err)
	}
	src, err := os.ReadFile(file)
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
	const r = 1.0
	tight := &mna.Settings{RelTol: 1e-12, AbsTol: 1e-13, Gmin: 1e-20}
	check := func(u, i float64, what string) {
		t.Helper()
		// Put the die at u: the supply drives i through r and R_pin.
		vs := u + (r+pm.Rpkg)*i
		s := compileDeck(t, fmt.Sprintf("strike zap s gnd waveform=tlp level=1\nsupply V1 s gnd %s r=1ohm\npin U1 s gnd ibis=%q model=1\n", num(vs, "V"), file))
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

func TestIBISPinConvergesEverywhere(t *testing.T) {
	// The IBIS input (package, C_comp, both clamp tables to a 3.3 V
	// reference) under 100 random strikes through random series
	// impedances, both polarities: every transient must finish.
	file, _ := filepath.Abs("../testdata/fit/sensor-input.ibs")
	g := rnd(5)
	for k := range 100 {
		wave, level := "tlp", g.logU(0.01, 20)
		if k%2 == 1 {
			wave, level = "iec61000-4-2", g.logU(100, 8000)
		}
		sign := 1.0
		if k%4 >= 2 {
			sign = -1
		}
		r, l := g.logU(0.1, 200), g.logU(0.1e-9, 20e-9)
		corner := []string{"typ", "min", "max"}[k%3]
		s := compileDeck(t, fmt.Sprintf("strike zap in gnd waveform=%s level=1\nresistor R1 in m %s\ninductor L1 m a %s\npin U1 a gnd ibis=%q model=1 corner=%s\n",
			wave, num(r, "ohm"), num(l, "H"), file, corner))
		st, _ := waveforms.Lookup(wave).New(level, nil)
		if _, err := s.Transient(st, sign, &mna.Settings{RelTol: 1e-4}); err != nil {
			t.Errorf("run %d (%s %.4g, sign %+g, R %.3g Ω, L %.3g H, %s): %v", k, wave, level, sign, r, l, corner, err)
		}
	}
}

func TestTableKindsRefuseBadUse(t *testing.T) {
	// What a deck cannot mean is refused when the deck is read, at the
	// element, with the file's own position where the file is at fault.
	dir := t.TempDir()
	bad := filepath.Join(dir, "snap.csv")
	os.WriteFile(bad, []byte("v,i\n1,0.001\n9,0.05\n5,0.5\n"), 0o644)
	ibs, _ := filepath.Abs("../testdata/fit/sensor-input.ibs")
	for _, c := range []struct{ line, want string }{
		{fmt.Sprintf("clamp D1 a gnd table=%q", bad), "snap.csv:4:1: 5 V at 0.5 A is not above 9 V at 0.05 A"},
		{"clamp D1 a gnd table=\"nofile.csv\"", "table file nofile.csv: no such file"},
		{"clamp D1 a gnd", "clamp D1 needs vbr (volts)"},
		{fmt.Sprintf("pin U1 a gnd ibis=%q", ibs), "ibis= needs model=NAME"},
		{fmt.Sprintf("pin U1 a gnd ibis=%q model=nope", ibs), "no model or pin \"nope\" (models: in33)"},
		{"pin U1 a gnd model=in33", "model= names a model of an IBIS file"},
		{fmt.Sprintf("pin U1 a gnd table=%q ibis=%q model=1", bad, ibs), "give table= or ibis=, not both"},
		{"snapback S1 a gnd vt1=5V it1=50mA vh=6V ih=0.6A ron=1ohm", "the holding voltage vh (6 V) must lie below the trigger voltage vt1 (5 V)"},
	} {
		_, err := netlist.Parse(filepath.Join(dir, "t.zap"), []byte("strike zap a gnd waveform=tlp level=1\n"+c.line+"\n"))
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v, want %q", c.line, err, c.want)
		}
	}
}
