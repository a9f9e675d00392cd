package datafile

import (
	"errors"
	"os"
	"strings"
	"testing"
)

func TestReadDatasheetExample(t *testing.T) {
	src, err := os.ReadFile("../../testdata/fit/tvs5-uni.points")
	if err != nil {
		t.Fatal(err)
	}
	d, err := ReadDatasheet("tvs5-uni.points", src)
	if err != nil {
		t.Fatal(err)
	}
	if d.Name != "tvs5u" || d.Model != "clamp" || d.Polarity != "uni" {
		t.Errorf("header %+v", d)
	}
	vc := d.Get("vc")
	if len(vc) != 2 || vc[0].Value != 10.3 || vc[0].At != 5 || vc[0].Pulse != "8/20" || vc[1].Pulse != "tlp" {
		t.Errorf("vc points %+v", vc)
	}
	if ir, ok := d.One("ir"); !ok || ir.Value != 50e-9 || ir.At != 5 {
		t.Errorf("ir %+v", ir)
	}
	if c, _ := d.One("c"); c.Value != 38e-12 || c.At != 0 {
		t.Errorf("c %+v", c)
	}
	if ipp, _ := d.One("ipp"); ipp.Pulse != "8/20" || ipp.HasAt() {
		t.Errorf("ipp %+v", ipp)
	}
}

func TestDatasheetAtForms(t *testing.T) {
	// '@' may touch its neighbours or stand alone; columns stay those of the
	// text as written.
	for _, line := range []string{"vbr 6.8V@1mA", "vbr 6.8V @ 1mA", "vbr 6.8V@ 1mA", "vbr  6.8V  @1mA"} {
		d, err := ReadDatasheet("p", []byte(line))
		if err != nil {
			t.Fatalf("%q: %v", line, err)
		}
		if p := d.Points[0]; p.Value != 6.8 || p.At != 1e-3 {
			t.Errorf("%q: %+v", line, p)
		}
	}
	_, err := ReadDatasheet("p", []byte("vbr  6.8V  @1mV"))
	if err == nil || !strings.Contains(err.Error(), "p:1:13: \"1mV\": wants amperes") {
		t.Errorf("column after '@': %v", err)
	}
}

func TestDatasheetErrors(t *testing.T) {
	for _, c := range []struct {
		src, want string
		kind      error
	}{
		{"vc 9V @ 5A", "p:1:1: vc needs the pulse it was measured with", ErrMissing},
		{"vc 9V @ 5A 8/21", "p:1:12: unknown pulse \"8/21\"", ErrSyntax},
		{"vbr 6.8V", "p:1:1: vbr needs its condition", ErrMissing},
		{"vbr 6.8A @ 1mA", "p:1:5: \"6.8A\": wants volts (V), not amperes", ErrNumber},
		{"vbr 6.8V @ 1mA\nvbr 7V @ 1mA", "p:2:1: vbr given twice (first at line 1)", ErrSyntax},
		{"vrwm 5V @ 1uA", "p:1:9: vrwm takes no condition", ErrSyntax},
		{"vbr -6.8V @ 1mA", "p:1:5: vbr must be > 0", ErrRange},
		{"polarity both", "p:1:10: polarity is uni or bi", ErrSyntax},
		{"foo 1V", "p:1:1: unknown key \"foo\"", ErrSyntax},
		{"ron 0.5ohm extra", "p:1:12: unexpected \"extra\": ron takes no pulse", ErrSyntax},
		{"# only a comment\n", "p: no datasheet points", ErrMissing},
	} {
		_, err := ReadDatasheet("p", []byte(c.src))
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: %v, want %q", c.src, err, c.want)
			continue
		}
		if !errors.Is(err, c.kind) {
			t.Errorf("%q: %v is not %v", c.src, err, c.kind)
		}
	}
}
