package whatif

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"sort"
)

// SketchAccuracy is the relative accuracy α of the spread's sketches: every
// percentile read from one is within 0.1 % of the exact value (see Sketch).
const SketchAccuracy = 0.001

// Sketch summarises a stream of numbers in logarithmic buckets so that any
// quantile can be read back to a stated relative accuracy, in memory that
// grows with the span of the values (their ratio, largest to smallest)
// but not with their count. It is the sketch of C. Masson, J. E. Rim and
// H. K. Lee, "DDSketch: a fast and fully-mergeable quantile sketch with
// relative-error guarantees", PVLDB 12(12), 2019, 2195–2205, kept without
// its limit on the number of buckets, so that its bound holds at every
// quantile:
//
// With γ = (1+α)/(1−α), bucket i holds the x with γ^(i−1) < |x| ≤ γ^i
// (positive and negative values apart, zero counted alone). Every x in
// bucket i is within α·|x| of the bucket's value 2γ^i/(γ+1), so the value
// read for the r-th smallest item x_r is within α·|x_r| of it (the paper's
// α-accuracy). A quantile interpolates as Quantile does (Hyndman and Fan's
// definition 7) between the values read for the two order statistics
// x_lo ≤ x_hi around it, so it is within α·max(|x_lo|, |x_hi|) of the
// exact quantile, which is α·|exact| when the two have one sign. The
// smallest and largest items are kept exactly, and values read are held
// within them.
//
// A bucket is a count, so merging adds counts: the sketch of joined
// streams is the same, bit for bit, as the sketch of their items added one
// by one in any order (Merge).
type Sketch struct {
	alpha, gamma, lnGamma float64
	pos, neg              []bucket // ascending index; neg holds |x|
	zeros                 int
	n                     int
	min, max              float64
}

// bucket is the count of items of one bucket index.
type bucket struct {
	index, count int
}

// NewSketch returns an empty sketch of relative accuracy alpha, 0 < alpha
// < 1.
func NewSketch(alpha float64) *Sketch {
	if !(alpha > 0 && alpha < 1) {
		panic(fmt.Sprintf("whatif: sketch accuracy %g outside (0, 1)", alpha))
	}
	g := (1 + alpha) / (1 - alpha)
	return &Sketch{alpha: alpha, gamma: g, lnGamma: math.Log(g)}
}

// Alpha is the sketch's relative accuracy.
func (s *Sketch) Alpha() float64 { return s.alpha }

// Count is the number of items added.
func (s *Sketch) Count() int { return s.n }

// Min and Max are the smallest and the largest item, exactly (NaN when
// empty).
func (s *Sketch) Min() float64 {
	if s.n == 0 {
		return math.NaN()
	}
	return s.min
}

func (s *Sketch) Max() float64 {
	if s.n == 0 {
		return math.NaN()
	}
	return s.max
}

// Add counts x. x must be finite.
func (s *Sketch) Add(x float64) {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		panic(fmt.Sprintf("whatif: sketch of %g", x))
	}
	switch {
	case x > 0:
		s.pos = addCount(s.pos, s.index(x), 1)
	case x < 0:
		s.neg = addCount(s.neg, s.index(-x), 1)
	default:
		s.zeros++
	}
	if s.n == 0 {
		s.min, s.max = x, x
	} else {
		// math.Min and math.Max order −0 below +0, so the extremes do not
		// depend on the order the items came in.
		s.min, s.max = math.Min(s.min, x), math.Max(s.max, x)
	}
	s.n++
}

// index is the bucket of a positive x: ⌈log_γ x⌉.
func (s *Sketch) index(x float64) int {
	return int(math.Ceil(math.Log(x) / s.lnGamma))
}

// addCount adds c to bucket i of the ascending list b.
func addCount(b []bucket, i, c int) []bucket {
	k := sort.Search(len(b), func(j int) bool { return b[j].index >= i })
	if k < len(b) && b[k].index == i {
		b[k].count += c
		return b
	}
	b = append(b, bucket{})
	copy(b[k+1:], b[k:])
	b[k] = bucket{i, c}
	return b
}

// Merge adds the items of o to s. The sketches must have the same
// accuracy.
func (s *Sketch) Merge(o *Sketch) error {
	if o.alpha != s.alpha {
		return fmt.Errorf("sketches of accuracy %g and %g cannot be merged", s.alpha, o.alpha)
	}
	if o.n == 0 {
		return nil
	}
	s.pos = mergeBuckets(s.pos, o.pos)
	s.neg = mergeBuckets(s.neg, o.neg)
	s.zeros += o.zeros
	if s.n == 0 {
		s.min, s.max = o.min, o.max
	} else {
		s.min, s.max = math.Min(s.min, o.min), math.Max(s.max, o.max)
	}
	s.n += o.n
	return nil
}

// mergeBuckets joins two ascending lists, adding the counts of a bucket in
// both.
func mergeBuckets(a, b []bucket) []bucket {
	if len(b) == 0 {
		return a
	}
	out := make([]bucket, 0, len(a)+len(b))
	i, j := 0, 0
	for i < len(a) || j < len(b) {
		switch {
		case j == len(b) || (i < len(a) && a[i].index < b[j].index):
			out = append(out, a[i])
			i++
		case i == len(a) || b[j].index < a[i].index:
			out = append(out, b[j])
			j++
		default:
			out = append(out, bucket{a[i].index, a[i].count + b[j].count})
			i++
			j++
		}
	}
	return out
}

// Clone returns an independent copy of s.
func (s *Sketch) Clone() *Sketch {
	c := *s
	c.pos = append([]bucket(nil), s.pos...)
	c.neg = append([]bucket(nil), s.neg...)
	return &c
}

