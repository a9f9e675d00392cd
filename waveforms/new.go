package waveforms

import (
	"fmt"
	"math"
	"sort"
	"strings"
)

// waveform is one entry of the catalogue: how to build a stimulus by name.
type waveform struct {
	name    string
	unit    string  // unit of the level: "V", "A" or "" (a scale)
	level   float64 // default level for the waveform command
	summary string
	build   func(level float64, p params) (*Stimulus, error)
}

// catalogue lists every waveform New knows, in the order Names reports them.
func catalogue() []waveform {
	return []waveform{
		{"iec61000-4-2", "V", 4000, "IEC 61000-4-2 contact discharge, ideal current of the informative annex", newIEC61000_4_2},
		{"iec61000-4-2-network", "V", 4000, "IEC 61000-4-2 contact discharge from the generator network: 150 pF, 330 Ω and its fast parasitic branch", newIECNetwork},
		{"iec61000-4-2-air", "V", 8000, "IEC 61000-4-2 air discharge: the generator network through a spark (Rompe–Weizel) across the Paschen gap", newIECAir},
		{"hbm", "V", 4000, "human-body model (JS-001): 100 pF through 1.5 kΩ and a series inductance", newHBM},
		{"iso10605", "V", 4000, "ISO 10605 discharge network: 150 or 330 pF through 330 Ω or 2 kΩ", newISO10605},
		{"surge-8-20", "A", 500, "IEC 61000-4-5 8/20 µs short-circuit current, ideal current source", newSurge8_20},
		{"surge-1.2-50", "V", 1000, "IEC 61000-4-5 1.2/50 µs open-circuit voltage behind 2 Ω", newSurge1_2_50},
		{"surge-cwg", "V", 1000, "IEC 61000-4-5 combination wave generator (1.2/50 µs open, 8/20 µs short) with its coupling path", newSurgeCWG},
		{"tlp", "A", 8, "transmission-line pulse: trapezoid from a 50 Ω source, level = current into a short", newTLP},
		{"eft", "V", 1000, "IEC 61000-4-4 5/50 ns fast transient (or a burst) from a 50 Ω source", newEFTAny},
		{"pwl", "", 1, "piecewise-linear current from a CSV file (time,current), scaled by the level", newPWL},
	}
}

func lookup(name string) (waveform, error) {
	for _, w := range catalogue() {
		if w.name == name {
			return w, nil
		}
	}
	return waveform{}, fmt.Errorf("unknown waveform %q (known: %s)", name, strings.Join(Names(), ", "))
}

// Names returns the waveform names New accepts, sorted.
func Names() []string {
	var names []string
	for _, w := range catalogue() {
		names = append(names, w.name)
	}
	sort.Strings(names)
	return names
}

// Info describes a waveform for listings and for the waveform command.
type Info struct {
	Name    string
	Unit    string  // unit of the level: "V", "A", or "" for a dimensionless scale
	Level   float64 // a typical level, used when none is given
	Summary string
}

// Describe returns what the catalogue says about a waveform.
func Describe(name string) (Info, error) {
	w, err := lookup(name)
	if err != nil {
		return Info{}, err
	}
	return Info{Name: w.name, Unit: w.unit, Level: w.level, Summary: w.summary}, nil
}

// New builds the stimulus name at level (in the waveform's unit: volts for
// iec61000-4-2, hbm, iso10605, surge-1.2-50 and eft; amperes for surge-8-20
// and tlp; a dimensionless scale for pwl). num holds the strike's numeric
// parameters and str its word parameters; absent keys take the defaults
// documented beside each waveform, unknown keys are ignored (the deck parser
// owns their validation). The stimulus is of positive polarity.
func New(name string, level float64, num map[string]float64, str map[string]string) (*Stimulus, error) {
	w, err := lookup(name)
	if err != nil {
		return nil, err
	}
	if math.IsNaN(level) || math.IsInf(level, 0) || level <= 0 {
		return nil, fmt.Errorf("%s: level must be a positive finite number, got %g", name, level)
	}
	s, err := w.build(level, params{name: name, num: num, str: str})
	if err != nil {
		return nil, err
	}
	s.Name = name
	s.Level = level
	s.Unit = w.unit
	s.Params, s.Words = num, str
	return s, nil
}

// params reads a strike's parameters with defaults and range checks.
type params struct {
	name string
	num  map[string]float64
	str  map[string]string
}

// positive returns num[key], or def when absent; it must be finite and > 0.
func (p params) positive(key string, def float64) (float64, error) {
	v, ok := p.num[key]
	if !ok {
		return def, nil
	}
	if math.IsNaN(v) || math.IsInf(v, 0) || v <= 0 {
		return 0, fmt.Errorf("%s: parameter %s must be a positive finite number, got %g", p.name, key, v)
	}
	return v, nil
}

// nonNegative returns num[key], or def when absent; it must be finite and >= 0.
func (p params) nonNegative(key string, def float64) (float64, error) {
	v, ok := p.num[key]
	if !ok {
		return def, nil
	}
	if math.IsNaN(v) || math.IsInf(v, 0) || v < 0 {
		return 0, fmt.Errorf("%s: parameter %s must be a finite number >= 0, got %g", p.name, key, v)
	}
	return v, nil
}
