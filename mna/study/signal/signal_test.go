package signal

import (
	"math"
	"math/cmplx"
	"testing"

	"zapnet/netlist"
)

func parse(t *testing.T, deck string) *netlist.Circuit {
	t.Helper()
	c, err := netlist.Parse("signal-test.zap", []byte(deck))
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// beadDivider is CHECKS.md's bead (rdc 0.3 Ω, l 1.2 µH, c 1.7 pF,
// rac 1.1 kΩ) from an ideal source into C with series esr:
// H = Zc/(Zbead + Zc), Zc = esr + 1/(jωC) [calc: the divider's transfer
// function].
func beadDivider(f, c, esr, rdc float64) complex128 {
	w := 2 * math.Pi * f
	zb := complex(rdc, 0) + 1/(complex(1/1.1e3, 0)+1/complex(0, w*1.2e-6)+complex(0, w*1.7e-12))
	zc := complex(esr, 0) + 1/complex(0, w*c)
	return zc / (zb + zc)
}

// dividerPeakDB is the largest |H| in dB over 1 kHz–100 MHz, on a fine grid
// refined by golden section, independent of the package's own search.
func dividerPeakDB(c, esr, rdc float64) float64 {
	g := func(x float64) float64 { return cmplx.Abs(beadDivider(math.Exp(x), c, esr, rdc)) }
	best, bx := 0.0, 0.0
	for x := math.Log(1e3); x < math.Log(1e8); x += 0.002 {
		if v := g(x); v > best {
			best, bx = v, x
		}
	}
	a, b := bx-0.002, bx+0.002
	for b-a > 1e-10 {
		m1, m2 := a+(b-a)/3, b-(b-a)/3
		if g(m1) < g(m2) {
			a = m1
		} else {
			b = m2
		}
	}
	low := cmplx.Abs(beadDivider(1e3, c, esr, rdc))
	return 20 * math.Log10(math.Max(g((a+b)/2), best)/low)
}

// The bead + 1 µF case of CHECKS.md (+11.3 dB at 142 kHz) is flagged over
// the default 3 dB, and the damping values found by solving again bring
// the closed-form divider under 3 dB, close to the smallest value that
// does (found here by bisection on the closed form): the capacitor's esr
// and the bead's rdc.
func TestBeadCapacitorPeakingAndDamping(t *testing.T) {
	c := parse(t, `strike esd in gnd waveform=iec61000-4-2 level=2k
bead FB1 in out l=1.2u rdc=0.3 c=1.7p rac=1.1k
capacitor C1 out gnd 1u
watch out
`)
	req, err := FromCircuit(c)
	if err != nil {
		t.Fatal(err)
	}
	res, err := Analyse(c, req, &Options{From: 1e3, To: 100e6})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Peaking) != 1 {
		t.Fatalf("peaking: %+v", res.Peaking)
	}
	p := res.Peaking[0]
	if p.Node != "out" || math.Abs(p.GainDB-11.3) > 0.05 || math.Abs(p.Freq-142e3) > 0.5e3 || !p.Exceeds || p.LimitDB != 3 {
		t.Errorf("peaking %+v, want +11.3 dB at 142 kHz over 3 dB [calc, CHECKS.md]", p)
	}
	// The closed form's smallest damping value, by bisection.
	threshold := func(f func(v float64) float64) float64 {
		lo, hi := 1e-3, 1e3
		for hi/lo > 1+1e-9 {
			m := math.Sqrt(lo * hi)
			if f(m) > 3 {
				lo = m
			} else {
				hi = m
			}
		}
		return hi
	}
	want := map[string]float64{
		"C1.esr":  threshold(func(v float64) float64 { return dividerPeakDB(1e-6, v, 0.3) }),
		"FB1.rdc": threshold(func(v float64) float64 { return dividerPeakDB(1e-6, 0, v) }),
	}
	got := map[string]Damping{}
	for _, d := range p.Damping {
		got[d.Element+"."+d.Param] = d
	}
	for k, w := range want {
		d, ok := got[k]
		t.Logf("%s: found %.4g Ω (peaking %.3f dB), closed-form threshold %.5g Ω", k, d.Value, d.GainDB, w)
		if !ok {
			t.Errorf("no damping by %s (closed form: %.4g Ω); got %+v", k, w, p.Damping)
			continue
		}
		// Rounded up to two figures: at most 10 % above, never below.
		if d.Value < w*(1-1e-6) || d.Value > 1.1*w {
			t.Errorf("%s: %.4g Ω, closed-form smallest value %.4g Ω", k, d.Value, w)
		}
		esr, rdc := 0.0, 0.3
		if k == "C1.esr" {
			esr = d.Value
		} else {
			rdc = d.Value
		}
		if cf := dividerPeakDB(1e-6, esr, rdc); cf > 3 || math.Abs(cf-d.GainDB) > 0.01 {
			t.Errorf("%s = %.4g Ω: closed form peaks %.4f dB, reported %.4f dB, limit 3 dB", k, d.Value, cf, d.GainDB)
		}
	}
	if tr := res.Nodes["out"]; tr == nil || len(tr.GainDB) != len(res.Freq) || math.Abs(tr.GainDB[0]) > 1e-3 {
		t.Errorf("transfer to out: %+v", tr)
	}
}

