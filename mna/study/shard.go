package study

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

// Len is the number of items of 0..n−1 in the shard.
func (s Shard) Len(n int) int {
	switch {
	case s.Whole():
		return n
	case s.Index > n:
		return 0
	}
	return (n-s.Index)/s.Count + 1
}

// Item is the shard's i-th item (from 0), for 0 ≤ i < Len: a sweep too long
// to list its items (Items) walks them one by one.
func (s Shard) Item(i int) int {
	if s.Whole() {
		return i
	}
	return s.Index - 1 + i*s.Count
}

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

// Complete checks that the indices of merged shards cover 0…total−1 exactly
// once; what names the items in messages ("runs", "searches").
func Complete(indices []int, total int, what string) error {
	seen := make([]bool, total)
	var dup []string
	for _, i := range indices {
		if i < 0 || i >= total {
			return fmt.Errorf("%s index %d is outside the study's %d: the shards are not of one study", what, i, total)
		}
		if seen[i] {
			dup = append(dup, fmt.Sprint(i))
		}
		seen[i] = true
	}
	if len(dup) > 0 {
		return fmt.Errorf("%s %s appear in more than one shard: give each shard once", what, short(dup))
	}
	var missing []string
	for i, ok := range seen {
		if !ok {
			missing = append(missing, fmt.Sprint(i))
		}
	}
	if len(missing) > 0 {
		return fmt.Errorf("%d of %d %s are missing (indices %s): a shard is missing or was interrupted", len(missing), total, what, short(missing))
	}
	return nil
}

// short lists at most ten items.
func short(s []string) string {
	if len(s) > 10 {
		return strings.Join(s[:10], ", ") + ", …"
	}
	return strings.Join(s, ", ")
}

// Joined checks what every merge checks of the joined shards: that
// they are of one split of total items, none missing (AllShards), and
// that indices name each item once (Complete).
func Joined(infos []*ShardInfo, indices []int, total int, what string) error {
	if err := AllShards(infos, total); err != nil {
		return err
	}
	return Complete(indices, total, what)
}

// AllShards checks that infos are of one split of total items (sameShards)
// with every shard there once, a missing one named as "shard 2/3 is
// missing". A merge that holds no item indices (a spread's statistics)
// checks the count of items of each shard itself (Shard.Len).
func AllShards(infos []*ShardInfo, total int) error {
	if err := sameShards(infos, total); err != nil {
		return err
	}
	return missingShards(infos)
}

// missingShards names the shards of the split that infos are of that are
// not among them.
func missingShards(infos []*ShardInfo) error {
	count := 0
	have := map[int]bool{}
	for _, s := range infos {
		if s != nil {
			count = s.Count
			have[s.Index] = true
		}
	}
	var missing []string
	for i := 1; i <= count; i++ {
		if !have[i] {
			missing = append(missing, fmt.Sprintf("%d/%d", i, count))
		}
	}
	switch len(missing) {
	case 0:
		return nil
	case 1:
		return fmt.Errorf("shard %s is missing: merge every shard of the sweep", missing[0])
	}
	return fmt.Errorf("shards %s are missing: merge every shard of the sweep", strings.Join(missing, ", "))
}

// sameShards checks that the shard infos are of one split of total items.
func sameShards(infos []*ShardInfo, total int) error {
	seen := map[int]bool{}
	for _, s := range infos {
		if s == nil {
			continue
		}
		if s.Total != total {
			return fmt.Errorf("a shard of %d items and a study of %d: the shards are not of one study", s.Total, total)
		}
		if seen[s.Index] {
			return fmt.Errorf("shard %d/%d is given twice", s.Index, s.Count)
		}
		seen[s.Index] = true
	}
	return nil
}
