package whatif

import (
	"fmt"
	"strconv"
	"strings"
)

// Shard is one slice of a sweep: the items k (jobs, searches, parameters or
// drawn circuits, counted from 0 in plan order) with k mod Count = Index−1.
// Index counts from 1, as job arrays and `parallel {#}` do. The zero Shard is
// the whole sweep.
//
// Taking every Count-th item rather than a contiguous block spreads the slow
// items (high levels, long windows) evenly over the shards.
type Shard struct {
	Index, Count int
}

// ParseShard reads "i/n" with 1 ≤ i ≤ n. The empty string is the whole sweep.
func ParseShard(s string) (Shard, error) {
	if s == "" {
		return Shard{}, nil
	}
	a, b, ok := strings.Cut(s, "/")
	i, err1 := strconv.Atoi(a)
	n, err2 := strconv.Atoi(b)
	if !ok || err1 != nil || err2 != nil {
		return Shard{}, fmt.Errorf("shard %q: write i/n, for example 2/8 for the second of eight slices", s)
	}
	if n < 1 || i < 1 || i > n {
		return Shard{}, fmt.Errorf("shard %q: i must be between 1 and n (shards count from 1)", s)
	}
	return Shard{Index: i, Count: n}, nil
}

// Whole reports whether the shard is the whole sweep.
func (s Shard) Whole() bool { return s.Count <= 1 }

// Has reports whether item k belongs to the shard.
func (s Shard) Has(k int) bool { return s.Whole() || k%s.Count == s.Index-1 }

// Items lists the items of 0..n−1 in the shard, in order.
func (s Shard) Items(n int) []int {
	var out []int
	for k := range n {
		if s.Has(k) {
			out = append(out, k)
		}
	}
	return out
}

// String renders "i/n", or "" for the whole sweep.
func (s Shard) String() string {
	if s.Whole() {
		return ""
	}
	return fmt.Sprintf("%d/%d", s.Index, s.Count)
}

// ShardInfo is written into a shard's JSON so that merge can check that the
// slices belong together and that none is missing.
type ShardInfo struct {
	Index int `json:"index"`
	Count int `json:"count"`
	// Total is the number of items of the whole sweep.
	Total int `json:"total"`
}

// Info describes the shard of a sweep of total items; nil for the whole sweep.
func (s Shard) Info(total int) *ShardInfo {
	if s.Whole() {
		return nil
	}
	return &ShardInfo{Index: s.Index, Count: s.Count, Total: total}
}

// Items lists the indices of the whole sweep that this shard holds.
func (s *ShardInfo) Items() []int {
	return Shard{Index: s.Index, Count: s.Count}.Items(s.Total)
}
