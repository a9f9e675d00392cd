package main

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"zapnet/cmd/internal/report"
	"zapnet/devices/spec"
	"zapnet/mna"
	"zapnet/netlist"
	"zapnet/waveforms"
)

// waveformOptions are the settings of `zapnet waveform`.
type waveformOptions struct {
	name  string
	level float64 // in the waveform's unit; 0: the catalogue's typical level
	load  float64 // ohms, +Inf open; negative: the prescribed load
	csv   string  // file for the sampled waveform; empty: none
	json  string  // file for the checks as JSON, "-" for stdout; empty: none
	// params are the waveform's parameters, checked; nil: every default.
	params *spec.Values
}

// runWaveform prints a waveform's calibration checks and, with --csv, writes
// the waveform itself.
func runWaveform(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("waveform",
		"waveform NAME [--level L] [--load R|short|open] [--set key=value]... [--csv FILE] [--json FILE]",
		`  zapnet waveform iec61000-4-2 --level 8k
  zapnet waveform hbm --level 2kV --load 500 --csv hbm-500ohm.csv
  zapnet waveform iso10605 --set c=330p --set r=2k
  zapnet waveform pwl --set file=measured.csv --level 1
  zapnet waveform iec61000-4-2-network --level 8k --json checks.json
  zapnet waveform surge-cwg --load short --set path=line-earth
  zapnet waveform eft --set burst=100k --load 1000

A generator circuit (iec61000-4-2-network, iec61000-4-2-air, surge-cwg,
eft with burst=) is solved by the circuit engine into the load: the
generator's self-check against its standard's calibration.

Waveforms: `+strings.Join(waveforms.Names(), ", ")+`.
Levels are in the waveform's unit (V for discharges, eft and surge-1.2-50;
A for surge-8-20 and tlp; a scale for pwl) and take SI prefixes (4k, 8kV).`,
		stderr)
	level := fs.String("level", "", "level in the waveform's unit, e.g. 4k or 8kV (default: a typical level)")
	load := fs.String("load", "", "resistive load for the checks and the CSV, ohms, short or open (default: the load the standard prescribes)")
	sets := fs.StringArray("set", nil, "waveform parameter key=value, as on the deck's strike line (repeatable)")
	csvPath := fs.String("csv", "", "write the waveform as CSV to `FILE` (time, current and, for source networks, voltage)")
	jsonPath := fs.String("json", "", "write the checks as JSON to `FILE` (- for stdout, the report then goes to stderr)")
	if err := fs.Parse(args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		return fmt.Errorf("waveform: want one waveform name (one of %s), got %d arguments", strings.Join(waveforms.Names(), ", "), fs.NArg())
	}
	opt := waveformOptions{name: fs.Arg(0), load: waveforms.DefaultLoad, csv: *csvPath, json: *jsonPath}
	wf := waveforms.Lookup(opt.name)
	if wf == nil {
		return fmt.Errorf("waveform: unknown waveform %q (known: %s)", opt.name, strings.Join(waveforms.Names(), ", "))
	}
	var errs []error
	if *level != "" {
		ls, err := netlist.ParseLevels(*level, wf)
		if err == nil && len(ls) != 1 {
			err = errors.New("give one level")
		}
		if err != nil {
			errs = append(errs, fmt.Errorf("--level: %w", err))
		} else {
			opt.level = ls[0]
		}
	}
	if *load != "" {
		switch strings.ToLower(*load) {
		case "open", "inf":
			opt.load = math.Inf(1)
		case "short":
			opt.load = 0
		default:
			v, err := netlist.ParseValue("a load", *load, spec.Ohm, spec.NonNegative)
			if err != nil {
				errs = append(errs, fmt.Errorf("--load: %w (or short, or open)", err))
			}
			opt.load = v
		}
	}
	if len(*sets) > 0 {
		v := wf.Values()
		for _, kv := range *sets {
			if err := setWaveformParam(wf, &v, kv); err != nil {
				errs = append(errs, fmt.Errorf("--set %w", err))
			}
		}
		v.FillDefaults()
		opt.params = &v
	}
	// A file the waveform reads (pwl's file=) is an input like a deck.
	var inputs []string
	for _, w := range wf.Words {
		if p := opt.params; w.Path && p != nil && p.Word(w.Key) != "" {
			inputs = append(inputs, p.Word(w.Key))
		}
	}
	out := newOutputs(inputs...)
	out.named("--csv", opt.csv)
	out.file("--json", opt.json)
	errs = append(errs, out.err())
	if err := errors.Join(errs...); err != nil {
		return fmt.Errorf("waveform: %w", err)
	}
	return waveformReport(opt, tablesOut(opt.json, stdout, stderr), stdout)
}