// The capacitance a protected line sees, element by element: a clamp's cj
// at its bias, the pin's cin, a trace's T/Z0 [pub: MODELS.md; lossless line
// C = T/Z0], against a watch's limit.
func TestLoadingPerElement(t *testing.T) {
	c := parse(t, `strike esd conn gnd waveform=iec61000-4-2 level=8k
clamp D1 conn gnd vbr=6 cj=0.5p polarity=bi
line TL1 conn p z0=50 delay=25p
pin U1 p gnd cin=1.2p
`)
	req, err := FromCircuit(c)
	if err != nil {
		t.Fatal(err)
	}
	req.Targets[0].CMax = 2e-12
	res, err := Analyse(c, req, nil)
	if err != nil {
		t.Fatal(err)
	}
	l := res.Loading[0]
	want := 0.5e-12 + 0.5e-12 + 1.2e-12
	if l.Node != "p" || math.Abs(l.Capacitance/want-1) > 1e-4 || !l.Exceeds || l.Limit != 2e-12 {
		t.Errorf("loading %+v, want %.4g F over the 2 pF limit", l, want)
	}
	shares := map[string]float64{}
	for _, e := range l.Elements {
		shares[e.Element] = e.Capacitance
	}
	for k, v := range map[string]float64{"D1": 0.5e-12, "TL1": 0.5e-12, "U1": 1.2e-12} {
		if math.Abs(shares[k]/v-1) > 1e-4 {
			t.Errorf("%s: %.4g F, want %.4g F", k, shares[k], v)
		}
	}
}

// Two ports make a two-port: a shunt capacitor's S21 = 2/(2 + jωZ0C)
// [calc, CHECKS.md second round]: 1 pF at 5 GHz loses 2.087 dB.
func TestTwoPortInResult(t *testing.T) {
	c := parse(t, "strike esd in gnd waveform=iec61000-4-2 level=8k\ncapacitor C1 in gnd 1p\nport P1 in gnd\nport P2 in gnd\n")
	req, err := FromCircuit(c)
	if err != nil {
		t.Fatal(err)
	}
	res, err := Analyse(c, req, &Options{From: 5e9, To: 6e9, PerDecade: 1})
	if err != nil {
		t.Fatal(err)
	}
	if tp := res.TwoPort; tp == nil || math.Abs(tp.S21DB[0]+2.087) > 0.001 || math.Abs(tp.S11DB[0]+4.185) > 0.001 {
		t.Errorf("two-port %+v", res.TwoPort)
	}
}

func TestRoundUp2(t *testing.T) {
	for _, tc := range [][2]float64{{0.4123, 0.42}, {0.42, 0.42}, {1.001, 1.1}, {99.1, 100}, {0.0123, 0.013}} {
		if got := roundUp2(tc[0]); got != tc[1] {
			t.Errorf("roundUp2(%g) = %g, want %g", tc[0], got, tc[1])
		}
	}
}
