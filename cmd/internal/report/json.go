package report

import (
	"encoding/json"
	"io"
	"math"

	"zapnet/cmd/internal/study"
)

// Meta identifies the tool and the deck on every machine-readable output.
type Meta struct {
	Tool    string `json:"tool"`
	Version string `json:"version"`
	Deck    string `json:"deck"`
	Title   string `json:"title"`
}

// Document is the JSON of `zapnet run` (OUTPUT.md).
type Document struct {
	Meta
	Runs []RunJSON `json:"runs"`
}

// RunJSON is one run. Fields beyond OUTPUT.md's example are additions: index,
// level_unit, limits, worst_margin, window, notes, error, and the extra
// measurements of nodes and elements.
type RunJSON struct {
	Index     int                    `json:"index"` // place in plan order, for merging shards
	Variant   map[string]string      `json:"variant"`
	Waveform  string                 `json:"waveform"`
	Level     float64                `json:"level"`
	LevelUnit string                 `json:"level_unit"`
	Polarity  string                 `json:"polarity"`
	Verdict   string                 `json:"verdict"`
	Failures  []string               `json:"failures"`
	Error     string                 `json:"error,omitempty"`
	Worst     *LimitJSON             `json:"worst_margin,omitempty"`
	Limits    []LimitJSON            `json:"limits"`
	Nodes     map[string]NodeJSON    `json:"nodes"`
	Elements  map[string]ElementJSON `json:"elements"`
	// Ledger holds "strike" (the strike's entry, negative: it delivers),
	// every other element by name, and "balance", their sum.
	Ledger map[string]float64 `json:"ledger"`
	Window WindowJSON         `json:"window"`
	Notes  []string           `json:"notes"`
	Stats  StatsJSON          `json:"stats"`
}

// NodeJSON is a node's voltage extremes, V and s.
type NodeJSON struct {
	Max  float64 `json:"max"`
	TMax float64 `json:"t_max"`
	Min  float64 `json:"min"`
	TMin float64 `json:"t_min"`
}

// ElementJSON is one element's stress.
type ElementJSON struct {
	Kind        string        `json:"kind"`
	PeakCurrent float64       `json:"peak_current"`
	TPeak       float64       `json:"t_peak_current"`
	Energy      float64       `json:"energy"`
	Residual    *ResidualJSON `json:"residual,omitempty"`
	// PeakVoltage is the largest |voltage| across a capacitor, V.
	PeakVoltage  *float64 `json:"peak_voltage,omitempty"`
	TPeakVoltage *float64 `json:"t_peak_voltage,omitempty"`
}

// ResidualJSON is the pulse at a protected pin.
type ResidualJSON struct {
	Peak           float64 `json:"peak"`
	TPeak          float64 `json:"t_peak"`
	Min            float64 `json:"min"`
	TMin           float64 `json:"t_min"`
	WidthAboveVmax float64 `json:"width_above_vmax"`
	WidthBelowVmin float64 `json:"width_below_vmin"`
	Energy         float64 `json:"energy"`
	IPathPeak      float64 `json:"ipath_peak"`
	TIPathPeak     float64 `json:"t_ipath_peak"`
}

// LimitJSON is one limit and its margin.
type LimitJSON struct {
	Name     string   `json:"name"` // "U1 vmax"
	Unit     string   `json:"unit"`
	Limit    float64  `json:"limit"`
	Measured float64  `json:"measured"`
	At       *float64 `json:"at,omitempty"` // s; absent for energies
	Margin   float64  `json:"margin"`
	Percent  float64  `json:"percent"`
}

// WindowJSON is the simulated span.
type WindowJSON struct {
	Stop     float64 `json:"stop"`
	Default  bool    `json:"default"`
	Extended int     `json:"extended"`
	Suggest  float64 `json:"suggest_stop,omitempty"`
}

// StatsJSON are the engine's counts; wall_s is the only field that differs
// between identical runs.
type StatsJSON struct {
	Steps    int     `json:"steps"`
	Rejected int     `json:"rejected"`
	Newton   int     `json:"newton"`
	DCNewton int     `json:"dc_newton"`
	WallS    float64 `json:"wall_s"`
}