// SketchBucket is one bucket of a sketch as values: Count items x with
// Lo < x ≤ Hi for a positive bucket, Lo ≤ x < Hi for a negative one,
// x = 0 when Lo = Hi = 0. The outer bounds are held within the smallest
// and largest item.
type SketchBucket struct {
	Lo, Hi float64
	Count  int
}

// Buckets lists the sketch's buckets in ascending order of value.
func (s *Sketch) Buckets() []SketchBucket {
	out := make([]SketchBucket, 0, len(s.neg)+len(s.pos)+1)
	for k := len(s.neg) - 1; k >= 0; k-- {
		b := s.neg[k]
		out = append(out, SketchBucket{-s.power(b.index), -s.power(b.index - 1), b.count})
	}
	if s.zeros > 0 {
		out = append(out, SketchBucket{0, 0, s.zeros})
	}
	for _, b := range s.pos {
		out = append(out, SketchBucket{s.power(b.index - 1), s.power(b.index), b.count})
	}
	if len(out) > 0 {
		out[0].Lo = math.Max(out[0].Lo, s.min)
		out[len(out)-1].Hi = math.Min(out[len(out)-1].Hi, s.max)
	}
	return out
}

// power is γ^i.
func (s *Sketch) power(i int) float64 { return math.Exp(float64(i) * s.lnGamma) }

// Rank returns the value the sketch holds for the r-th smallest item
// (0-based, 0 ≤ r < Count): the exact minimum and maximum at the ends,
// else its bucket's value, within α of the item's.
func (s *Sketch) Rank(r int) float64 {
	if r < 0 || r >= s.n {
		panic(fmt.Sprintf("whatif: rank %d of a sketch of %d", r, s.n))
	}
	if r == 0 {
		return s.min
	}
	if r == s.n-1 {
		return s.max
	}
	mid := 2 / (s.gamma + 1)
	seen := 0
	for k := len(s.neg) - 1; k >= 0; k-- {
		if seen += s.neg[k].count; r < seen {
			return s.within(-mid * s.power(s.neg[k].index))
		}
	}
	if seen += s.zeros; r < seen {
		return 0
	}
	for _, b := range s.pos {
		if seen += b.count; r < seen {
			return s.within(mid * s.power(b.index))
		}
	}
	panic("whatif: a sketch's counts do not add up to its count")
}

// within holds v within the smallest and the largest item.
func (s *Sketch) within(v float64) float64 { return math.Min(math.Max(v, s.min), s.max) }

// Quantile returns the p-quantile (0 ≤ p ≤ 1) read from the sketch, by the
// rule of Quantile: h = (Count−1)·p, interpolated between the values of
// ranks ⌊h⌋ and ⌊h⌋+1. NaN when empty.
func (s *Sketch) Quantile(p float64) float64 {
	if s.n == 0 {
		return math.NaN()
	}
	h := float64(s.n-1) * p
	lo := int(math.Floor(h))
	if lo < 0 {
		return s.min
	}
	if lo >= s.n-1 {
		return s.max
	}
	a := s.Rank(lo)
	if t := h - float64(lo); t > 0 {
		return a + t*(s.Rank(lo+1)-a)
	}
	return a
}

// sketchJSON is a sketch in a shard's JSON: the accuracy, the extremes,
// the count of zeros and [index, count] pairs of the positive and the
// negative buckets (those of |x|), ascending in index.
type sketchJSON struct {
	Alpha    float64  `json:"alpha"`
	Min      float64  `json:"min"`
	Max      float64  `json:"max"`
	Zeros    int      `json:"zeros"`
	Positive [][2]int `json:"positive"`
	Negative [][2]int `json:"negative"`
}

// MarshalJSON writes the sketch exactly: read back, it is the same sketch.
func (s *Sketch) MarshalJSON() ([]byte, error) {
	j := sketchJSON{Alpha: s.alpha, Min: s.min, Max: s.max, Zeros: s.zeros,
		Positive: pairs(s.pos), Negative: pairs(s.neg)}
	return json.Marshal(j)
}

func pairs(b []bucket) [][2]int {
	out := make([][2]int, len(b))
	for k, x := range b {
		out[k] = [2]int{x.index, x.count}
	}
	return out
}

// UnmarshalJSON reads a sketch MarshalJSON wrote, and refuses one that no
// sketch could be.
func (s *Sketch) UnmarshalJSON(b []byte) error {
	var j sketchJSON
	if err := json.Unmarshal(b, &j); err != nil {
		return err
	}
	if !(j.Alpha > 0 && j.Alpha < 1) {
		return fmt.Errorf("sketch accuracy %g outside (0, 1)", j.Alpha)
	}
	*s = *NewSketch(j.Alpha)
	var err error
	if s.pos, err = fromPairs(j.Positive); err != nil {
		return err
	}
	if s.neg, err = fromPairs(j.Negative); err != nil {
		return err
	}
	if j.Zeros < 0 {
		return errors.New("sketch: a negative count of zeros")
	}
	s.zeros = j.Zeros
	s.n = s.zeros
	for _, x := range s.pos {
		s.n += x.count
	}
	for _, x := range s.neg {
		s.n += x.count
	}
	s.min, s.max = j.Min, j.Max
	if s.n > 0 && !(s.min <= s.max) {
		return fmt.Errorf("sketch: smallest item %g above the largest %g", s.min, s.max)
	}
	return nil
}

func fromPairs(p [][2]int) ([]bucket, error) {
	out := make([]bucket, len(p))
	for k, x := range p {
		if x[1] < 1 || (k > 0 && x[0] <= p[k-1][0]) {
			return nil, errors.New("sketch: buckets must be in ascending order with positive counts")
		}
		out[k] = bucket{x[0], x[1]}
	}
	return out, nil
}
