package report

import (
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/olekukonko/tablewriter"
	"github.com/olekukonko/tablewriter/renderer"
	"github.com/olekukonko/tablewriter/tw"

	"zapnet/cmd/internal/study"
	"zapnet/netlist"
)

// TableOptions tune the tables. A nil *TableOptions means every default.
type TableOptions struct {
	// Title is printed above the report. Empty: none.
	Title string
	// Deck is the deck's path, printed beside the title. Empty: none.
	Deck string
	// SummaryOnly skips the per-run detail.
	SummaryOnly bool
}

// Tables prints each run's detail (nodes, clamps, pins, capacitors, ledger,
// limits with margins, verdict and notes), then the Summary.
func Tables(w io.Writer, runs []study.Run, opt *TableOptions) error {
	if opt == nil {
		opt = &TableOptions{}
	}
	ew := &errWriter{w: w}
	switch {
	case opt.Title != "" && opt.Deck != "":
		fmt.Fprintf(ew, "%s (%s)\n", opt.Title, opt.Deck)
	case opt.Title != "":
		fmt.Fprintf(ew, "%s\n", opt.Title)
	case opt.Deck != "":
		fmt.Fprintf(ew, "%s\n", opt.Deck)
	}
	if !opt.SummaryOnly {
		for i := range runs {
			fmt.Fprintln(ew)
			runDetail(ew, &runs[i], i, len(runs))
		}
		fmt.Fprintln(ew)
	}
	if ew.err != nil {
		return ew.err
	}
	return Summary(w, runs)
}

// Summary prints one row per run (variant, level, polarity, verdict, worst
// margin) and the Caution line.
func Summary(w io.Writer, runs []study.Run) error {
	ew := &errWriter{w: w}
	fmt.Fprintln(ew, "Summary")
	variants := false
	for _, r := range runs {
		if len(r.Variant) > 0 {
			variants = true
		}
	}
	head := []string{"level", "polarity", "verdict", "worst margin"}
	if variants {
		head = append([]string{"variant"}, head...)
	}
	t := newTable(ew, head)
	t.Header(toAny(head)...)
	pass, fail, errs := 0, 0, 0
	for _, r := range runs {
		row := []string{si(r.Level, r.LevelUnit), r.Polarity, string(r.Verdict), worstText(&r)}
		if variants {
			row = append([]string{study.VariantString(r.Variant)}, row...)
		}
		t.Append(toAny(row)...)
		switch r.Verdict {
		case study.Pass:
			pass++
		case study.Fail:
			fail++
		default:
			errs++
		}
	}
	t.Render()
	noun := "runs"
	if len(runs) == 1 {
		noun = "run"
	}
	line := fmt.Sprintf("%d %s: %d PASS, %d FAIL", len(runs), noun, pass, fail)
	if errs > 0 {
		line += fmt.Sprintf(", %d not solved", errs)
	}
	fmt.Fprintln(ew, line)
	fmt.Fprintln(ew)
	fmt.Fprintln(ew, Caution)
	return ew.err
}

func worstText(r *study.Run) string {
	switch {
	case r.Err != nil:
		return "not solved"
	case r.Worst == nil:
		return "no limits"
	}
	return r.Worst.String()
}

