package datafile

import (
	"zapnet/devices/spec"
	"zapnet/netlist/textpos"
)

// MaxFileSize bounds a data file: an IBIS file of a large part runs to a
// few megabytes, a TLP or impedance export to far less.
const MaxFileSize = 64 << 20

// ReadFile reads the data file at path: a regular file of at most
// MaxFileSize bytes.
func ReadFile(path string) ([]byte, error) {
	return textpos.ReadFile(path, MaxFileSize, "a data file")
}

// pwlColumns are the columns of a piecewise-linear current.
var pwlColumns = []column{
	{names: []string{"time", "t"}, unit: "s", required: true},
	{names: []string{"current", "i"}, unit: "A", required: true},
}

// ReadPWL reads a piecewise-linear current from CSV: a header naming the
// columns time and current (a unit in brackets allowed, `time [ns]`; other
// columns are ignored, so a waveform exported by zapnet reads back), or no
// header and rows of time,current in seconds and amperes. Blank lines and
// lines starting with # are skipped. Times must be at least 0 and rise
// strictly; at least two rows are needed.
func ReadPWL(name string, src []byte) (t, i []float64, err error) {
	var errs ErrorList
	tab := readTable(name, src, pwlColumns, true, &errs)
	for _, r := range tab.rows {
		pos := Pos{File: name, Line: r.line, Col: r.col[0]}
		tv := r.val[0]
		switch {
		case tv < 0:
			errs.Add(pos, ErrRange, "time %s is negative", spec.FormatSI(tv, spec.Second))
			continue
		case len(t) > 0 && tv <= t[len(t)-1]:
			errs.Add(pos, ErrOrder, "time %s is not after the time before (%s): times must rise",
				spec.FormatSI(tv, spec.Second), spec.FormatSI(t[len(t)-1], spec.Second))
			continue
		}
		t = append(t, tv)
		i = append(i, r.val[1])
	}
	if errs.Err() == nil && len(t) < 2 {
		errs.Add(Pos{File: name}, ErrMissing, "needs at least 2 rows of time,current, found %d", len(t))
	}
	errs.RemoveMultiples()
	if err := errs.Err(); err != nil {
		return nil, nil, err
	}
	return t, i, nil
}
