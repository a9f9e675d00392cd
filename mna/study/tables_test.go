package study

import (
	"fmt"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"zapnet/netlist"
)

func TestTableExcursionsAndCautionsAreNoted(t *testing.T) {
	// A clamp given by the invented TLP curve of testdata/fit (rows up to
	// about 14 A before its failure) under an 8 kV strike (about 30 A): the
	// run says when the clamp left its table, each time with its times, and
	// a pin read from an IBIS file carries the file format's caution.
	tlp, _ := filepath.Abs("../../testdata/fit/tvs5-tlp.csv")
	ibs, _ := filepath.Abs("../../testdata/fit/sensor-input.ibs")
	deck := fmt.Sprintf(`strike zap a gnd waveform=iec61000-4-2 level=8k
clamp D1 a gnd table=%q ls=0.3nH ipp=40A
resistor R1 a b 10ohm
pin U1 b gnd ibis=%q model=1
`, tlp, ibs)
	c, err := netlist.Parse("t.zap", []byte(deck))
	if err != nil {
		t.Fatal(err)
	}
	r, err := solve(c, nil, 8000, "pos", &Options{})
	if err != nil {
		t.Fatal(err)
	}
	notes := strings.Join(r.Notes, "\n")
	if !regexp.MustCompile(`D1: outside its I–V table from [0-9.]+ [pn]s to [0-9.]+ [pn]s.*above its highest point`).MatchString(notes) {
		t.Errorf("no excursion note for D1:\n%s", notes)
	}
	if !strings.Contains(notes, "U1: IBIS carries no failure data") {
		t.Errorf("no IBIS caution:\n%s", notes)
	}
	// At 500 V the clamp stays within its curve: no excursion note.
	r, err = solve(c, nil, 500, "pos", &Options{})
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(strings.Join(r.Notes, "\n"), "D1: outside") {
		t.Errorf("a run inside the table was noted: %q", r.Notes)
	}
}
