package mna

import (
	"math"
	"math/cmplx"
	"strconv"
	"strings"
	"testing"

	"zapnet/internal/refdata"
	"zapnet/netlist"
)

// readComplexCSV reads a file of testdata/reference/ac.py: a freq column,
// then NAME_re, NAME_im pairs.
func readComplexCSV(t testing.TB, path string) (freq []float64, cols map[string][]complex128) {
	t.Helper()
	head, rows := refdata.Read(t, path)
	cols = map[string][]complex128{}
	for _, rec := range rows {
		v := make([]float64, len(rec))
		for k, s := range rec {
			var err error
			if v[k], err = strconv.ParseFloat(s, 64); err != nil {
				t.Fatal(err)
			}
		}
		freq = append(freq, v[0])
		for k := 1; k+1 < len(head); k += 2 {
			name := strings.TrimSuffix(head[k], "_re")
			cols[name] = append(cols[name], complex(v[k], v[k+1]))
		}
	}
	return freq, cols
}

func referenceAC(t testing.TB, deck string, set *Settings) *AC {
	t.Helper()
	c, err := netlist.ParseFile("../testdata/reference/" + deck)
	if err != nil {
		t.Fatal(err)
	}
	s, err := Compile(c)
	if err != nil {
		t.Fatal(err)
	}
	a, err := s.Linearize(set)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

// The small-signal responses of the two reference networks against the
// independent solution of testdata/reference/ac.py (chain matrices for A,
// a nodal matrix of closed-form branch impedances for B, junctions at an
// operating point found with SciPy's brentq; see the README there). With the
// engine's shunt made negligible (Gmin 1e-20 S; ac.py has none) every
// quantity agrees to 1e-11 of its magnitude (S-parameters to 1e-11
// absolute; measured: 6e-13 at worst); with the default Gmin (1e-12 S) to
// 1e-7 (measured: 4e-8), the shunt's effect at the 10 kΩ pull-up and on the
// clamp's bias.
func TestACAgainstReference(t *testing.T) {
	ports := []Port{{Name: "P1", Pair: Pair{Node: "conn"}, Z0: 50}, {Name: "P2", Pair: Pair{Node: "p"}, Z0: 50}}
	for _, tc := range []struct {
		name string
		set  *Settings
		tol  float64
	}{{"Gmin 1e-20 S", &Settings{Gmin: 1e-20}, 1e-11}, {"default Gmin", nil, 1e-7}} {
		// Network A: transfers and impedance from conn with both ports
		// terminated, and the two-port.
		freq, ref := readComplexCSV(t, "../testdata/reference/ac-a.csv")
		a := referenceAC(t, "ac-a.zap", tc.set)
		worst := map[string]float64{}
		h := make([]complex128, 2)
		for k, f := range freq {
			zin, err := a.Response(f, Pair{Node: "conn"}, ports, []Pair{{Node: "a"}, {Node: "p"}}, h)
			if err != nil {
				t.Fatal(err)
			}
			S, err := a.TwoPort(f, [2]Port{ports[0], ports[1]})
			if err != nil {
				t.Fatal(err)
			}
			for name, got := range map[string]complex128{"H_a": h[0], "H_p": h[1], "Zin": zin} {
				worst[name] = math.Max(worst[name], relErr(got, ref[name][k]))
			}
			for name, got := range map[string]complex128{"S11": S[0][0], "S21": S[1][0], "S12": S[0][1], "S22": S[1][1]} {
				worst[name] = math.Max(worst[name], cmplx.Abs(got-ref[name][k]))
			}
		}
		// Network B: transfer and impedance at in, the bead and C2 alone.
		freq, ref = readComplexCSV(t, "../testdata/reference/ac-b.csv")
		b := referenceAC(t, "ac-b.zap", tc.set)
		h = h[:1]
		for k, f := range freq {
			zin, err := b.Response(f, Pair{Node: "in"}, nil, []Pair{{Node: "out"}}, h)
			if err != nil {
				t.Fatal(err)
			}
			zb, err := b.ElementImpedance("FB1", f)
			if err != nil {
				t.Fatal(err)
			}
			zc, err := b.ElementImpedance("C2", f)
			if err != nil {
				t.Fatal(err)
			}
			for name, got := range map[string]complex128{"H_out": h[0], "Zin": zin, "Z_FB1": zb, "Z_C2": zc} {
				worst["B."+name] = math.Max(worst["B."+name], relErr(got, ref[name][k]))
			}
		}
		for name, w := range worst {
			if w > tc.tol {
				t.Errorf("%s: %s differs from the reference by %.3g (allowed %.0g)", tc.name, name, w, tc.tol)
			} else {
				t.Logf("%s: %s within %.2g", tc.name, name, w)
			}
		}
	}
}

// Network B's peaking, found by FindPeaking on the sweep ac.py uses, against
// the reference's own refinement (SciPy's bounded scalar search on log f).
func TestACPeakingAgainstReference(t *testing.T) {
	_, rows := refdata.Read(t, "../testdata/reference/ac-peak.csv")
	want := make([]float64, 3)
	var err error
	for k := range want {
		if want[k], err = strconv.ParseFloat(rows[0][k+1], 64); err != nil {
			t.Fatal(err)
		}
	}
	a := referenceAC(t, "ac-b.zap", &Settings{Gmin: 1e-20})
	freq := LogFrequencies(10e3, 6e9, 10)
	gain := func(f float64) (float64, error) {
		h := make([]complex128, 1)
		_, err := a.Response(f, Pair{Node: "in"}, nil, []Pair{{Node: "out"}}, h)
		return cmplx.Abs(h[0]), err
	}
	mag := make([]float64, len(freq))
	for k, fr := range freq {
		if mag[k], err = gain(fr); err != nil {
			t.Fatal(err)
		}
	}
	p, ok, err := FindPeaking(freq, mag, gain)
	if err != nil || !ok {
		t.Fatalf("no peak: %v", err)
	}
	// A maximum is flat: 1e-9 in |h| leaves about 1e-5 in its frequency.
	if math.Abs(p.Freq/want[0]-1) > 2e-5 || math.Abs(p.Gain/want[1]-1) > 1e-9 || math.Abs(p.RiseDB-want[2]) > 1e-8 {
		t.Errorf("peak %.9g at %.9g Hz (+%.9g dB), reference %.9g at %.9g Hz (+%.9g dB)", p.Gain, p.Freq, p.RiseDB, want[1], want[0], want[2])
	}
}
