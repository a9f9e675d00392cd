package netlist

import (
	"reflect"
	"testing"
)

// The generator waveforms on a strike line: path= is a word of surge-cwg
// only, with a suggestion for a slip; approach= and burst= are numbers of
// their waveforms only [LANGUAGE.md's behaviour on bad input].
func TestGeneratorStrikeErrors(t *testing.T) {
	second := "2:8: second strike zap; a deck has exactly one (the first is s2 at t.zap:1:8)"
	for _, c := range []struct {
		name, src string
		want      []string
	}{
		{"path slip", "strike s2 tst gnd waveform=surge-cwg level=1k path=line-erth",
			[]string{"1:52: strike path is direct, line-line, line-earth or io, not line-erth (did you mean line-earth?)", second}},
		{"path of another waveform", "strike s2 tst gnd waveform=surge-1.2-50 level=1k path=io",
			[]string{"1:50: path is a parameter of waveform surge-cwg, not of surge-1.2-50", second}},
		{"approach of another waveform", "strike s2 tst gnd waveform=iec61000-4-2-network level=8k approach=0.5",
			[]string{"1:58: approach is a parameter of waveform iec61000-4-2-air, not of iec61000-4-2-network", second}},
		{"burst of another waveform", "strike s2 tst gnd waveform=tlp level=8 burst=5k",
			[]string{"1:40: burst is a parameter of waveform eft, not of tlp", second}},
		{"burst unit", "strike s2 tst gnd waveform=eft level=1k burst=5kV",
			[]string{"1:47: 5kV is in volts, but burst of waveform eft is in hertz", second}},
		{"air level unit", "strike s2 tst gnd waveform=iec61000-4-2-air level=15kA",
			[]string{"1:51: 15kA is in amperes, but the levels of waveform iec61000-4-2-air are in volts", second}},
	} {
		errs, _ := problemsOf(t, c.src)
		if !reflect.DeepEqual(errs, c.want) {
			t.Errorf("%s:\n got  %q\n want %q", c.name, errs, c.want)
		}
	}
}

// Read as meant: the words and numbers reach the strike element, levels in
// volts, and an air discharge above 30 kV draws the discharge warning.
func TestGeneratorStrikeRead(t *testing.T) {
	c, err := Parse("t.zap", []byte("strike zap a gnd waveform=surge-cwg level=500,1k path=line-earth\nresistor R a gnd 1k\n"))
	if err != nil {
		t.Fatal(err)
	}
	s := c.Strike()
	if s.Values.Word("path") != "line-earth" || !reflect.DeepEqual(s.Levels, []float64{500, 1000}) || s.Waveform.Unit != "V" {
		t.Errorf("strike %+v", s)
	}
	c, err = Parse("t.zap", []byte("strike zap a gnd waveform=eft level=2k burst=100k\nresistor R a gnd 1k\n"))
	if err != nil {
		t.Fatal(err)
	}
	if s := c.Strike(); s.Values.Num("burst") != 100e3 {
		t.Errorf("burst %g", s.Values.Num("burst"))
	}
	c, err = Parse("t.zap", []byte("strike zap a gnd waveform=iec61000-4-2-air level=15k,35k\nresistor R a gnd 1k\n"))
	if err != nil {
		t.Fatal(err)
	}
	if s := c.Strike(); s.Values.Num("approach") != 1 || len(c.Warnings) != 1 {
		t.Errorf("air: approach %g (want the default 1), warnings %v", s.Values.Num("approach"), c.Warnings)
	}
}
