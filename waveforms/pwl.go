package waveforms

import (
	"bufio"

	"errors"
	"fmt"
	"math"
	"os"
	"sort"
	"strconv"
	"strings"
	"zapnet/devices/spec"
)

func init() {
	Register(&Waveform{Name: "pwl", Unit: spec.Dimensionless, Level: 1,
		Summary: "piecewise-linear current from a CSV file (time,current), scaled by the level",
		Table:   spec.Table{Words: []spec.Word{{Key: "file", Path: true, Fixed: true}}},
		build:   newPWL,
		Order:   80,
	})
}

// newPWL reads a piecewise-linear current from the CSV file str["file"]:
// rows "time,current" in seconds and amperes (plain decimal numbers, no SI
// prefixes), an optional header line first, blank lines and lines starting
// with '#' ignored. The current is scaled by level. Times must be >= 0 and
// strictly increasing; the current is zero before the first and after the
// last sample, so a file that does not start and end at zero has a step
// there. Every sample time is a breakpoint; the span ends at the last one.
func newPWL(level float64, v *spec.Values) (*Stimulus, error) {
	path := v.Word("file")
	if path == "" {
		return nil, errors.New(`pwl: needs file="path" naming a CSV of time,current rows`)
	}
	ts, ys, err := ReadPWL(path)
	if err != nil {
		return nil, err
	}
	for k := range ys {
		ys[k] *= level
	}
	last := len(ts) - 1
	f := func(t float64) float64 {
		if t <= 0 || t < ts[0] || t > ts[last] {
			return 0
		}
		k := sort.SearchFloat64s(ts, t) // first ts[k] >= t
		if ts[k] == t {
			return ys[k]
		}
		return lerp(ts[k-1], ys[k-1], ts[k], ys[k], t)
	}
	bp := ts
	if ts[0] > 0 {
		bp = append([]float64{0}, ts...)
	}
	return &Stimulus{Form: Current, F: f, Breakpoints: bp, Stop: ts[last]}, nil
}

// ReadPWL reads a "time,current" CSV (see the pwl waveform) and returns its
// columns. Every bad line is reported, each as "path:line: message".
func ReadPWL(path string) (t, i []float64, err error) {
	fh, err := os.Open(path)
	if err != nil {
		return nil, nil, fmt.Errorf("pwl: %w", err)
	}
	defer fh.Close()
	var errs []error
	bad := func(line int, format string, args ...any) {
		errs = append(errs, fmt.Errorf("%s:%d: %s", path, line, fmt.Sprintf(format, args...)))
	}
	sc := bufio.NewScanner(fh)
	line, rows := 0, 0
	for sc.Scan() {
		line++
		text := strings.TrimSpace(sc.Text())
		if text == "" || strings.HasPrefix(text, "#") {
			continue
		}
		fields := strings.Split(text, ",")
		rows++
		if len(fields) != 2 {
			bad(line, "want 2 fields time,current, got %d", len(fields))
			continue
		}
		tv, err1 := strconv.ParseFloat(strings.TrimSpace(fields[0]), 64)
		iv, err2 := strconv.ParseFloat(strings.TrimSpace(fields[1]), 64)
		if rows == 1 && err1 != nil && err2 != nil {
			continue // a header
		}
		if err1 != nil || math.IsNaN(tv) || math.IsInf(tv, 0) {
			bad(line, "time %q is not a finite number", strings.TrimSpace(fields[0]))
		}
		if err2 != nil || math.IsNaN(iv) || math.IsInf(iv, 0) {
			bad(line, "current %q is not a finite number", strings.TrimSpace(fields[1]))
		}
		if err1 != nil || err2 != nil {
			continue
		}
		switch {
		case tv < 0:
			bad(line, "time %g is negative", tv)
			continue
		case len(t) > 0 && tv <= t[len(t)-1]:
			bad(line, "time %g is not after the previous time %g: times must increase", tv, t[len(t)-1])
			continue
		}
		t = append(t, tv)
		i = append(i, iv)
	}
	if err := sc.Err(); err != nil {
		errs = append(errs, fmt.Errorf("%s: %w", path, err))
	}
	if len(errs) == 0 && len(t) < 2 {
		errs = append(errs, fmt.Errorf("%s: needs at least 2 rows of time,current, found %d", path, len(t)))
	}
	if len(errs) > 0 {
		return nil, nil, errors.Join(errs...)
	}
	return t, i, nil
}