// runDetail prints one run.
func runDetail(w io.Writer, r *study.Run, i, n int) {
	head := fmt.Sprintf("Run %d/%d: %s %s %s", i+1, n, r.Waveform, si(r.Level, r.LevelUnit), r.Polarity)
	if len(r.Variant) > 0 {
		head += ", " + study.VariantString(r.Variant)
	}
	fmt.Fprintf(w, "%s\n%s\n", head, strings.Repeat("=", len([]rune(head))))
	if r.Err != nil {
		fmt.Fprintf(w, "Not solved: %v\n", r.Err)
		return
	}
	how := "from the deck's window"
	if r.Window.Default {
		how = "default: the waveform and the circuit's slowest response"
	}
	// Step counts stay in the JSON: they change with every tuning of the
	// engine and say nothing about the protection.
	fmt.Fprintf(w, "Window: 0 to %s (%s)\n\n", si(r.Window.Stop, "s"), how)

	// Watched nodes and pin lines.
	var nodes [][]string
	for _, nd := range r.Nodes {
		if !nd.Watched && !nd.Pin {
			continue
		}
		role := "watched"
		switch {
		case nd.Watched && nd.Pin:
			role = "watched, pin"
		case nd.Pin:
			role = "pin"
		}
		nodes = append(nodes, []string{nd.Name, role, si(nd.Max, "V"), si(nd.TMax, "s"), si(nd.Min, "V"), si(nd.TMin, "s")})
	}
	if len(nodes) > 0 {
		section(w, "Nodes", []string{"node", "role", "highest", "at", "lowest", "at"}, nodes)
	}

	// Clamps against ipp and emax.
	kind := map[string]netlist.Kind{}
	var clamps [][]string
	lim := limitsByName(r)
	for _, e := range r.Elements {
		kind[e.Name] = e.Kind
		if e.Kind != netlist.Clamp {
			continue
		}
		clamps = append(clamps, []string{e.Name, si(e.PeakCurrent, "A"), si(e.TPeak, "s"),
			rating(lim[e.Name+" ipp"]), si(e.Energy, "J"), rating(lim[e.Name+" emax"])})
	}
	if len(clamps) > 0 {
		section(w, "Clamps", []string{"clamp", "peak current", "at", "ipp (margin)", "energy", "emax (margin)"}, clamps)
	}

	// The residual pulse at each protected pin; the ratings themselves are
	// in the limits table.
	var pins [][]string
	for _, p := range r.Pins {
		above, below := "-", "-"
		if p.HasVmax {
			above = si(p.AboveVmax, "s")
		}
		if p.HasVmin {
			below = si(p.BelowVmin, "s")
		}
		pins = append(pins, []string{p.Name, si(p.Peak, "V"), si(p.TPeak, "s"), above,
			si(p.Min, "V"), si(p.TMin, "s"), below, si(p.Energy, "J"), si(p.IPath, "A"), rating(lim[p.Name+" ifail"])})
	}
	if len(pins) > 0 {
		section(w, "Protected pins (residual pulse)", []string{"pin", "peak", "at", "time > vmax",
			"lowest", "at", "time < vmin", "energy in", "internal clamp", "ifail (margin)"}, pins)
	}

	// Capacitors with a rating.
	var caps [][]string
	for _, c := range r.Capacitors {
		if !c.HasRating {
			continue
		}
		caps = append(caps, []string{c.Name, si(c.Peak, "V"), si(c.TPeak, "s"), si(c.Rating, "V")})
	}
	if len(caps) > 0 {
		section(w, "Capacitors", []string{"capacitor", "peak voltage", "at", "rating"}, caps)
	}

	// Where the strike's energy went.
	ledger := [][]string{{"strike (delivered)", si(r.Ledger.Strike, "J"), "100.0 %"}}
	for _, e := range r.Ledger.Entries {
		ledger = append(ledger, []string{e.Name + " (" + string(kind[e.Name]) + ")", si(e.Energy, "J"), percent(e.Percent)})
	}
	bal := "-"
	if r.Ledger.Strike != 0 {
		bal = percent(100 * r.Ledger.Balance / r.Ledger.Strike)
	}
	ledger = append(ledger, []string{"balance (solver residual)", si(r.Ledger.Balance, "J"), bal})
	section(w, "Energy ledger", []string{"where", "energy", "share"}, ledger)

	// Every limit with its margin.
	if len(r.Limits) > 0 {
		var rows [][]string
		for _, l := range r.Limits {
			at := "-"
			if !math.IsNaN(l.At) {
				at = si(l.At, "s")
			}
			ok := "ok"
			if l.Failed() {
				ok = "FAIL"
			}
			rows = append(rows, []string{l.Name(), si(l.Measured, l.Unit), at, si(l.Value, l.Unit),
				si(l.Margin, l.Unit), percentText(l.Percent), ok})
		}
		section(w, "Limits", []string{"limit", "measured", "at", "rating", "margin", "margin %", ""}, rows)
	}

	verdict := "Verdict: " + string(r.Verdict)
	if r.Worst != nil {
		verdict += "; worst margin " + r.Worst.String()
	}
	fmt.Fprintln(w, verdict)
	for _, f := range r.Failures {
		fmt.Fprintf(w, "  - %s\n", f)
	}
	for _, n := range r.Notes {
		fmt.Fprintf(w, "Note: %s\n", n)
	}
}

func limitsByName(r *study.Run) map[string]*study.Limit {
	m := map[string]*study.Limit{}
	for i := range r.Limits {
		m[r.Limits[i].Name()] = &r.Limits[i]
	}
	return m
}

// rating renders a limit's value and its margin percentage, or "-".
func rating(l *study.Limit) string {
	if l == nil {
		return "-"
	}
	return si(l.Value, l.Unit) + " (" + percentText(l.Percent) + ")"
}

// section prints a titled table.
func section(w io.Writer, title string, head []string, rows [][]string) {
	fmt.Fprintln(w, title)
	t := newTable(w, head)
	t.Header(toAny(head)...)
	for _, r := range rows {
		t.Append(toAny(r)...)
	}
	t.Render()
	fmt.Fprintln(w)
}

// textColumns are the headers of columns that hold words, aligned left;
// every other column holds numbers, aligned right.
var textColumns = map[string]bool{"node": true, "role": true, "clamp": true, "pin": true,
	"capacitor": true, "where": true, "limit": true, "variant": true, "polarity": true,
	"verdict": true, "worst margin": true, "level": true, "": true}

// newTable is the house style: ASCII borders (safe in any terminal and log),
// headers as written, words left and numbers right.
func newTable(w io.Writer, head []string) *tablewriter.Table {
	align := make([]tw.Align, len(head))
	for i, h := range head {
		align[i] = tw.AlignRight
		if textColumns[h] {
			align[i] = tw.AlignLeft
		}
	}
	return tablewriter.NewTable(w,
		tablewriter.WithRenderer(renderer.NewBlueprint(tw.Rendition{Symbols: tw.NewSymbols(tw.StyleASCII)})),
		tablewriter.WithHeaderAutoFormat(tw.Off),
		tablewriter.WithHeaderAlignment(tw.AlignLeft),
		tablewriter.WithRowAlignmentConfig(tw.CellAlignment{PerColumn: align}),
		tablewriter.WithRowAutoWrap(tw.WrapNone),
		tablewriter.WithHeaderAutoWrap(tw.WrapNone),
	)
}

func toAny(s []string) []any {
	a := make([]any, len(s))
	for i, v := range s {
		a[i] = v
	}
	return a
}

// si is the one number format of every table.
func si(v float64, unit string) string { return netlist.FormatSI(v, unit) }

func percent(p float64) string {
	if math.Abs(p) < 0.05 {
		p = 0 // no "-0.0 %"
	}
	return fmt.Sprintf("%.1f %%", p)
}

func percentText(p float64) string {
	if math.IsInf(p, 0) {
		return "∞ %"
	}
	return percent(p)
}

// errWriter keeps the first write error so that a report is written or
// reported as failed as a whole.
type errWriter struct {
	w   io.Writer
	err error
}

func (e *errWriter) Write(p []byte) (int, error) {
	if e.err != nil {
		return 0, e.err
	}
	n, err := e.w.Write(p)
	e.err = err
	return n, err
}
