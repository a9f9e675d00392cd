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
	// Order places the waveform in listings.
	Order int
	// Load is the load the standard calibrates the stimulus into, ohms
	// (+Inf: an open circuit); 0 is a short.
	Load float64

	// Rise is the shortest rise the stimulus can have, s: the low end of
	// the standard's tolerance on its front. A solver treats what is far
	// faster than it (a transmission line of a few picoseconds under an
	// 8/20 µs surge) as lumped. Zero: the builder sets the stimulus's own
	// (a TLP's rise= parameter) or it is unknown.
	Rise float64

	// Loads are further loads, ohms, into which published check points
	// are stated (the combination wave's short circuit, the fast
	// transient's 1 kΩ), after Load.
	Loads []float64

	build func(level float64, v *spec.Values) (*Stimulus, error)
	// generator: build may return a Generator circuit (eft only with
	// burst=), whose shape a strike must make room for (GeneratorShape).
	generator bool
	// checks compares s into load with the published check points,
	// measuring through m (closed form or the engine's solution); nil: no
	// published points.
	checks func(s *Stimulus, load float64, m meter) []Check
}

// registry holds the waveforms in documentation order; each waveform's
// file registers its own in init.
var registry []*Waveform

// Register adds a waveform to the catalogue. A name registered twice is a
// programming error.
func Register(w *Waveform) {
	if Lookup(w.Name) != nil {
		panic("waveforms: registered twice: " + w.Name)
	}
	if w.build == nil {
		panic("waveforms: no builder for " + w.Name)
	}
	w.Values() // panics on a table too large for a value set
	registry = append(registry, w)
	sort.SliceStable(registry, func(i, j int) bool { return registry[i].Order < registry[j].Order })
}

// Lookup returns the waveform called name, or nil.
func Lookup(name string) *Waveform {
	for _, w := range registry {
		if w.Name == name {
			return w
		}
	}
	return nil
}

// Catalogue lists every waveform in documentation order.
func Catalogue() []*Waveform { return registry }

// Names returns the waveform names, sorted.
func Names() []string {
	var names []string
	for _, w := range registry {
		names = append(names, w.Name)
	}
	sort.Strings(names)
	return names
}

// Taking lists, in documentation order, the waveforms that have the
// parameter key.
func Taking(key string) []string {
	var out []string
	for _, w := range registry {
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
	s.Values = *v
	if s.Rise == 0 {
		s.Rise = w.Rise
	}
	return s, nil
}
