package datafile

import (
	"errors"
	"math"
	"math/cmplx"
	"strings"
	"testing"
)

func TestReadTLP(t *testing.T) {
	src := "# an invented TLP run\nv [V], i [mA], leak [A]\n0.5, 0.001, 1e-9\n6.9, 10, 1.1e-9\n7.4, 1000, \n8.2, 3000, 1.2e-9\n-0.8, -500, 1e-9\n-1.2,-2000,-1.1e-9\n"
	tl, err := ReadTLP("t.csv", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	if len(tl.Points) != 6 || !tl.HasLeak {
		t.Fatalf("%d points, leak %v", len(tl.Points), tl.HasLeak)
	}
	if p := tl.Points[2]; p.I != 1 || !math.IsNaN(p.Leak) || p.Pos.Line != 5 {
		t.Errorf("row 3: %+v (i [mA] scales by 1e-3; blank leak is NaN)", p)
	}
	_, pos := tl.Side(1)
	_, neg := tl.Side(-1)
	if len(pos) != 4 || len(neg) != 2 {
		t.Errorf("polarities: %d positive, %d negative", len(pos), len(neg))
	}
	if tl.Points[5].Leak != 1.1e-9 {
		t.Errorf("a leakage reading is a magnitude: %g", tl.Points[5].Leak)
	}
	if len(tl.Notes) != 0 {
		t.Errorf("a monotone curve drew notes: %v", tl.Notes)
	}
}

func TestTLPFlagsNonMonotone(t *testing.T) {
	src := "v,i\n1,0.001\n9,0.05\n5,0.5\n6,1\n7,0.8\n"
	tl, err := ReadTLP("s.csv", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	got := tl.Notes.Error()
	for _, want := range []string{
		"s.csv:4:1: warning: the voltage falls from 9 V to 5 V as the current rises",
		"s.csv:6:1: warning: the current falls from 1 A to 0.8 A",
	} {
		if !strings.Contains(got, want) {
			t.Errorf("notes %q lack %q", got, want)
		}
	}
	for _, n := range tl.Notes {
		if !errors.Is(n, ErrOrder) {
			t.Errorf("%v is not ErrOrder", n)
		}
	}
}

func TestCSVErrors(t *testing.T) {
	for _, c := range []struct{ src, want string }{
		{"v,i\n1,2\n3,x\n", "e.csv:3:3: column \"i\": \"x\" is not a number"},
		{"v,i\n1\n", "e.csv:2:2: the row ends before column \"i\""},
		{"volts,i\n1,2\n", "e.csv:1:1: no column \"v\" in the header"},
		{"v [A],i\n1,2\n", "e.csv:1:1: column \"v\": wants volts (V), not amperes"},
		{"v [V, i\n1,2\n", "e.csv:1:1: column \"v [V\": the unit's bracket is not closed"},
		{"# nothing\n", "e.csv: no header line"},
	} {
		_, err := ReadTLP("e.csv", []byte(c.src))
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: %v, want %q", c.src, err, c.want)
		}
	}
}

func TestReadImpedance(t *testing.T) {
	// |Z| with phase in degrees, the same points as r and x:
	// 100∠30° = 86.60254038 + j50 Ω [calc].
	a, err := ReadImpedance("a.csv", []byte("f [MHz],z [ohm],phase [deg]\n1,2,80\n100,100,30\n"))
	if err != nil {
		t.Fatal(err)
	}
	b, err := ReadImpedance("b.csv", []byte("f,r,x\n1e6,0.3472963553,1.969615506\n1e8,86.60254038,50\n"))
	if err != nil {
		t.Fatal(err)
	}
	for k := range 2 {
		za, zb := a.Curves[0].Points[k].Z, b.Curves[0].Points[k].Z
		if cmplx.Abs(za-zb) > 1e-8*cmplx.Abs(za) || a.Curves[0].Points[k].F != b.Curves[0].Points[k].F {
			t.Errorf("point %d: %v at %g Hz vs %v at %g Hz", k, za, a.Curves[0].Points[k].F, zb, b.Curves[0].Points[k].F)
		}
	}
	if !a.Complex || !b.Complex {
		t.Error("phase or r and x make the curve complex")
	}
	// An instrument's header spells the ohm as it likes [practice].
	for _, h := range []string{"Ohm", "Ohms", "kOhm"} {
		z, err := ReadImpedance("h.csv", []byte("f [MHz],z ["+h+"],phase [deg]\n1,2,80\n"))
		if err != nil {
			t.Errorf("[%s]: %v", h, err)
			continue
		}
		want := 2.0
		if h == "kOhm" {
			want = 2000
		}
		if got := cmplx.Abs(z.Curves[0].Points[0].Z); math.Abs(got-want) > 1e-9*want {
			t.Errorf("[%s]: |Z| %g, want %g", h, got, want)
		}
	}
	// Bias curves.
	c, err := ReadImpedance("c.csv", []byte("f,z,idc [mA]\n1e6,5,500\n1e8,300,500\n1e6,6,0\n1e8,600,0\n"))
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Curves) != 2 || c.Curves[0].Bias != 0 || c.Curves[1].Bias != 0.5 || c.Complex {
		t.Errorf("curves %+v", c.Curves)
	}
	for _, bad := range []struct{ src, want string }{
		{"f,z\n1e6,5\n1e5,6\n", "d.csv:3:1: frequency 100000 Hz does not rise"},
		{"f,z\n1e6,-5\n", "d.csv:2:5: |Z| = -5 Ω: a magnitude must be > 0"},
		{"f,r\n1,2\n", "d.csv:1:1: r and x come together"},
		{"f,phase\n1,2\n", "d.csv:1:1: a phase column needs a z column"},
		{"f,z,phase [rad]\n1,2,3\n", "d.csv:1:5: column \"phase\": angles are in degrees"},
	} {
		_, err := ReadImpedance("d.csv", []byte(bad.src))
		if err == nil || !strings.Contains(err.Error(), bad.want) {
			t.Errorf("%q: %v, want %q", bad.src, err, bad.want)
		}
	}
}
