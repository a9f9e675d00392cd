package waveforms

import (
	"math"
	"strings"
	"testing"
)

// Check refuses what would make a circuit unusable or discharge the
// generator before t = 0, and accepts every generator of the catalogue.
func TestFragmentCheck(t *testing.T) {
	held := []Node{{Name: "c", Held: true, V0: 1000}, {Name: "s"}}
	for _, c := range []struct {
		what  string
		parts []Part
		want  string // "" for no error
	}{
		{"a generator", []Part{
			{Kind: PartCapacitor, Name: "cc", A: 0, B: Ref, Value: 1e-6},
			{Kind: PartSwitch, Name: "relay", A: 0, B: 1},
			{Kind: PartResistor, Name: "rs", A: 1, B: Out, Value: 2}}, ""},
		{"a resistor across the charged side", []Part{
			{Kind: PartCapacitor, Name: "cc", A: 0, B: Ref, Value: 1e-6},
			{Kind: PartResistor, Name: "r", A: 0, B: 1, Value: 2},
			{Kind: PartResistor, Name: "rs", A: 1, B: Out, Value: 2}}, "only a switch or a capacitor may cross"},
		{"a negative capacitor", []Part{{Kind: PartCapacitor, Name: "cc", A: 0, B: Ref, Value: -1}}, "must be positive"},
		{"a node out of range", []Part{{Kind: PartResistor, Name: "r", A: 5, B: Out, Value: 1}}, "out of range"},
		{"a part on one node", []Part{{Kind: PartResistor, Name: "r", A: 1, B: 1, Value: 1}}, "to itself"},
		{"a source without F", []Part{{Kind: PartSource, Name: "g", A: 1, B: Ref, Value: 50}}, "no voltage function"},
		{"a spark without a gap", []Part{{Kind: PartSwitch, Name: "gap", A: 0, B: Out, Spark: &Spark{A: 1e-4, R0: 1e6}}}, "must be positive"},
	} {
		err := (&Fragment{Nodes: held, Parts: c.parts}).Check()
		switch {
		case c.want == "" && err != nil:
			t.Errorf("%s: %v", c.what, err)
		case c.want != "" && (err == nil || !strings.Contains(err.Error(), c.want)):
			t.Errorf("%s: error %v, want one saying %q", c.what, err, c.want)
		}
	}
}

// Levels change values, never the shape; parameters may change it.
func TestGeneratorShapeByLevel(t *testing.T) {
	for _, name := range []string{"iec61000-4-2-network", "iec61000-4-2-air", "surge-cwg"} {
		a, _ := mk(name, 2000, nil, nil)
		b, _ := mk(name, 15000, nil, nil)
		if !a.Gen.SameShape(b.Gen) || !GeneratorShape(&b.Values).SameShape(a.Gen) {
			t.Errorf("%s: shape changes with the level", name)
		}
	}
	shape := func(name string, num map[string]float64, str map[string]string) *Fragment {
		s, err := mk(name, 1000, num, str)
		if err != nil {
			t.Fatal(err)
		}
		return GeneratorShape(&s.Values)
	}
	direct := shape("surge-cwg", nil, nil)
	io := shape("surge-cwg", nil, map[string]string{"path": "io"})
	if direct.SameShape(io) {
		t.Error("the io coupling path adds no parts")
	}
	if !shape("hbm", nil, nil).SameShape(shape("iec61000-4-2", nil, nil)) || !GeneratorShape(nil).SameShape(shape("hbm", nil, nil)) {
		t.Error("hbm, the ideal current and no values do not share the network's shape")
	}
	if !shape("eft", map[string]float64{"burst": 5e3}, nil).SameShape(shape("eft", map[string]float64{"burst": 100e3}, nil)) {
		t.Error("the two burst rates differ in shape")
	}
}

