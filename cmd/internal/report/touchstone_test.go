package report

import (
	"bufio"
	"bytes"
	"flag"
	"math"
	"math/cmplx"
	"os"
	"strconv"
	"strings"
	"testing"

	"zapnet/mna"
	"zapnet/netlist"
)

// update rewrites the Touchstone reference files of testdata/reference
// instead of checking them: go test ./cmd/internal/report -update.
var update = flag.Bool("update", false, "rewrite the Touchstone files under testdata/reference")

// readTouchstone parses a version-1 two-port file as the format defines it
// [pub: Touchstone File Format Specification, version 1.1]: '!' comments,
// one option line '# <unit> S <MA|DB|RI> R <z0>', then per frequency the
// pairs of S11 S21 S12 S22. Only what this package writes is read (S, RI).
func readTouchstone(t *testing.T, data []byte) (unit string, z0 float64, freq []float64, s [][2][2]complex128) {
	t.Helper()
	sc := bufio.NewScanner(bytes.NewReader(data))
	options := 0
	for sc.Scan() {
		line := sc.Text()
		if i := strings.IndexByte(line, '!'); i >= 0 {
			line = line[:i]
		}
		f := strings.Fields(line)
		if len(f) == 0 {
			continue
		}
		if f[0] == "#" {
			options++
			if len(f) != 6 || f[2] != "S" || f[3] != "RI" || f[4] != "R" {
				t.Fatalf("option line %q", line)
			}
			unit = f[1]
			z0, _ = strconv.ParseFloat(f[5], 64)
			continue
		}
		if options != 1 {
			t.Fatalf("data before the option line: %q", line)
		}
		if len(f) != 9 {
			t.Fatalf("data line with %d numbers, want 9: %q", len(f), line)
		}
		var v [9]float64
		for k := range v {
			var err error
			if v[k], err = strconv.ParseFloat(f[k], 64); err != nil {
				t.Fatal(err)
			}
		}
		freq = append(freq, v[0])
		var m [2][2]complex128
		m[0][0], m[1][0] = complex(v[1], v[2]), complex(v[3], v[4])
		m[0][1], m[1][1] = complex(v[5], v[6]), complex(v[7], v[8])
		s = append(s, m)
	}
	return unit, z0, freq, s
}

func TestTouchstoneLayout(t *testing.T) {
	var b bytes.Buffer
	m := [2][2]complex128{{complex(0.1, -0.2), complex(0.3, 0.4)}, {complex(-0.5, 0.6), complex(0.7, -0.8)}}
	if err := Touchstone(&b, []float64{1e6, 2.5e9}, [][2][2]complex128{m, m}, 50, []string{"deck x.zap", "two\nlines"}); err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSuffix(b.String(), "\n"), "\n")
	want := []string{
		"! deck x.zap", "! two", "! lines", "! " + Caution, "# Hz S RI R 50",
		// N11 N21 N12 N22: S21 is m[1][0].
		"1000000 0.1 -0.2 -0.5 0.6 0.3 0.4 0.7 -0.8",
		"2500000000 0.1 -0.2 -0.5 0.6 0.3 0.4 0.7 -0.8",
	}
	if strings.Join(lines, "\n") != strings.Join(want, "\n") {
		t.Errorf("got\n%s\nwant\n%s", b.String(), strings.Join(want, "\n"))
	}
	if err := Touchstone(&b, []float64{2, 1}, [][2][2]complex128{m, m}, 50, nil); err == nil {
		t.Error("decreasing frequencies accepted")
	}
	if err := Touchstone(&b, nil, nil, 0, nil); err == nil {
		t.Error("a zero reference impedance accepted")
	}
}

