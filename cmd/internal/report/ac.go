package report

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"zapnet/mna/study/signal"
)

// tableRows picks the sweep points a table shows: every decade the sweep
// holds, and its two ends.
func tableRows(freq []float64) []int {
	var rows []int
	for k, f := range freq {
		e := math.Log10(f)
		if k == 0 || k == len(freq)-1 || math.Abs(e-math.Round(e)) < 1e-9 {
			rows = append(rows, k)
		}
	}
	return rows
}

// dbText and degText print gains and phases; a value that rounds to zero
// prints without a sign.
func dbText(v float64) string {
	if math.Abs(v) < 0.005 {
		v = 0
	}
	return fmt.Sprintf("%+.2f dB", v)
}

func degText(v float64) string {
	if math.Abs(v) < 0.05 {
		v = 0
	}
	return fmt.Sprintf("%.1f°", v)
}

// biasText prints an operating-point voltage to the nanovolt: the leakage
// of a junction at zero bias leaves voltages like 1e-120 V that mean 0.
func biasText(v float64) string {
	if math.Abs(v) < 1e-9 {
		v = 0
	}
	return si(v, "V")
}

// ACTables prints a signal-side analysis as tables, then the caution.
func ACTables(w io.Writer, res *signal.Result, opt *TableOptions) error {
	if opt == nil {
		opt = &TableOptions{}
	}
	ew := &CheckedWriter{W: w}
	if s := titleLine(opt.Title, opt.Deck); s != "" {
		fmt.Fprintf(ew, "%s\n\n", s)
	}
	fmt.Fprintf(ew, "Small signal at the operating point (strike off, supplies on): the drive is an ideal source at %s, biased at %s against %s.\n\n",
		res.Drive.Node, biasText(res.Drive.Bias), res.Drive.Ref)
	rows := tableRows(res.Freq)
	if len(res.Order) > 0 {
		transferTable(ew, res, rows)
	}
	impedanceTable(ew, res, rows)
	if len(res.Peaking) > 0 {
		peakingTable(ew, res)
	}
	if len(res.Loading) > 0 {
		loadingTable(ew, res.Loading)
	}
	if tp := res.TwoPort; tp != nil {
		twoPortTable(ew, tp, rows)
	}
	for _, e := range res.Edges {
		edgeLine(ew, e)
	}
	if len(res.Edges) > 0 {
		fmt.Fprintln(ew)
	}
	fmt.Fprintln(ew, Caution)
	return ew.Err
}

// transferTable prints each target's gain and phase at the rows' frequencies.
func transferTable(w io.Writer, res *signal.Result, rows []int) {
	head := []string{"frequency"}
	for _, n := range res.Order {
		head = append(head, n)
	}
	var body [][]string
	for _, k := range rows {
		row := []string{si(res.Freq[k], "Hz")}
		for _, n := range res.Order {
			tr := res.Nodes[n]
			row = append(row, dbText(tr.GainDB[k])+" "+degText(tr.PhaseDeg[k]))
		}
		body = append(body, row)
	}
	section(w, "Transfer from "+res.Drive.Node+" (gain, phase)", head, body)
}

// impedanceTable prints the impedance at the drive and each element's own.
func impedanceTable(w io.Writer, res *signal.Result, rows []int) {
	head := append([]string{"frequency", "at " + res.Drive.Node}, res.ElementOrder...)
	var body [][]string
	for _, k := range rows {
		row := []string{si(res.Freq[k], "Hz"), zText(res.Impedance, k)}
		for _, n := range res.ElementOrder {
			row = append(row, zText(res.Elements[n], k))
		}
		body = append(body, row)
	}
	section(w, "Impedance (magnitude, phase): seen at "+res.Drive.Node+" into the network, and each bead and capacitor alone", head, body)
}

// peakingTable prints each node's peaking against its limit and, for one
// over it, the damping values found.
func peakingTable(w io.Writer, res *signal.Result) {
	head := []string{"node", "peaking", "at", "Q", "limit", "result"}
	var body [][]string
	var notes []string
	for _, p := range res.Peaking {
		result := "within"
		if p.Exceeds {
			result = "OVER"
		}
		at := si(p.Freq, "Hz")
		if p.AtEnd {
			at += " (sweep end)"
		}
		body = append(body, []string{p.Node, dbText(p.GainDB), at, fmt.Sprintf("%.3g", p.Q), fmt.Sprintf("%g dB", p.LimitDB), result})
		if p.Exceeds {
			if len(p.Damping) == 0 {
				notes = append(notes, fmt.Sprintf("%s: no esr, rdc or series r up to 1 kΩ alone brings it under %g dB", p.Node, p.LimitDB))
			}
			for _, d := range p.Damping {
				notes = append(notes, fmt.Sprintf("%s: %s %s %s → %s brings it to %s", p.Node, d.Element, d.Param,
					si(d.From, "Ω"), si(d.Value, "Ω"), dbText(d.GainDB)))
			}
		}
	}
	fmt.Fprintf(w, "Peaking above the gain at %s\n", si(res.Freq[0], "Hz"))
	writeTable(w, head, body)
	if len(notes) > 0 {
		fmt.Fprintln(w, "Damping (each alone; found by solving again):")
		for _, n := range notes {
			fmt.Fprintf(w, "  %s\n", n)
		}
	}
	fmt.Fprintln(w)
}