// [calc: CHECKS.md, energies of generator networks, ½·C·V²] 150 pF at 8 kV
// holds 4.8 mJ, 100 pF at 2 kV 0.2 mJ, 330 pF at 8 kV 10.6 mJ; the contact
// generator adds its fast branch's 7.51 pF (0.24 mJ at 8 kV).
func TestFragmentEnergy(t *testing.T) {
	for _, c := range []struct {
		f    *Fragment
		want float64
		tol  float64
	}{
		{NetworkFragment(8000, 150e-12, 330, 0), 4.8e-3, 1e-12},
		{NetworkFragment(2000, 100e-12, 1500, 0), 0.2e-3, 1e-12},
		{NetworkFragment(8000, 330e-12, 330, 0), 10.56e-3, 1e-12},
	} {
		if got := c.f.Energy(); math.Abs(got-c.want) > c.tol*c.want+1e-18 {
			t.Errorf("%s: %g J, want %g J", c.f, got, c.want)
		}
	}
	s, _ := mk("iec61000-4-2-network", 8000, nil, nil)
	if got, want := s.Gen.Energy(), 0.5*(150e-12+7.51e-12)*8000*8000; math.Abs(got/want-1) > 1e-12 {
		t.Errorf("contact generator at 8 kV holds %g J, want %g J", got, want)
	}
}

// Paschen's law for air [pub: A = 15 /(cm·Torr), B = 365 V/(cm·Torr),
// γ = 0.01, as quoted in gas-discharge texts]: PaschenGap inverts
// PaschenVoltage; its minimum is B·e·ln(1 + 1/γ)/A ≈ 305 V at about 11 µm
// [calc from the law]; and for millimetre gaps it lies 15–25 % above the
// empirical rule V = 30 kV/cm·d + 1.35 kV [pub: the rule quoted beside the
// law for gaps of the order of a millimetre] — with these coefficients the
// law's gaps are that much short, which errs toward faster sparks and
// higher first peaks.
func TestPaschen(t *testing.T) {
	vmin := paschenB * math.E * math.Log(1+1/paschenGamma) / paschenA
	if math.Abs(paschenMin/vmin-1) > 1e-12 || math.Abs(paschenMin-305) > 1 {
		t.Errorf("Paschen minimum %g V, want %g V (≈ 305 V)", paschenMin, vmin)
	}
	for _, v := range []float64{500, 2000, 4000, 8000, 15000, 30000} {
		d, err := PaschenGap(v)
		if err != nil {
			t.Fatal(err)
		}
		if got := PaschenVoltage(d); math.Abs(got/v-1) > 1e-9 {
			t.Errorf("gap %g m breaks down at %g V, want %g V", d, got, v)
		}
	}
	for _, dmm := range []float64{1, 2, 3, 4} {
		rule := 30e3*dmm/10 + 1350
		if r := PaschenVoltage(dmm*1e-3) / rule; r < 1.15 || r > 1.25 {
			t.Errorf("%g mm: Paschen %g V, the empirical rule %g V (ratio %.3f)", dmm, PaschenVoltage(dmm*1e-3), rule, r)
		}
	}
	if _, err := PaschenGap(200); err == nil {
		t.Error("a gap found below the Paschen minimum")
	}
}

// The air discharge's spark: the gap is the Paschen gap times approach;
// approach outside (0, 1] is refused.
func TestAirGap(t *testing.T) {
	d8, _ := PaschenGap(8000)
	for _, a := range []float64{1, 0.5, 0.1} {
		s, err := mk("iec61000-4-2-air", 8000, map[string]float64{"approach": a}, nil)
		if err != nil {
			t.Fatal(err)
		}
		var sp *Spark
		for _, p := range s.Gen.Parts {
			if p.Spark != nil {
				sp = p.Spark
			}
		}
		if sp == nil || math.Abs(sp.Gap/(a*d8)-1) > 1e-12 || s.Note != AirNote {
			t.Errorf("approach %g: spark %+v", a, sp)
		}
	}
	for _, a := range []float64{1.5, -1, 0} {
		if _, err := mk("iec61000-4-2-air", 8000, map[string]float64{"approach": a}, nil); err == nil {
			t.Errorf("approach %g accepted", a)
		}
	}
}