// referenceTwoPort is network A of testdata/reference (ac-a.zap) between
// its ports P1 (conn) and P2 (p), 50 Ω, over the sweep ac.py reads back.
func referenceTwoPort(t *testing.T) ([]float64, [][2][2]complex128) {
	c, err := netlist.ParseFile("../../../testdata/reference/ac-a.zap")
	if err != nil {
		t.Fatal(err)
	}
	sys, err := mna.Compile(c)
	if err != nil {
		t.Fatal(err)
	}
	// The engine's shunt conductance (Gmin, 1e-12 S by default) moves
	// the clamp's bias by 0.3 µV and S by up to 4e-8 at 6 GHz; ac.py leaves
	// it out, so it is made negligible here to compare the models alone.
	a, err := sys.Linearize(&mna.Settings{Gmin: 1e-20})
	if err != nil {
		t.Fatal(err)
	}
	freq := mna.LogFrequencies(10e3, 6e9, 10)
	ports := [2]mna.Port{{Name: "P1", Pair: mna.Pair{Node: "conn"}, Z0: 50}, {Name: "P2", Pair: mna.Pair{Node: "p"}, Z0: 50}}
	s := make([][2][2]complex128, len(freq))
	for k, f := range freq {
		if s[k], err = a.TwoPort(f, ports); err != nil {
			t.Fatal(err)
		}
	}
	return freq, s
}

// The Touchstone file of network A that testdata/reference/ac.py reads back
// with a general-purpose RF library (scikit-rf) and compares with its own
// solution: it must still be what zapnet writes, to the 12 figures written.
// go test -update rewrites it (then rerun ac.py).
func TestTouchstoneReferenceFile(t *testing.T) {
	const path = "../../../testdata/reference/ac-a.s2p"
	freq, s := referenceTwoPort(t)
	var b bytes.Buffer
	comments := []string{"zapnet small-signal two-port of testdata/reference/ac-a.zap", "ports P1 conn-gnd and P2 p-gnd, 50 ohm; engine shunt Gmin 1e-20 S"}
	if err := Touchstone(&b, freq, s, 50, comments); err != nil {
		t.Fatal(err)
	}
	if *update {
		if err := os.WriteFile(path, b.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	unit, z0, rf, rs := readTouchstone(t, data)
	if unit != "Hz" || z0 != 50 || len(rf) != len(freq) {
		t.Fatalf("%s: unit %q, z0 %g, %d points; want Hz, 50, %d", path, unit, z0, len(rf), len(freq))
	}
	for k := range freq {
		if math.Abs(rf[k]/freq[k]-1) > 1e-11 {
			t.Fatalf("%s: frequency %d is %g, want %g", path, k, rf[k], freq[k])
		}
		for i := range 2 {
			for j := range 2 {
				if d := cmplx.Abs(rs[k][i][j] - s[k][i][j]); d > 1e-10 {
					t.Errorf("%s: S%d%d at %g Hz is %v, zapnet now gives %v", path, i+1, j+1, freq[k], rs[k][i][j], s[k][i][j])
				}
			}
		}
	}
}

// A non-reciprocal two-port, written for ac.py to read back: with S12 ≠ S21
// it tells whether a general-purpose reader finds S21 where this writer
// puts it (a reciprocal network cannot).
func TestTouchstoneOrderFile(t *testing.T) {
	m := [2][2]complex128{{complex(0.1, 0.2), complex(0.5, 0.6)}, {complex(0.3, 0.4), complex(0.7, 0.8)}}
	var b bytes.Buffer
	if err := Touchstone(&b, []float64{1e9, 2e9}, [][2][2]complex128{m, m}, 50,
		[]string{"order check: S11 0.1+0.2j, S21 0.3+0.4j, S12 0.5+0.6j, S22 0.7+0.8j"}); err != nil {
		t.Fatal(err)
	}
	const path = "../../../testdata/reference/ac-order.s2p"
	if *update {
		if err := os.WriteFile(path, b.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	if data, err := os.ReadFile(path); err != nil || !bytes.Equal(data, b.Bytes()) {
		t.Errorf("%s is not what the writer writes now (%v); go test -update rewrites it, then rerun ac.py", path, err)
	}
}