// setWaveformParam reads key=value, one of the waveform's parameters, as
// the deck's strike line reads it.
func setWaveformParam(wf *waveforms.Waveform, v *spec.Values, kv string) error {
	k, text, ok := strings.Cut(kv, "=")
	switch {
	case !ok || k == "":
		return fmt.Errorf("%q: want key=value", kv)
	case wf.Word(k) != nil:
		return v.SetWord(k, text)
	case wf.Param(k) == nil:
		return fmt.Errorf("%s: waveform %s has no parameter %s (it has %s)", kv, wf.Name, k, strings.Join(wf.Keys(), ", "))
	}
	p := wf.Param(k)
	x, err := netlist.ParseValue(k+" of waveform "+wf.Name, text, p.Unit, p.Rule)
	if err != nil {
		return fmt.Errorf("%s: %w", kv, err)
	}
	return v.Set(k, x)
}

// waveformReport prints the report to out and, with opt.json "-", the
// JSON to stdout.
func waveformReport(opt waveformOptions, out, stdout io.Writer) error {
	info := waveforms.Lookup(opt.name)
	if info == nil {
		return fmt.Errorf("unknown waveform %q", opt.name)
	}
	if opt.level == 0 {
		opt.level = info.Level
	}
	s, err := info.New(opt.level, opt.params)
	if err != nil {
		return fmt.Errorf("waveform: %w", err)
	}
	load := opt.load
	if load < 0 {
		load = waveforms.PrescribedLoad(s.Name)
	}
	checks, err := calibrationChecks(s, load)
	if err != nil {
		return fmt.Errorf("waveform: %w", err)
	}
	if opt.csv != "" {
		if err := writeWaveformCSV(opt.csv, s, load); err != nil {
			return fmt.Errorf("waveform: --csv: %w", err)
		}
	}
	doc := waveformDoc{Tool: "zapnet", Version: Version, Waveform: s.Name, Level: s.Level, LevelUnit: s.Unit,
		Params: paramsOf(s), Load: jsonLoad(load), Source: describeSource(s), Pass: true,
		Checks: checks, Note: s.Note, Caution: report.Caution}
	for _, c := range checks {
		doc.Pass = doc.Pass && c.Within
	}
	if opt.json != "" {
		if err := writeOutput(opt.json, stdout, doc); err != nil {
			return fmt.Errorf("waveform: --json: %w", err)
		}
	}

	w := bufio.NewWriter(out)
	fmt.Fprintf(w, "Waveform %s at %s: %s\n", s.Name, levelText(s), info.Summary)
	fmt.Fprintf(w, "Source: %s\n", describeSource(s))
	fmt.Fprintf(w, "Checked into: %s; default span %s, %d breakpoint(s)\n\n",
		loadText(s, load), waveforms.FormatValue(s.Stop, "s"), len(s.Breakpoints))
	if len(checks) == 0 {
		fmt.Fprintf(w, "No published check points for this waveform%s.\n", map[bool]string{true: " with these network values", false: ""}[s.Name == "iso10605"])
	} else {
		if err := report.CheckTable(w, checks); err != nil {
			return err
		}
		fmt.Fprintln(w, "\nReferences:")
		seen := map[string]bool{}
		for _, c := range checks {
			if !seen[c.Ref] {
				seen[c.Ref] = true
				fmt.Fprintf(w, "  %s\n", c.Ref)
			}
		}
	}
	if s.Note != "" {
		fmt.Fprintf(w, "\nNote: %s\n", s.Note)
	}
	if opt.csv != "" {
		fmt.Fprintf(w, "\nWaveform written to %s\n", opt.csv)
	}
	if opt.json != "" && opt.json != "-" {
		fmt.Fprintf(w, "\nChecks written to %s\n", opt.json)
	}
	fmt.Fprintf(w, "\n%s\n", report.Caution)
	return w.Flush()
}

func levelText(s *waveforms.Stimulus) string {
	if s.Unit == "" {
		return "scale " + strconv.FormatFloat(s.Level, 'g', 6, 64)
	}
	return waveforms.FormatValue(s.Level, s.Unit)
}