// [calc: the spark law] The resistance after ∫i²dt = w is
// d/√(2a·w + (d/R0)²): R0 when the spark forms; once w dwarfs the seed it
// falls as 1/√w (four times the integral, half the resistance).
func TestSparkResistance(t *testing.T) {
	s := &Spark{Gap: 1e-3, A: 1e-4, R0: 1e6}
	if r := s.Resistance(0); math.Abs(r/1e6-1) > 1e-12 {
		t.Errorf("R(0) = %g Ω, want R0", r)
	}
	w := 1e-3 // A²·s, far beyond the seed's (d/R0)²/(2a) = 5e-9
	if r1, r4 := s.Resistance(w), s.Resistance(4*w); math.Abs(r1/r4-2) > 1e-5 {
		t.Errorf("R(w)/R(4w) = %g, want 2", r1/r4)
	}
	if got, want := s.Rate(), 2*1e-4/1e-6*1e12; math.Abs(got/want-1) > 1e-12 {
		t.Errorf("rate %g, want %g", got, want)
	}
}

// IEC 61000-4-4 bursts [pub]: 75 pulses at 5 kHz (15 ms) or 100 kHz
// (0.75 ms), every 300 ms; First cuts the burst to its first pulses, each
// followed by a full period; other rates are refused.
func TestEFTStandardBurst(t *testing.T) {
	for _, c := range []struct{ rate, length float64 }{{5e3, 15e-3}, {100e3, 0.75e-3}} {
		s, err := mk("eft", 1000, map[string]float64{"burst": c.rate, "count": 1, "rate": 5e3}, nil)
		if err != nil {
			t.Fatal(err)
		}
		b := s.Burst
		if s.Form != Generator || b == nil || b.Pulses != 75 || b.Every != 0.3 || len(s.Breakpoints) != 75 {
			t.Fatalf("%g Hz: %+v", c.rate, s)
		}
		if math.Abs(s.Stop/c.length-1) > 1e-12 || math.Abs(float64(b.Pulses)*b.Period/c.length-1) > 1e-12 {
			t.Errorf("%g Hz: burst lasts %g s, want %g s", c.rate, s.Stop, c.length)
		}
		f3, err := b.First(3)
		if err != nil || len(f3.Breakpoints) != 3 || math.Abs(f3.Stop-3*b.Period) > 1e-18 || !f3.Gen.SameShape(s.Gen) {
			t.Errorf("%g Hz: first 3 pulses %+v, %v", c.rate, f3, err)
		}
		if _, err := b.First(76); err == nil {
			t.Error("76 pulses cut from a burst of 75")
		}
	}
	if _, err := mk("eft", 1000, map[string]float64{"burst": 10e3}, nil); err == nil {
		t.Error("a 10 kHz burst accepted")
	}
}

// The coupling paths are the values of IEC 61000-4-5's coupling networks
// [mem]: their total impedances 2, 12 and 42 Ω; each path's circuit adds its
// capacitor (and resistor) after the generator.
func TestCouplingPaths(t *testing.T) {
	want := map[string][3]float64{"direct": {0, 0, 2}, "line-line": {18e-6, 0, 2}, "line-earth": {9e-6, 10, 12}, "io": {0.5e-6, 40, 42}}
	for _, p := range CouplingPaths {
		w := want[p.Name]
		if p.C != w[0] || p.R != w[1] || p.Total() != w[2] || p.Total() != 2+p.R {
			t.Errorf("%s: %+v", p.Name, p)
		}
		s, err := mk("surge-cwg", 1000, nil, map[string]string{"path": p.Name})
		if err != nil {
			t.Fatal(err)
		}
		nc, nr := 0, 0
		for _, q := range s.Gen.Parts {
			if q.Name == "ccpl" && q.Value == p.C {
				nc++
			}
			if q.Name == "rcpl" && q.Value == p.R {
				nr++
			}
		}
		if (p.C > 0) != (nc == 1) || (p.R > 0) != (nr == 1) {
			t.Errorf("%s: circuit %s", p.Name, s.Gen)
		}
	}
	if _, err := mk("surge-cwg", 1000, nil, map[string]string{"path": "line-sky"}); err == nil {
		t.Error("an unknown path accepted")
	}
}
