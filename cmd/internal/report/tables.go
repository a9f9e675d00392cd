package report

import (
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/olekukonko/tablewriter"
	"github.com/olekukonko/tablewriter/renderer"
	"github.com/olekukonko/tablewriter/tw"

	"zapnet/devices/spec"
	"zapnet/mna/study"
	"zapnet/waveforms"
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
	ew := &CheckedWriter{W: w}
	if s := titleLine(opt.Title, opt.Deck); s != "" {
		fmt.Fprintln(ew, s)
	}
	if !opt.SummaryOnly {
		for i := range runs {
			fmt.Fprintln(ew)
			runDetail(ew, &runs[i], i, len(runs))
		}
		fmt.Fprintln(ew)
	}
	if ew.Err != nil {
		return ew.Err
	}
	return Summary(w, runs)
}

// titleLine is the line a report starts with: the deck's title and its
// path, "TITLE (DECK)", either alone, or "" when neither is known.
func titleLine(title, deck string) string {
	if title != "" && deck != "" {
		return title + " (" + deck + ")"
	}
	return title + deck
}

// Summary prints one row per run (variant, level, polarity, verdict, worst
// margin) and the Caution line.
func Summary(w io.Writer, runs []study.Run) error {
	ew := &CheckedWriter{W: w}
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
	for _, r := range runs {
		row := []string{si(r.Level, r.LevelUnit), r.Polarity, string(r.Verdict), worstText(&r)}
		if variants {
			row = append([]string{r.Variant.String()}, row...)
		}
		t.Append(toAny(row)...)
	}
	t.Render()
	noun := "runs"
	if len(runs) == 1 {
		noun = "run"
	}
	fmt.Fprintln(ew, verdictCount(runs, noun))
	fmt.Fprintln(ew)
	fmt.Fprintln(ew, Caution)
	return ew.Err
}

// verdictCount counts the runs by verdict: "3 runs: 2 PASS, 1 FAIL", and
// the runs not solved when there are any.
func verdictCount(runs []study.Run, noun string) string {
	pass, fail, errs := 0, 0, 0
	for _, r := range runs {
		switch r.Verdict {
		case study.Pass:
			pass++
		case study.Fail:
			fail++
		default:
			errs++
		}
	}
	line := fmt.Sprintf("%d %s: %d PASS, %d FAIL", len(runs), noun, pass, fail)
	if errs > 0 {
		line += fmt.Sprintf(", %d not solved", errs)
	}
	return line
}

// runHeading heads run i of n: "Run 2/4: WAVEFORM 8 kV neg", and its
// variant when it has one.
func runHeading(r *study.Run, i, n int) string {
	head := fmt.Sprintf("Run %d/%d: %s %s %s", i+1, n, r.Waveform, si(r.Level, r.LevelUnit), r.Polarity)
	if len(r.Variant) > 0 {
		head += ", " + r.Variant.String()
	}
	return head
}

