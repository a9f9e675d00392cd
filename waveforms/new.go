package waveforms

import (
	"fmt"
	"math"
	"sort"

	"zapnet/devices/spec"
)

// Waveform is one stimulus of the catalogue, described once: its name in a
// deck, the unit of its levels, its parameters and how to build it. The deck
// checker, the study and the waveform command all read it from here.
type Waveform struct {
	Name    string
	Summary string
	// Unit is the unit of the levels: volts for the discharges, the voltage
	// surge and EFT, amperes for the current surge and TLP, none for a
	// piecewise-linear file (a scale factor).
	Unit spec.Unit
	// Level is a typical level, used by the waveform command when none is
	// given.
	Level float64
	// Discharge marks an electrostatic discharge, whose levels above about
	// 30 kV are beyond any test standard.
	Discharge bool
	// Table lists the waveform's parameters: the strike's keys besides
	// waveform, level and polarity.
	spec.Table
	build func(level float64, v *spec.Values) (*Stimulus, error)
}

// catalogue lists every waveform in documentation order.
var catalogue = []*Waveform{
	{Name: "iec61000-4-2", Unit: spec.Volt, Level: 4000, Discharge: true,
		Summary: "IEC 61000-4-2 contact discharge, ideal current of the informative annex",
		build:   newIEC61000_4_2},
	{Name: "hbm", Unit: spec.Volt, Level: 4000, Discharge: true,
		Summary: "human-body model (JS-001): 100 pF through 1.5 kΩ and a series inductance",
		Table:   spec.Table{Params: []spec.Param{spec.Optional("l", spec.Henry, spec.NonNegative)}},
		build:   newHBM},
	{Name: "iso10605", Unit: spec.Volt, Level: 4000, Discharge: true,
		Summary: "ISO 10605 discharge network: 150 or 330 pF through 330 Ω or 2 kΩ",
		Table: spec.Table{Params: []spec.Param{
			spec.Default("c", spec.Farad, spec.Positive, isoC),
			spec.Default("r", spec.Ohm, spec.Positive, isoR),
			spec.Optional("l", spec.Henry, spec.NonNegative),
		}},
		build: newISO10605},
	{Name: "surge-8-20", Unit: spec.Ampere, Level: 500,
		Summary: "IEC 61000-4-5 8/20 µs short-circuit current, ideal current source",
		build:   newSurge8_20},
	{Name: "surge-1.2-50", Unit: spec.Volt, Level: 1000,
		Summary: "IEC 61000-4-5 1.2/50 µs open-circuit voltage behind 2 Ω",
		Table:   spec.Table{Params: []spec.Param{spec.Default("r", spec.Ohm, spec.Positive, surgeR)}},
		build:   newSurge1_2_50},
	{Name: "tlp", Unit: spec.Ampere, Level: 8,
		Summary: "transmission-line pulse: trapezoid from a 50 Ω source, level = current into a short",
		Table: spec.Table{Params: []spec.Param{
			spec.Default("width", spec.Second, spec.Positive, tlpWidth),
			spec.Default("rise", spec.Second, spec.Positive, tlpRise),
		}},
		build: newTLP},
	{Name: "eft", Unit: spec.Volt, Level: 1000,
		Summary: "IEC 61000-4-4 5/50 ns fast transient (or a burst) from a 50 Ω source",
		Table: spec.Table{Params: []spec.Param{
			spec.Default("count", spec.Dimensionless, spec.Count, 1),
			spec.Default("rate", spec.Hertz, spec.Positive, eftRate),
		}},
		build: newEFT},
	{Name: "pwl", Unit: spec.Dimensionless, Level: 1,
		Summary: "piecewise-linear current from a CSV file (time,current), scaled by the level",
		Table:   spec.Table{Words: []spec.Word{{Key: "file", Path: true, Fixed: true}}},
		build:   newPWL},
}

// Lookup returns the waveform called name, or nil.
func Lookup(name string) *Waveform {
	for _, w := range catalogue {
		if w.Name == name {
			return w
		}
	}
	return nil
}

// Catalogue lists every waveform in documentation order.
func Catalogue() []*Waveform { return catalogue }

// Names returns the waveform names, sorted.
func Names() []string {
	var names []string
	for _, w := range catalogue {
		names = append(names, w.Name)
	}
	sort.Strings(names)
	return names
}

// Taking lists, in documentation order, the waveforms that have the
// parameter key.
func Taking(key string) []string {
	var out []string
	for _, w := range catalogue {
		if w.Param(key) != nil || w.Word(key) != nil {
			out = append(out, w.Name)
		}
	}
	return out
}

// New builds the stimulus at level (in the waveform's Unit), of positive
// polarity. v holds the strike's checked parameters, of the waveform's
// table; nil means every default.
func (w *Waveform) New(level float64, v *spec.Values) (*Stimulus, error) {
	if math.IsNaN(level) || math.IsInf(level, 0) || level <= 0 {
		return nil, fmt.Errorf("%s: level must be a positive finite number, got %g", w.Name, level)
	}
	if v == nil {
		d := w.Defaults()
		v = &d
	} else if v.Table() != &w.Table {
		return nil, fmt.Errorf("%s: parameters of another table", w.Name)
	}
	s, err := w.build(level, v)
	if err != nil {
		return nil, err
	}
	s.Name = w.Name
	s.Level = level
	s.Unit = string(w.Unit)
	return s, nil
}
