package study

import (
	"encoding/json"
	"maps"
	"math"
	"slices"
	"strings"

	"zapnet/devices/spec"
)

// The JSON of a run (OUTPUT.md) writes nodes, elements and the ledger as
// objects keyed by name; these methods give the study's slices that form and
// read it back, so that a program can decode the tool's own output into the
// study's types.

// Meta identifies the tool and the deck on every machine-readable output.
type Meta struct {
	Tool    string `json:"tool"`
	Version string `json:"version"`
	Deck    string `json:"deck"`
	Title   string `json:"title"`
}

// Document is the JSON of a sweep of runs (`zapnet run`): Meta and the runs.
// Shard and Interrupted are set for a slice of a sweep or one cut short, and
// omitted otherwise, so merged shards encode exactly like the whole sweep.
type Document struct {
	Meta
	Runs        []Run      `json:"runs"`
	Shard       *ShardInfo `json:"shard,omitempty"`
	Interrupted bool       `json:"interrupted,omitempty"`
}

// NodeResults are the extremes of every node, in circuit order.
type NodeResults []NodeResult

// MarshalJSON writes {"NODE": {...}, ...}.
func (ns NodeResults) MarshalJSON() ([]byte, error) {
	return marshalNamed(ns, func(n *NodeResult) string { return n.Name })
}

// UnmarshalJSON reads the object back, nodes in name order.
func (ns *NodeResults) UnmarshalJSON(b []byte) error {
	return unmarshalNamed(b, (*[]NodeResult)(ns), func(n *NodeResult, name string) { n.Name = name })
}

// ElementResults are the measurements of every element but the strike, in
// deck order.
type ElementResults []ElementResult

// MarshalJSON writes {"ELEMENT": {...}, ...}.
func (es ElementResults) MarshalJSON() ([]byte, error) {
	return marshalNamed(es, func(e *ElementResult) string { return e.Name })
}

// UnmarshalJSON reads the object back, elements in name order.
func (es *ElementResults) UnmarshalJSON(b []byte) error {
	return unmarshalNamed(b, (*[]ElementResult)(es), func(e *ElementResult, name string) {
		e.Name = name
		if e.Residual != nil {
			e.Residual.Name = name
		}
	})
}

// ProbeResults are an element's probes.
type ProbeResults []ProbeResult

// MarshalJSON writes {"PROBE": {...}, ...}.
func (ps ProbeResults) MarshalJSON() ([]byte, error) {
	return marshalNamed(ps, func(p *ProbeResult) string { return p.Name })
}

// UnmarshalJSON reads the object back, probes in name order.
func (ps *ProbeResults) UnmarshalJSON(b []byte) error {
	return unmarshalNamed(b, (*[]ProbeResult)(ps), func(p *ProbeResult, name string) { p.Name = name })
}

// marshalNamed writes xs as one object keyed by each one's name.
func marshalNamed[T any](xs []T, name func(*T) string) ([]byte, error) {
	m := make(map[string]T, len(xs))
	for i := range xs {
		m[name(&xs[i])] = xs[i]
	}
	return json.Marshal(m)
}

// unmarshalNamed reads such an object back into *xs, in name order,
// giving each its name with setName.
func unmarshalNamed[T any](b []byte, xs *[]T, setName func(*T, string)) error {
	var m map[string]T
	if err := json.Unmarshal(b, &m); err != nil {
		return err
	}
	*xs = (*xs)[:0]
	for _, name := range slices.Sorted(maps.Keys(m)) {
		x := m[name]
		setName(&x, name)
		*xs = append(*xs, x)
	}
	return nil
}

// ledgerStrike and ledgerBalance are the two keys of the ledger's JSON that
// are not element names.
const (
	ledgerStrike  = "strike"
	ledgerBalance = "balance"
)

// MarshalJSON writes the ledger as {"strike": ..., "ELEMENT": ..., "balance":
// ...}, each entry ∫ v·i dt into it; {} for a run that was not solved.
func (l Ledger) MarshalJSON() ([]byte, error) {
	m := map[string]float64{}
	if len(l.Entries) > 0 {
		m[ledgerStrike] = l.Strike
		for _, e := range l.Entries {
			m[e.Name] = e.Energy
		}
		m[ledgerBalance] = l.Balance
	}
	return json.Marshal(m)
}

// UnmarshalJSON reads the ledger back and recomputes the shares.
func (l *Ledger) UnmarshalJSON(b []byte) error {
	var m map[string]float64
	if err := json.Unmarshal(b, &m); err != nil {
		return err
	}
	*l = Ledger{Strike: m[ledgerStrike], Balance: m[ledgerBalance]}
	for _, name := range slices.Sorted(maps.Keys(m)) {
		if name != ledgerStrike && name != ledgerBalance {
			l.Entries = append(l.Entries, LedgerEntry{Name: name, Energy: m[name]})
		}
	}
	l.share()
	return nil
}

// share sets Delivered and each entry's percentage of it.
func (l *Ledger) share() {
	l.Delivered = max(0, -l.Strike)
	for _, e := range l.Entries {
		l.Delivered += max(0, -e.Energy)
	}
	for i := range l.Entries {
		l.Entries[i].Percent = 0
		if l.Delivered > 0 {
			l.Entries[i].Percent = 100 * l.Entries[i].Energy / l.Delivered
		}
	}
}

// limitJSON is the form of a Limit in the JSON.
type limitJSON struct {
	Name     string    `json:"name"` // "U1 vmax"
	Unit     spec.Unit `json:"unit"`
	Limit    float64   `json:"limit"`
	Measured float64   `json:"measured"`
	At       *float64  `json:"at,omitempty"` // s; absent for energies
	Margin   float64   `json:"margin"`
	Percent  float64   `json:"percent"`
	// A window limit's percent is of its headroom from the operating
	// point, where the quantity sat at at_rest; absent for the others.
	Headroom *float64 `json:"headroom,omitempty"`
	Rest     *float64 `json:"at_rest,omitempty"`
}

// MarshalJSON writes the limit with its name, "ELEMENT PARAM". JSON has no
// infinity: a zero limit's percentage is written as the largest float of its
// sign.
func (l Limit) MarshalJSON() ([]byte, error) {
	j := limitJSON{Name: l.Name(), Unit: l.Unit, Limit: l.Value, Measured: l.Measured, Margin: l.Margin, Percent: l.Percent}
	if !math.IsNaN(l.At) {
		at := l.At
		j.At = &at
	}
	if math.IsInf(j.Percent, 0) {
		j.Percent = math.Copysign(math.MaxFloat64, j.Percent)
	}
	if l.Window {
		h, r := l.Headroom, l.Rest
		j.Headroom, j.Rest = &h, &r
	}
	return json.Marshal(j)
}

// UnmarshalJSON reads a limit back; which side it bounds is not in the
// JSON and is left false.
func (l *Limit) UnmarshalJSON(b []byte) error {
	var j limitJSON
	if err := json.Unmarshal(b, &j); err != nil {
		return err
	}
	elem, param := j.Name, ""
	if k := strings.LastIndexByte(j.Name, ' '); k >= 0 {
		elem, param = j.Name[:k], j.Name[k+1:]
	}
	*l = Limit{Element: elem, Param: param, Unit: j.Unit, Value: j.Limit, Measured: j.Measured,
		At: math.NaN(), Margin: j.Margin, Percent: j.Percent}
	if j.At != nil {
		l.At = *j.At
	}
	if j.Headroom != nil && j.Rest != nil {
		l.Window, l.Headroom, l.Rest = true, *j.Headroom, *j.Rest
	}
	return nil
}
