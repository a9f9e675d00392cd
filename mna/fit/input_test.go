package fit

import (
	"os"
	"strings"
	"testing"

	"zapnet/netlist/datafile"
)

// An invented pin TLP run with the leakage read at a small bias after each
// pulse: the leakage holds near 1 nA, then jumps to 3 µA after the 2.1 A
// pulse (the failure), rows after it describe a damaged pin.
const pinTLP = `v [V],i [A],leak [A]
1.5,0.0001,1.0e-9
5.9,0.01,1.1e-9
6.6,0.2,0.9e-9
7.4,0.6,1.2e-9
8.3,1.1,1.0e-9
9.6,1.6,1.3e-9
11.0,2.1,3.0e-6
9.0,2.5,8.0e-5
-0.7,-0.01,1.0e-9
-1.1,-0.5,1.1e-9
-1.8,-1.5,1.0e-9
`

func TestFailureCurrentAndPinTable(t *testing.T) {
	tl, err := datafile.ReadTLP("pin.csv", []byte(pinTLP))
	if err != nil {
		t.Fatal(err)
	}
	// The first tenfold jump of the leakage over the median before it
	// [practice: a tenfold leakage shift as the TLP failure criterion].
	var pos, neg []datafile.TLPPoint
	for _, p := range tl.Points {
		if p.I > 0 {
			pos = append(pos, p)
		} else {
			neg = append(neg, p)
		}
	}
	it2, k, ok := FailureCurrent(pos)
	if !ok || it2 != 2.1 || k != 6 {
		t.Errorf("It2 %g at row %d (%v), want 2.1 A at row 6", it2, k, ok)
	}
	if _, _, ok := FailureCurrent(neg); ok {
		t.Error("the negative rows never failed")
	}
	pt, err := PinTable(tl, 0)
	if err != nil {
		t.Fatal(err)
	}
	if pt.It2 != 2.1 {
		t.Errorf("ifail %g, want 2.1 A", pt.It2)
	}
	// Rows after the failure are out; the origin is in; voltages rise.
	wantV := []float64{-1.8, -1.1, -0.7, 0, 1.5, 5.9, 6.6, 7.4, 8.3, 9.6}
	if len(pt.V) != len(wantV) {
		t.Fatalf("table %v", pt.V)
	}
	for k := range wantV {
		if pt.V[k] != wantV[k] {
			t.Errorf("table %v, want %v", pt.V, wantV)
			break
		}
	}
	if !strings.Contains(strings.Join(pt.Notes, "\n"), "pin.csv:8:1: the leakage jumps to 3 µA after the 2.1 A pulse") {
		t.Errorf("notes %q", pt.Notes)
	}
	// A given It2 wins, with a note when the leakage disagrees.
	pt, _ = PinTable(tl, 1.8)
	if pt.It2 != 1.8 || !strings.Contains(strings.Join(pt.Notes, "\n"), "It2 given as 1.8 A; the leakage says 2.1 A") {
		t.Errorf("given It2: %g, %q", pt.It2, pt.Notes)
	}
}

func TestPinTableRefusesSnapback(t *testing.T) {
	// A curve that snaps back is not a table path; every offending row is
	// named.
	src := "v,i\n1,0.001\n9,0.05\n5,0.5\n6,1\n"
	tl, err := datafile.ReadTLP("s.csv", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	_, err = PinTable(tl, 0)
	if err == nil || !strings.Contains(err.Error(), "s.csv:4:1: 5 V at 0.5 A is not above 9 V at 0.05 A (s.csv:3:1)") {
		t.Errorf("%v", err)
	}
}

func TestDatasheetDataExample(t *testing.T) {
	src, err := os.ReadFile("../../testdata/fit/tvs5-uni.points")
	if err != nil {
		t.Fatal(err)
	}
	d, err := datafile.ReadDatasheet("tvs5-uni.points", src)
	if err != nil {
		t.Fatal(err)
	}
	data, pub, err := DatasheetData(d)
	if err != nil {
		t.Fatal(err)
	}
	if pub.Name != "tvs5u" || pub.Vrwm != 5 || pub.Ipp != 18 || pub.IppPulse != Surge8x20 || pub.Ls != 0.3e-9 {
		t.Errorf("published %+v", pub)
	}
	kinds := ""
	for _, x := range data {
		kinds += x.Kind.String() + " "
	}
	if kinds != "ir vbr vc vc c " {
		t.Errorf("data kinds %q", kinds)
	}
	if data[0].V != 5 || data[0].I != 50e-9 || data[0].Where != "tvs5-uni.points:7:1" {
		t.Errorf("leakage %+v", data[0])
	}
}