// windowHow says where a run's time window came from.
func windowHow(r *study.Run) string {
	if r.Window.Default {
		return "default: the waveform and the circuit's slowest response"
	}
	return "from the deck's window"
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
	head := runHeading(r, i, n)
	fmt.Fprintf(w, "%s\n%s\n", head, strings.Repeat("=", len([]rune(head))))
	if r.Err != nil {
		fmt.Fprintf(w, "Not solved: %v\n", r.Err)
		return
	}
	// Step counts stay in the JSON: they change with every tuning of the
	// engine and say nothing about the protection.
	fmt.Fprintf(w, "Window: 0 to %s (%s)\n\n", si(r.Window.Stop, "s"), windowHow(r))

	// Headers and the pin table are the text report's own; the rows of
	// the other tables are the HTML report's too.
	if nodes := nodeRows(r); len(nodes) > 0 {
		section(w, "Nodes", []string{"node", "role", "highest", "at", "lowest", "at"}, nodes)
	}
	if clamps := clampRows(r); len(clamps) > 0 {
		section(w, "Clamps", []string{"clamp", "peak current", "at", "ipp (margin)", "energy", "emax (margin)"}, clamps)
	}
	if bu := r.Burst; bu != nil && len(bu.Elements) > 0 {
		section(w, burstTitle(bu), burstHead(bu), burstRows(bu))
	}

	// The residual pulse at each protected pin; the ratings themselves are
	// in the limits table.
	var pins [][]string
	for _, p := range r.Pins() {
		above, below := "-", "-"
		if p.HasVmax {
			above = si(p.AboveVmax, "s")
		}
		if p.HasVmin {
			below = si(p.BelowVmin, "s")
		}
		pins = append(pins, []string{p.Name, si(p.Peak, "V"), si(p.TPeak, "s"), above,
			si(p.Min, "V"), si(p.TMin, "s"), below, si(p.Energy, "J"), si(p.IPath, "A"), rating(r.LimitOn(p.Name, spec.PeakCurrent))})
	}
	if len(pins) > 0 {
		section(w, "Protected pins (residual pulse)", []string{"pin", "peak", "at", "time > vmax",
			"lowest", "at", "time < vmin", "energy in", "internal clamp", "ifail (margin)"}, pins)
	}

	if caps := capacitorRows(r); len(caps) > 0 {
		section(w, "Capacitors", capacitorHead, caps)
	}
	section(w, "Energy ledger", ledgerHead, ledgerRows(r))
	if rows := quiescentRows(r); len(rows) > 0 {
		section(w, quiescentTitle, quiescentHead, rows)
	}
	if limits := limitRows(r); len(limits) > 0 {
		section(w, "Limits", []string{"limit", "measured", "at", "rating", "margin", "margin %", ""}, limits)
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
	if s := verifySentence(r.Verify); s != "" {
		fmt.Fprintln(w, s)
	}
}

// verifyRows are a run's verified numbers: value, the tighter solution's,
// the relative difference, the accuracy it is held to and whether it is
// within it.
func verifyRows(v *study.Verification) [][]string {
	var rows [][]string
	for _, q := range v.Quantities {
		within := "yes"
		if !q.Within {
			within = "NO"
		}
		rows = append(rows, []string{q.Name, si(q.Value, q.Unit), si(q.Tighter, q.Unit), fmt.Sprintf("%.2g", 100*q.Relative), spec.FormatFraction(q.Asked), within})
	}
	return rows
}

// verifySentence says in one line what a run's error bar found; "" when
// the run was not verified.
func verifySentence(v *study.Verification) string {
	switch {
	case v == nil:
		return ""
	case v.Error != "":
		return fmt.Sprintf("Error bar: the check at accuracy %s failed: %s", spec.FormatFraction(v.Tighter), v.Error)
	case v.Worst == nil:
		return "Error bar: nothing to check"
	}
	worst := fmt.Sprintf("%s %.2g %% (%s against %s)", v.Worst.Name, 100*v.Worst.Relative,
		si(v.Worst.Value, v.Worst.Unit), si(v.Worst.Tighter, v.Worst.Unit))
	asked := spec.FormatFraction(v.Accuracy)
	for _, q := range v.Quantities {
		if q.Asked != v.Accuracy {
			asked += fmt.Sprintf(" (a pin's currents %s)", spec.FormatFraction(q.Asked))
			break
		}
	}
	if v.Beyond == 0 {
		return fmt.Sprintf("Error bar: every number within the %s asked of it, solved again at %s; the largest difference %s",
			asked, spec.FormatFraction(v.Tighter), worst)
	}
	return fmt.Sprintf("WARNING: %d of %d numbers differ by more than the %s asked when solved again at %s, the most %s: tighten the window's accuracy= (or bound the step with resolve=) and run again",
		v.Beyond, len(v.Quantities), asked, spec.FormatFraction(v.Tighter), worst)
}

// The rows of a run's tables that the text and the HTML report share, one
// function per table; each report adds its own headers.

// nodeRows are the watched nodes and the pin lines: peaks and when.
func nodeRows(r *study.Run) [][]string {
	var rows [][]string
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
		rows = append(rows, []string{nd.Name, role, si(nd.Max, "V"), si(nd.TMax, "s"), si(nd.Min, "V"), si(nd.TMin, "s")})
	}
	return rows
}

