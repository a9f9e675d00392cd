package report

import (
	"errors"
	"io"

	"zapnet/cmd/internal/study"
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
// verdict and margin), then the Summary.
func Tables(w io.Writer, runs []study.Run, opt *TableOptions) error {
	return errors.New("report: tables are not built yet")
}

// Summary prints one row per run (level, polarity, variant, verdict, worst
// margin) and the Caution line.
func Summary(w io.Writer, runs []study.Run) error {
	return errors.New("report: tables are not built yet")
}