// NewDocument converts runs into the JSON document.
func NewDocument(meta Meta, runs []study.Run) Document {
	d := Document{Meta: meta, Runs: make([]RunJSON, 0, len(runs))}
	for i := range runs {
		d.Runs = append(d.Runs, RunToJSON(&runs[i]))
	}
	return d
}

// RunToJSON converts one run.
func RunToJSON(r *study.Run) RunJSON {
	j := RunJSON{
		Index: r.Index, Variant: map[string]string{}, Waveform: r.Waveform,
		Level: r.Level, LevelUnit: r.LevelUnit, Polarity: r.Polarity,
		Verdict: string(r.Verdict), Failures: append([]string{}, r.Failures...),
		Limits: []LimitJSON{}, Nodes: map[string]NodeJSON{}, Elements: map[string]ElementJSON{},
		Ledger: map[string]float64{}, Notes: append([]string{}, r.Notes...),
		Window: WindowJSON{Stop: r.Window.Stop, Default: r.Window.Default, Extended: r.Window.Extended, Suggest: r.Window.Suggest},
		Stats: StatsJSON{Steps: r.Stats.Steps, Rejected: r.Stats.Rejected, Newton: r.Stats.Newton,
			DCNewton: r.Stats.DCNewton, WallS: r.Stats.Wall.Seconds()},
	}
	if r.Err != nil {
		j.Error = r.Err.Error()
	}
	for _, s := range r.Variant {
		j.Variant[s.Element+"."+s.Param] = s.Value
	}
	for _, l := range r.Limits {
		j.Limits = append(j.Limits, limitJSON(l))
	}
	if r.Worst != nil {
		w := limitJSON(*r.Worst)
		j.Worst = &w
	}
	for _, n := range r.Nodes {
		j.Nodes[n.Name] = NodeJSON{Max: n.Max, TMax: n.TMax, Min: n.Min, TMin: n.TMin}
	}
	for _, e := range r.Elements {
		j.Elements[e.Name] = ElementJSON{Kind: string(e.Kind), PeakCurrent: e.PeakCurrent, TPeak: e.TPeak, Energy: e.Energy}
	}
	for _, p := range r.Pins {
		e := j.Elements[p.Name]
		e.Residual = &ResidualJSON{Peak: p.Peak, TPeak: p.TPeak, Min: p.Min, TMin: p.TMin,
			WidthAboveVmax: p.AboveVmax, WidthBelowVmin: p.BelowVmin, Energy: p.Energy,
			IPathPeak: p.IPath, TIPathPeak: p.TIPath}
		j.Elements[p.Name] = e
	}
	for _, c := range r.Capacitors {
		e := j.Elements[c.Name]
		pk, at := c.Peak, c.TPeak
		e.PeakVoltage, e.TPeakVoltage = &pk, &at
		j.Elements[c.Name] = e
	}
	if r.Err == nil {
		j.Ledger["strike"] = -r.Ledger.Strike
		for _, e := range r.Ledger.Entries {
			j.Ledger[e.Name] = e.Energy
		}
		j.Ledger["balance"] = r.Ledger.Balance
	}
	return j
}

func limitJSON(l study.Limit) LimitJSON {
	j := LimitJSON{Name: l.Name(), Unit: l.Unit, Limit: l.Value, Measured: l.Measured,
		Margin: l.Margin, Percent: l.Percent}
	if !math.IsNaN(l.At) {
		at := l.At
		j.At = &at
	}
	if math.IsInf(j.Percent, 0) {
		// JSON has no infinity; a zero limit's percentage is reported as
		// the largest float of its sign.
		j.Percent = math.Copysign(math.MaxFloat64, j.Percent)
	}
	return j
}

// JSON writes the document of the runs, indented, with a final newline.
func JSON(w io.Writer, meta Meta, runs []study.Run) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(NewDocument(meta, runs))
}

// Decode reads a document written by JSON.
func Decode(r io.Reader) (Document, error) {
	var d Document
	err := json.NewDecoder(r).Decode(&d)
	return d, err
}