// clampRows are the protectors (clamps, diodes) against their pulse
// ratings: peak current and energy.
func clampRows(r *study.Run) [][]string {
	var rows [][]string
	for _, e := range r.Elements {
		if e.Role != spec.Protector {
			continue
		}
		rows = append(rows, []string{e.Name, si(e.PeakCurrent, "A"), si(e.TPeak, "s"),
			rating(r.LimitOn(e.Name, spec.PeakCurrent)), si(e.Energy, "J"), rating(r.LimitOn(e.Name, spec.Energy))})
	}
	return rows
}

// burstTitle heads a burst's table: its pulses, their spacing and the
// bursts' (the burst's energies, not a pulse's, are the clamp's burden).
func burstTitle(bu *study.BurstReport) string {
	solved := "every pulse solved"
	if bu.Extrapolated {
		solved = fmt.Sprintf("%d pulses solved, the rest repeat them", bu.Solved)
	}
	return fmt.Sprintf("Burst: %d pulses %s apart (%s long), one burst every %s; %s", bu.Pulses,
		si(bu.Period, "s"), si(bu.Length, "s"), si(bu.Every, "s"), solved)
}

// burstHead heads the burst table, shared by the text and HTML reports.
func burstHead(bu *study.BurstReport) []string {
	return []string{"clamp", "first pulse", "largest pulse", "one burst", "average power",
		fmt.Sprintf("%d bursts (1 min)", bu.PerMinute), "average power (1 min)"}
}

// burstRows are each protector's energy per pulse, per burst and per
// minute, with the average powers.
func burstRows(bu *study.BurstReport) [][]string {
	var rows [][]string
	for _, e := range bu.Elements {
		rows = append(rows, []string{e.Name, si(e.FirstPulse, "J"), si(e.LargestPulse, "J"), si(e.Energy, "J"),
			si(e.Power, "W"), si(e.MinuteEnergy, "J"), si(e.MinutePower, "W")})
	}
	return rows
}

// capacitorHead heads the table of rated capacitors, shared by the text
// and HTML reports.
var capacitorHead = []string{"capacitor", "across terminals", "on dielectric", "at", "rating (margin)"}

// capacitorRows are the elements rated on a voltage (the capacitors with a
// rating): the largest voltage across their terminals, and on the
// dielectric (across C alone, without the esr and esl drops), which is
// what the rating judges.
func capacitorRows(r *study.Run) [][]string {
	var rows [][]string
	for _, e := range r.Elements {
		l := r.LimitOn(e.Name, spec.PeakVoltage)
		if l == nil {
			continue
		}
		terminals := "-"
		if e.PeakVoltage != nil {
			terminals = si(*e.PeakVoltage, "V")
		}
		rows = append(rows, []string{e.Name, terminals, si(l.Measured, l.Unit), si(l.At, "s"), rating(l)})
	}
	return rows
}

// ledgerHead is the energy ledger's header, shared by the text and HTML
// reports.
var ledgerHead = []string{"where", "delivered", "absorbed", "share"}

// ledgerRows say where the energy went: each element's energy in the column
// of its direction (a source delivers, a clamp absorbs; a capacitor absorbs
// what it still holds, or delivers what it gave back), and its share of all
// the energy delivered, ending with the balance.
func ledgerRows(r *study.Run) [][]string {
	kind := map[string]string{}
	for _, e := range r.Elements {
		kind[e.Name] = e.Kind
	}
	// row renders an energy into the element (negative: it delivered).
	row := func(name string, in float64) []string {
		share := "-"
		if r.Ledger.Delivered > 0 {
			share = percent(100 * math.Abs(in) / r.Ledger.Delivered)
		}
		if in < 0 {
			return []string{name, si(-in, "J"), "", share}
		}
		return []string{name, "", si(in, "J"), share}
	}
	rows := [][]string{row("strike", r.Ledger.Strike)}
	for _, e := range r.Ledger.Entries {
		rows = append(rows, row(e.Name+" ("+kind[e.Name]+")", e.Energy))
	}
	bal := "-"
	if r.Ledger.Delivered > 0 {
		bal = percent(100 * r.Ledger.Balance / r.Ledger.Delivered)
	}
	return append(rows, []string{"balance (solver residual)", "", si(r.Ledger.Balance, "J"), bal})
}

