package devices

import (
	"math"
	"testing"
)

// An invented pin table, both polarities: a lower diode below 0 V, an
// internal clamp above 6 V.
var (
	pinTabV = []float64{-3, -1.2, -0.9, -0.7, -0.5, 0, 3.3, 6.0, 6.5, 7.0, 8.0, 10.0}
	pinTabI = []float64{-1.9, -0.45, -0.2, -0.02, -1e-4, 0, 1e-8, 1e-4, 0.05, 0.3, 0.95, 2.4}
)

func mustTable(t testing.TB, v, i []float64) *IVTable {
	t.Helper()
	tab, err := NewIVTable(v, i)
	if err != nil {
		t.Fatal(err)
	}
	return tab
}

func TestIVTableThroughPointsAndMonotone(t *testing.T) {
	// A monotone Hermite interpolant passes through every point, and
	// monotone data give a monotone curve [pub: Fritsch & Carlson, SIAM J.
	// Numer. Anal. 17 (1980); Fritsch & Butland 1984].
	tab := mustTable(t, pinTabV, pinTabI)
	for k := range pinTabV {
		if i, _ := tab.Eval(pinTabV[k]); i != pinTabI[k] {
			t.Errorf("i(%g) = %g, table %g", pinTabV[k], i, pinTabI[k])
		}
	}
	prev := math.Inf(-1)
	for v := -5.0; v <= 12; v += 1e-3 {
		i, g := tab.Eval(v)
		if i < prev || g < 0 {
			t.Fatalf("not monotone at %g V: i %g after %g, slope %g", v, i, prev, g)
		}
		prev = i
		// The slope is the derivative of the current.
		h := 1e-6
		ip, _ := tab.Eval(v + h)
		im, _ := tab.Eval(v - h)
		if d := (ip - im) / (2 * h); math.Abs(d-g) > 1e-5*math.Max(1, math.Abs(g)) {
			t.Fatalf("slope at %g V: %g, difference %g", v, g, d)
		}
	}
	// Beyond the points: a straight line with the end slope, continuous.
	_, gEnd := tab.Eval(10)
	i12, g12 := tab.Eval(12)
	if g12 != gEnd || math.Abs(i12-(2.4+2*gEnd)) > 1e-12 {
		t.Errorf("extension: i(12) = %g with slope %g, want %g with %g", i12, g12, 2.4+2*gEnd, gEnd)
	}
	if b := tab.Beyond(12); b != 2 {
		t.Errorf("Beyond(12) = %g, want 2", b)
	}
	if b := tab.Beyond(-4); b != -1 {
		t.Errorf("Beyond(−4) = %g, want −1", b)
	}
	if b := tab.Beyond(1); b != 0 {
		t.Errorf("Beyond(1) = %g, want 0", b)
	}
}

func TestIVTableRefusesNonMonotone(t *testing.T) {
	for _, c := range []struct {
		v, i []float64
		want string
	}{
		{[]float64{0, 1, 1}, []float64{0, 1, 2}, "point 3: voltage 1 V does not rise above 1 V"},
		{[]float64{0, 5, 6, 7}, []float64{0, 0.1, 0.05, 1}, "point 3: current falls from 0.1 A to 0.05 A"},
		{[]float64{0}, []float64{0}, "at least 2 points"},
	} {
		if _, err := NewIVTable(c.v, c.i); err == nil || !contains(err.Error(), c.want) {
			t.Errorf("%v %v: %v, want %q", c.v, c.i, err, c.want)
		}
	}
}

func tableCases(t testing.TB) map[string]TableSpec {
	low := mustTable(t, pinTabV, pinTabI)
	up := mustTable(t, []float64{-3.3, -0.6, -0.3, 0, 0.3, 0.6, 0.9, 3.3}, []float64{0, 0, 0, 0, 1e-6, 2e-3, 0.08, 0.5})
	return map[string]TableSpec{
		"bare":    {Name: "U1", Nodes: [2]string{"p", "gnd"}, Low: low},
		"clamp":   {Name: "D1", Nodes: [2]string{"p", "gnd"}, Low: low, Ls: 0.4e-9, C: 20e-12},
		"ibis":    {Name: "U2", Nodes: [2]string{"p", "gnd"}, Low: low, Up: up, UpRef: 3.3, Rs: 0.3, Ls: 2e-9, C: 3e-12, Cpkg: 0.5e-12},
		"rail":    {Name: "U3", Nodes: [2]string{"p", "gnd"}, Rail: "vdd", Low: low, Up: up, Rs: 0.3, C: 3e-12},
		"rs-only": {Name: "U4", Nodes: [2]string{"p", "gnd"}, Low: low, Rs: 1},
	}
}