// loadingTable prints the capacitance each node sees, element by element,
// against its limit and budget.
func loadingTable(w io.Writer, loading []signal.Loading) {
	head := []string{"node", "capacitance", "protection adds", "limit", "result", "elements"}
	var body [][]string
	for _, l := range loading {
		var lims []string
		if l.Limit > 0 {
			lims = append(lims, "cmax "+si(l.Limit, "F"))
		}
		if l.Budget > 0 {
			lims = append(lims, "budget "+si(l.Budget, "F")+" on what is added")
		}
		lim, result := "-", "-"
		if len(lims) > 0 {
			lim, result = strings.Join(lims, "; "), "within"
			if l.Exceeds {
				result = "OVER"
			}
		}
		var parts []string
		for _, e := range l.Elements {
			parts = append(parts, e.Element+" "+si(e.Capacitance, "F"))
		}
		body = append(body, []string{l.Node, si(l.Capacitance, "F"), si(l.Added, "F"), lim, result, strings.Join(parts, ", ")})
	}
	section(w, "Capacitance seen at "+si(loading[0].Freq, "Hz")+" (junctions at their bias; what the protection adds leaves out the protected pins)", head, body)
}

// twoPortTable prints the two-port's return and insertion loss.
func twoPortTable(w io.Writer, tp *signal.TwoPort, rows []int) {
	head := []string{"frequency", "return loss", "insertion loss", "S11", "S21"}
	var body [][]string
	for _, k := range rows {
		body = append(body, []string{si(tp.Freq[k], "Hz"),
			fmt.Sprintf("%.2f dB", math.Abs(-tp.S11DB[k])), fmt.Sprintf("%.3f dB", math.Abs(-tp.S21DB[k])),
			dbText(tp.S11DB[k]) + " " + degText(tp.S11Deg[k]), dbText(tp.S21DB[k]) + " " + degText(tp.S21Deg[k])})
	}
	section(w, fmt.Sprintf("Two-port %s → %s (%s, %s)", tp.Ports[0], tp.Ports[1], si(tp.Z0[0], "Ω"), si(tp.Z0[1], "Ω")), head, body)
}

// edgeLine says what the edge check found at one node, against its limit
// and budget.
func edgeLine(w io.Writer, e signal.Edge) {
	if e.Note == "no edge arrives" {
		fmt.Fprintf(w, "Edge %s → %s: no edge arrives at %s.\n", e.From, e.To, e.Node)
		return
	}
	var lims []string
	if e.Limit > 0 {
		lims = append(lims, "rise limit "+si(e.Limit, "s"))
	}
	if e.Budget > 0 {
		lims = append(lims, "budget "+si(e.Budget, "s")+" on what the network adds")
	}
	judged := ""
	if len(lims) > 0 {
		verdict := "within"
		if e.Exceeds {
			verdict = "OVER"
		}
		judged = "; " + strings.Join(lims, ", ") + ": " + verdict
	}
	note := ""
	if e.Note != "" {
		note = " (" + e.Note + ")"
	}
	fmt.Fprintf(w, "Edge %s → %s: a %s step (%s 10–90 %%) reaches %s with a 10–90 %% rise of %s (the network adds %s), delayed %s%s%s.\n",
		e.From, e.To, si(e.Level, "V"), si(e.Step, "s"), e.Node, si(e.Rise, "s"), si(e.Added, "s"), si(e.Delay, "s"), judged, note)
}

func zText(im *signal.Impedance, k int) string {
	return si(im.MagOhm[k], "Ω") + " " + degText(im.PhaseDeg[k])
}

// ACCSV writes the sweep as one CSV table: frequency, then per target its
// gain and phase, the impedance at the drive, each element's impedance and,
// with a two-port, its S-parameters. Plain column names with units, %.9g.
func ACCSV(w io.Writer, res *signal.Result) error {
	cw := csv.NewWriter(w)
	head := []string{"freq [Hz]"}
	type col func(k int) float64
	var cols []col
	for _, n := range res.Order {
		tr := res.Nodes[n]
		head = append(head, n+" gain [dB]", n+" phase [deg]")
		cols = append(cols, func(k int) float64 { return tr.GainDB[k] }, func(k int) float64 { return tr.PhaseDeg[k] })
	}
	addZ := func(name string, im *signal.Impedance) {
		head = append(head, name+" |Z| [ohm]", name+" phase [deg]")
		cols = append(cols, func(k int) float64 { return im.MagOhm[k] }, func(k int) float64 { return im.PhaseDeg[k] })
	}
	addZ("Zin "+res.Drive.Node, res.Impedance)
	for _, n := range res.ElementOrder {
		addZ(n, res.Elements[n])
	}
	if tp := res.TwoPort; tp != nil {
		for _, s := range []struct {
			name   string
			db, dg []float64
		}{{"S11", tp.S11DB, tp.S11Deg}, {"S21", tp.S21DB, tp.S21Deg}, {"S12", tp.S12DB, tp.S12Deg}, {"S22", tp.S22DB, tp.S22Deg}} {
			head = append(head, s.name+" [dB]", s.name+" phase [deg]")
			cols = append(cols, func(k int) float64 { return s.db[k] }, func(k int) float64 { return s.dg[k] })
		}
	}
	if err := cw.Write(head); err != nil {
		return err
	}
	rec := make([]string, len(head))
	for k, f := range res.Freq {
		rec[0] = strconv.FormatFloat(f, 'g', 9, 64)
		for i, c := range cols {
			rec[i+1] = strconv.FormatFloat(c(k), 'g', 9, 64)
		}
		if err := cw.Write(rec); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}
