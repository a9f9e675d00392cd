package netlist

import (
	"fmt"
	"sort"
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

// suggest returns the candidate closest to s by edit distance when it is
// close enough to be a likely slip, or "".
func suggest(s string, cands []string) string {
	best, bestD := "", 1<<30
	sorted := append([]string(nil), cands...)
	sort.Strings(sorted)
	for _, c := range sorted {
		d := editDistance(strings.ToLower(s), strings.ToLower(c))
		if d < bestD {
			best, bestD = c, d
		}
	}
	limit := 2
	if len([]rune(s)) <= 3 {
		limit = 1
	}
	if bestD <= limit && bestD < len([]rune(best)) {
		return best
	}
	return ""
}

// didYouMean renders the suggestion clause of a message.
func didYouMean(s string, cands []string) string {
	if g := suggest(s, cands); g != "" {
		return fmt.Sprintf(" (did you mean %s?)", g)
	}
	return ""
}

// editDistance is the optimal-string-alignment distance between a and b in
// runes: insertions, deletions, substitutions and swaps of neighbours each
// count one, since a swap (tsv for tvs) is the commonest slip.
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	if len(ra) > 64 || len(rb) > 64 {
		return 1 << 20 // names this long are no slip of the keyboard
	}
	w := len(rb) + 1
	d := make([]int, (len(ra)+1)*w)
	for i := 0; i <= len(ra); i++ {
		d[i*w] = i
	}
	for j := 0; j <= len(rb); j++ {
		d[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			v := min(d[(i-1)*w+j]+1, d[i*w+j-1]+1, d[(i-1)*w+j-1]+cost)
			if i > 1 && j > 1 && ra[i-1] == rb[j-2] && ra[i-2] == rb[j-1] {
				v = min(v, d[(i-2)*w+j-2]+1)
			}
			d[i*w+j] = v
		}
	}
	return d[len(ra)*w+len(rb)]
}