func describeSource(s *waveforms.Stimulus) string {
	switch s.Form {
	case waveforms.Current:
		return "ideal current (the same into any load)"
	case waveforms.Thevenin:
		return "open-circuit voltage behind " + waveforms.FormatValue(s.R, "Ω")
	case waveforms.Network:
		d := fmt.Sprintf("%s charged to %s, discharging through %s", waveforms.FormatValue(s.C, "F"),
			waveforms.FormatValue(s.V0, "V"), waveforms.FormatValue(s.R, "Ω"))
		if s.L > 0 {
			d += " and " + waveforms.FormatValue(s.L, "H")
		}
		return d
	case waveforms.Generator:
		return "generator circuit solved by the engine: " + s.Gen.String()
	}
	return s.Form.String()
}

func loadText(s *waveforms.Stimulus, load float64) string {
	if s.Name == "pwl" {
		return "no load prescribed (an ideal current from a file)"
	}
	var d string
	switch {
	case math.IsInf(load, 1):
		d = "an open circuit"
	case load == 0:
		d = "a short"
	default:
		d = waveforms.FormatValue(load, "Ω")
	}
	if load == waveforms.PrescribedLoad(s.Name) {
		d += " (the standard's load)"
	}
	return d
}

// writeWaveformCSV writes the sampled waveform (OUTPUT.md): `time [s]`,
// `current [A]` into the load and, for Thevenin and network sources,
// `voltage [V]` across it; one row per sample, SI units, %.9g. The file is
// written whole or not at all (report.WriteFile).
func writeWaveformCSV(path string, s *waveforms.Stimulus, load float64) error {
	t, i, v, err := sampled(s, load)
	if err != nil {
		return err
	}
	return report.WriteFile(path, func(w io.Writer) error {
		// The buffered writer's error sticks: WriteFile's flush reports it.
		if v == nil {
			fmt.Fprintln(w, "time [s],current [A]")
		} else {
			fmt.Fprintln(w, "time [s],current [A],voltage [V]")
		}
		for k := range t {
			if v == nil {
				fmt.Fprintf(w, "%.9g,%.9g\n", t[k], i[k])
			} else {
				fmt.Fprintf(w, "%.9g,%.9g,%.9g\n", t[k], i[k], v[k])
			}
		}
		return nil
	})
}

// calibrationChecks measures s into load: in closed form, or for a
// generator circuit solved by the engine into the load.
func calibrationChecks(s *waveforms.Stimulus, load float64) ([]waveforms.Check, error) {
	if s.Form == waveforms.Generator {
		return waveforms.SolvedChecks(s, load, mna.LoadSolver(nil))
	}
	return waveforms.Checks(s, load)
}

// sampled is the stimulus into load for the CSV: closed-form samples, or
// the engine's accepted points for a generator circuit (for a burst, its
// first pulse).
func sampled(s *waveforms.Stimulus, load float64) (t, i, v []float64, err error) {
	if s.Form != waveforms.Generator {
		t, i, v = waveforms.Sample(s, load, 0)
		return t, i, v, nil
	}
	if s.Burst != nil {
		if s, err = s.Burst.First(1); err != nil {
			return nil, nil, nil, err
		}
	}
	r, err := mna.IntoLoad(s, load, nil)
	if err != nil {
		return nil, nil, nil, err
	}
	return r.Time, r.I, r.V, nil
}

// waveformDoc is the JSON of the waveform command: what was checked, into
// which load, and every check with its published value and window.
type waveformDoc struct {
	Tool      string  `json:"tool"`
	Version   string  `json:"version"`
	Waveform  string  `json:"waveform"`
	Level     float64 `json:"level"`
	LevelUnit string  `json:"level_unit"`
	// Params are the waveform's parameters as used (numbers in SI units,
	// words as written).
	Params map[string]any `json:"params"`
	// Load is the resistive load, ohms; null for an open circuit.
	Load   *float64 `json:"load"`
	Source string   `json:"source"`
	// Pass is true when every check lies within its window.
	Pass    bool              `json:"pass"`
	Checks  []waveforms.Check `json:"checks"`
	Note    string            `json:"note,omitempty"`
	Caution string            `json:"caution"`
}

// paramsOf lists the stimulus's parameters that have a value.
func paramsOf(s *waveforms.Stimulus) map[string]any {
	m := map[string]any{}
	t := s.Values.Table()
	if t == nil {
		return m
	}
	for _, p := range t.Params {
		if v, ok := s.Values.Lookup(p.Key); ok {
			m[p.Key] = v
		}
	}
	for _, wd := range t.Words {
		if v := s.Values.Word(wd.Key); v != "" {
			m[wd.Key] = v
		}
	}
	return m
}

// jsonLoad is a load for JSON: null for an open circuit.
func jsonLoad(ohms float64) *float64 {
	if math.IsInf(ohms, 1) {
		return nil
	}
	return &ohms
}