// The power each element takes at the operating point, left out of the
// ledger (shared by the text and HTML reports).
var (
	quiescentTitle = "Power at rest (left out of the ledger)"
	quiescentHead  = []string{"where", "delivered", "absorbed"}
)

// quiescentRows are the elements that take or give power at rest.
func quiescentRows(r *study.Run) [][]string {
	var rows [][]string
	for _, e := range r.Elements {
		switch {
		case e.Quiescent < 0:
			rows = append(rows, []string{e.Name + " (" + e.Kind + ")", si(-e.Quiescent, "W"), ""})
		case e.Quiescent > 0:
			rows = append(rows, []string{e.Name + " (" + e.Kind + ")", "", si(e.Quiescent, "W")})
		}
	}
	return rows
}

// CheckTable prints a waveform's calibration checks: each quantity as
// computed, its published value and tolerance, whether it is within, and
// where the published value comes from.
func CheckTable(w io.Writer, checks []waveforms.Check) error {
	head := []string{"quantity", "computed", "published", "tolerance", "result", "source"}
	var rows [][]string
	for _, c := range checks {
		// A row with no published value and no window only shows how the
		// stimulus comes out (an air discharge's first peak).
		shown := math.IsNaN(c.Published) && math.IsInf(c.Lo, -1) && math.IsInf(c.Hi, 1)
		pub := waveforms.FormatValue(c.Published, c.Unit)
		switch {
		case shown:
			pub = "-"
		case math.IsNaN(c.Published):
			pub = "window"
		}
		result := "within"
		switch {
		case !c.Within:
			result = "OUTSIDE"
		case math.IsInf(c.Lo, -1) && math.IsInf(c.Hi, 1):
			result = "-"
		}
		rows = append(rows, []string{c.Quantity, waveforms.FormatValue(c.Computed, c.Unit), pub, c.Tol, result, c.Source})
	}
	ew := &CheckedWriter{W: w}
	writeTable(ew, head, rows)
	return ew.Err
}

// limitRows are every limit with its margin, "FAIL" in the last column
// when exceeded.
func limitRows(r *study.Run) [][]string {
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
	return rows
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
	writeTable(w, head, rows)
	fmt.Fprintln(w)
}

// textColumns are the headers of columns that hold words, aligned left;
// every other column holds numbers, aligned right.
var textColumns = map[string]bool{"quantity": true, "result": true, "source": true,
	"node": true, "role": true, "clamp": true, "pin": true, "number": true,
	"capacitor": true, "where": true, "limit": true, "variant": true, "polarity": true,
	"verdict": true, "worst margin": true, "level": true, "": true,
	"parameter": true, "from": true, "what": true}

// newTable is the house style: ASCII borders (safe in any terminal and log),
// headers as written, words left and numbers right.
// writeTable renders a table of the house style.
func writeTable(w io.Writer, head []string, rows [][]string) {
	t := newTable(w, head)
	t.Header(toAny(head)...)
	for _, r := range rows {
		t.Append(toAny(r)...)
	}
	t.Render()
}

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
func si(v float64, unit spec.Unit) string { return spec.FormatSI(v, unit) }

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

// CheckedWriter keeps the first error of the writer it wraps and refuses
// every write after it, so that a report is written or reported as failed
// as a whole, and a command whose standard output was full, closed or
// gone does not report success.
type CheckedWriter struct {
	W   io.Writer
	Err error
}

func (e *CheckedWriter) Write(p []byte) (int, error) {
	if e.Err != nil {
		return 0, e.Err
	}
	n, err := e.W.Write(p)
	e.Err = err
	return n, err
}
