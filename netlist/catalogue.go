package netlist

import (
	"fmt"
	"strings"

	"zapnet/devices"
	"zapnet/devices/spec"
	"zapnet/waveforms"
)

// The deck's statements besides the element kinds, which package devices
// lists.
var otherStatements = []string{"title", "part", "include", "watch", "vary", "tolerance", "window"}

// statementWords are the keywords that start a statement, for suggestions.
func statementWords() []string {
	words := append([]string(nil), otherStatements...)
	for _, k := range devices.Catalogue() {
		words = append(words, k.Name)
	}
	return words
}

// kindNames lists the element kinds a part can be of (every kind but the
// strike), in documentation order.
func kindNames() []string {
	var out []string
	for _, k := range devices.Catalogue() {
		if k.Role != spec.Stimulus {
			out = append(out, k.Name)
		}
	}
	return out
}

// aKind is the kind with its article, for messages.
func aKind(k *devices.Kind) string { return k.Article() + " " + k.Name }

// paramOf names a parameter in messages: "vbr of a clamp".
func paramOf(k *devices.Kind, key string) string {
	if key == "value" {
		return "the value of " + aKind(k)
	}
	return key + " of " + aKind(k)
}

// keysOf lists every key an element of kind k accepts, for suggestions.
func keysOf(k *devices.Kind) []string {
	if k.Role == spec.Stimulus {
		keys := []string{"waveform", "level", "polarity"}
		seen := map[string]bool{}
		for _, w := range waveforms.Catalogue() {
			for _, key := range w.Keys() {
				if !seen[key] {
					seen[key] = true
					keys = append(keys, key)
				}
			}
		}
		return keys
	}
	return append(k.Keys(), "part")
}

// SplitTarget splits ELEMENT.PARAM at the last dot: element names may hold
// dots, parameter names never do. ok is false when either side is empty.
func SplitTarget(s string) (elem, param string, ok bool) {
	k := strings.LastIndexByte(s, '.')
	if k <= 0 || k == len(s)-1 {
		return "", "", false
	}
	return s[:k], s[k+1:], true
}

// suggest is spec's, which the number reader's hints use too.
var suggest = spec.Suggest

// didYouMean renders the suggestion clause of a message.
func didYouMean(s string, cands []string) string {
	if g := suggest(s, cands); g != "" {
		return fmt.Sprintf(" (did you mean %s?)", g)
	}
	return ""
}
