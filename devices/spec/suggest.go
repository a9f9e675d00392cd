package spec

import (
	"sort"
	"strings"
)

// Suggest returns the candidate closest to s by edit distance when it is
// close enough to be a likely slip, or "".
func Suggest(s string, cands []string) string {
	best, bestD := "", 1<<30
	sorted := append([]string(nil), cands...)
	sort.Strings(sorted)
	for _, c := range sorted {
		d := EditDistance(strings.ToLower(s), strings.ToLower(c))
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

// EditDistance is the optimal-string-alignment distance between a and b in
// runes: insertions, deletions, substitutions and swaps of neighbours each
// count one, since a swap (tsv for tvs) is the commonest slip.
func EditDistance(a, b string) int {
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
