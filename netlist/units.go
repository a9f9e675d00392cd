package netlist

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"zapnet/devices/spec"
	"zapnet/waveforms"
)

// number is a numeric literal of a deck: its value in SI units, the unit
// written after it ("" when none) and whether it was a percentage.
type number struct {
	val     float64
	unit    spec.Unit
	percent bool
}

// parseNumber reads a number by the deck's rules (spec.ParseNumber), a
// trailing % taken when allowPercent is set. It returns a message fit for
// a user when the text is not a number.
func parseNumber(s string, allowPercent bool) (number, string) {
	n, msg := spec.ParseNumber(s, allowPercent)
	return number{val: n.Value, unit: n.Unit, percent: n.Percent}, msg
}

// ParseValue reads text as the deck reads a parameter's value: a number with
// an optional SI prefix and unit, where a unit written must be unit and the
// value must keep rule. what names the value in the error ("--max").
// Values from the command line go through it, so that they follow the
// deck's rules exactly.
func ParseValue(what, text string, unit spec.Unit, rule spec.Rule) (float64, error) {
	v, msg := numValue(what, unit, rule, strings.TrimSpace(text))
	if msg != "" {
		return 0, errors.New(msg)
	}
	return v, nil
}

// ParseLevels reads a comma-separated list of levels of waveform w as the
// strike's level= reads them: positive numbers in the waveform's unit.
func ParseLevels(list string, w *waveforms.Waveform) ([]float64, error) {
	var out []float64
	var errs []error
	for _, text := range strings.Split(list, ",") {
		v, msg := levelValue(strings.TrimSpace(text), w)
		if msg != "" {
			errs = append(errs, errors.New(msg))
			continue
		}
		out = append(out, v)
	}
	return out, errors.Join(errs...)
}

// levelValue reads one level of waveform w (nil: unknown, any unit).
func levelValue(text string, w *waveforms.Waveform) (float64, string) {
	n, msg := parseNumber(text, false)
	switch {
	case msg != "":
		return 0, msg
	case n.unit != "" && w != nil && n.unit != w.Unit:
		if w.Unit == "" {
			return 0, fmt.Sprintf("%s is in %s, but the levels of waveform %s are plain scale factors", text, n.unit.Word(), w.Name)
		}
		return 0, fmt.Sprintf("%s is in %s, but the levels of waveform %s are in %s", text, n.unit.Word(), w.Name, w.Unit.Word())
	case !(n.val > 0) || math.IsInf(n.val, 0):
		return 0, fmt.Sprintf("level %s must be positive (polarity= gives the sign)", text)
	}
	return n.val, ""
}