func TestTablePathJacobian(t *testing.T) {
	for name, s := range tableCases(t) {
		d, err := NewTablePath(s)
		if err != nil {
			t.Fatal(err)
		}
		terms := []int{0, Ground}
		if s.Rail != "" {
			terms = append(terms, 1)
		}
		r := newNLRig(t, d, terms...)
		r.c.Gmin = 1e-12
		for seed := uint64(1); seed <= 6; seed++ {
			x := nlRandom(r.n, 8, seed)
			r.checkJacobian(t, x, "table path "+name)
		}
	}
}

func TestTablePathProbes(t *testing.T) {
	// ipath is the current through the tables (not the capacitances);
	// beyond says how far outside its table a path's voltage is.
	s := tableCases(t)["rail"]
	d, _ := NewTablePath(s)
	r := newNLRig(t, d, 0, Ground, 1)
	x := make([]float64, r.n)
	x[0], x[1] = 12, 3.3 // p and vdd
	x[2] = 11.5          // the die, behind rs
	dst := make([]float64, 2)
	d.Probe(x, dst)
	il, _ := s.Low.Eval(11.5)
	iu, _ := s.Up.Eval(11.5 - 3.3)
	if math.Abs(dst[0]-(il+iu)) > 1e-12 {
		t.Errorf("ipath %g, want %g", dst[0], il+iu)
	}
	if math.Abs(dst[1]-(8.2-3.3)) > 1e-12 {
		t.Errorf("beyond %g, want %g (the up path, 8.2 V across a table ending at 3.3 V)", dst[1], 8.2-3.3)
	}
}

func TestTablePathSpecErrors(t *testing.T) {
	low := mustTable(t, pinTabV, pinTabI)
	for _, c := range []struct {
		s    TableSpec
		want string
	}{
		{TableSpec{Name: "U1"}, "U1: a table path needs its table"},
		{TableSpec{Name: "U1", Low: low, C: -1}, "c must be >= 0"},
		{TableSpec{Name: "U1", Low: low, Rail: "vdd"}, "a rail node needs an up table"},
	} {
		if _, err := NewTablePath(c.s); err == nil || !contains(err.Error(), c.want) {
			t.Errorf("%+v: %v, want %q", c.s, err, c.want)
		}
	}
}

func TestNewKindsAllocateNothing(t *testing.T) {
	// ARCHITECTURE.md: a model never allocates in its stamp path.
	type tc struct {
		name  string
		d     Device
		terms []int
	}
	var cases []tc
	for name, s := range tableCases(t) {
		d, _ := NewTablePath(s)
		terms := []int{0, Ground}
		if s.Rail != "" {
			terms = append(terms, 1)
		}
		cases = append(cases, tc{"table " + name, d, terms})
	}
	for _, bi := range []bool{false, true} {
		s := snapSpec
		s.Bi = bi
		d, _ := NewSnapback(s)
		cases = append(cases, tc{"snapback", d, []int{0, Ground}})
	}
	for _, c := range cases {
		r := newNLRig(t, c.d, c.terms...)
		r.c.Gmin, r.c.Alpha, r.c.T = 1e-12, 1e9, 1e-9
		copy(r.c.X, nlRandom(r.n, 3, 9))
		for _, dc := range []bool{true, false} {
			r.c.DC = dc
			if n := testing.AllocsPerRun(100, func() { c.d.Eval(&r.c) }); n != 0 {
				t.Errorf("%s (dc=%v): Eval allocates %g times per call", c.name, dc, n)
			}
		}
		if p, ok := c.d.(Prober); ok {
			dst := make([]float64, len(p.Probes()))
			if n := testing.AllocsPerRun(100, func() { p.Probe(r.c.X, dst) }); n != 0 {
				t.Errorf("%s: Probe allocates %g times per call", c.name, n)
			}
		}
	}
}
