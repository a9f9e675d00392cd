package report

import (
	"errors"
	"io"

	"zapnet/cmd/internal/study"
)

// CSV writes a recorded run's waveforms (OUTPUT.md): a header
// `time,v(n1),...,i(D1),...,i(strike)` and one row per accepted point, SI
// units, %.9g. The run must have been solved with Options.Record.
func CSV(w io.Writer, r *study.Run) error {
	return errors.New("report: CSV is not built yet")
}

// CSVPaths names one CSV file per run from target: with one run, target
// itself; with several, target is a folder (existing, or ending in a path
// separator) that receives one file per run named after the deck, variant,
// level and polarity, or a pattern containing "{run}", replaced by the same
// name.
func CSVPaths(target, deck string, runs []study.Run) ([]string, error) {
	return nil, errors.New("report: CSV is not built yet")
}
