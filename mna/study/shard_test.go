package study

import (
	"strings"
	"testing"
)

func TestParseShard(t *testing.T) {
	for _, c := range []struct {
		in   string
		want Shard
		ok   bool
	}{
		{"", Shard{}, true}, {"1/1", Shard{1, 1}, true}, {"3/8", Shard{3, 8}, true},
		{"0/4", Shard{}, false}, {"5/4", Shard{}, false}, {"1/0", Shard{}, false},
		{"2", Shard{}, false}, {"a/b", Shard{}, false}, {"-1/3", Shard{}, false},
	} {
		got, err := ParseShard(c.in)
		if (err == nil) != c.ok || (c.ok && got != c.want) {
			t.Errorf("ParseShard(%q) = %v, %v; want %v, ok %v", c.in, got, err, c.want, c.ok)
		}
	}
}

func TestShardsPartition(t *testing.T) {
	// [practice] n shards must hold every item exactly once.
	for n := 1; n <= 7; n++ {
		seen := make([]int, 23)
		for i := 1; i <= n; i++ {
			for _, k := range (Shard{i, n}).Items(len(seen)) {
				seen[k]++
			}
		}
		for k, c := range seen {
			if c != 1 {
				t.Fatalf("%d shards: item %d held %d times", n, k, c)
			}
		}
	}
	// Len and Item walk the same items as Items, for counts the shard
	// does not reach too.
	for n := 0; n <= 9; n++ {
		for count := 1; count <= 5; count++ {
			for i := 1; i <= count; i++ {
				s := Shard{i, count}
				items := s.Items(n)
				if s.Len(n) != len(items) {
					t.Fatalf("shard %d/%d of %d: Len %d, Items %v", i, count, n, s.Len(n), items)
				}
				for j, k := range items {
					if s.Item(j) != k {
						t.Fatalf("shard %d/%d: Item(%d) = %d, want %d", i, count, j, s.Item(j), k)
					}
				}
			}
		}
	}
	if err := Complete([]int{0, 2, 1}, 3, "runs"); err != nil {
		t.Error(err)
	}
	if err := Complete([]int{0, 2}, 3, "runs"); err == nil {
		t.Error("a missing index must be an error")
	}
	if err := Complete([]int{0, 1, 1, 2}, 3, "runs"); err == nil {
		t.Error("a repeated index must be an error")
	}
}

// A merge missing a shard names it as the user gave it, not as indices.
func TestMissingShardNamed(t *testing.T) {
	infos := []*ShardInfo{{Index: 1, Count: 3, Total: 9}, {Index: 3, Count: 3, Total: 9}}
	err := Joined(infos, []int{0, 3, 6, 2, 5, 8}, 9, "runs")
	if err == nil || !strings.Contains(err.Error(), "shard 2/3 is missing") {
		t.Errorf("got %v, want shard 2/3 named", err)
	}
	if err := AllShards(infos, 9); err == nil || !strings.Contains(err.Error(), "shard 2/3 is missing") {
		t.Errorf("AllShards: got %v, want shard 2/3 named", err)
	}
	if err := AllShards(append(infos, infos[0]), 9); err == nil || !strings.Contains(err.Error(), "given twice") {
		t.Errorf("AllShards of a shard given twice: %v", err)
	}
	if err := AllShards(append(infos, &ShardInfo{Index: 2, Count: 3, Total: 9}), 9); err != nil {
		t.Errorf("AllShards of every shard: %v", err)
	}
}
