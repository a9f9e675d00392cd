package report

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"zapnet/devices/spec"
	"zapnet/mna/study"
	"zapnet/netlist"
)

// CSV writes a recorded run's waveforms (OUTPUT.md): a header of plain
// names with units, `time [s],n1 [V],...,D1 [A],...,U1.ipath [A],...,zap [A]`,
// and one row per accepted point, SI units, %.9g. Node columns are
// voltages to gnd; element columns are the current into each element's
// first terminal; the last is the current the strike (named) drives into
// its node. The run must have been solved with Options.Record.
func CSV(w io.Writer, r *study.Run) error {
	wv := r.Waves
	if wv == nil {
		return errors.New("report: the run was not recorded (study.Options.Record)")
	}
	ew := &CheckedWriter{W: w}
	head := []string{column("time", spec.Second)}
	for _, n := range wv.Nodes {
		head = append(head, column(n, spec.Volt))
	}
	for _, e := range wv.Elements {
		head = append(head, column(e, spec.Ampere))
	}
	for _, p := range wv.Probes {
		head = append(head, column(p.Name, p.Unit))
	}
	if wv.Strike != nil {
		head = append(head, column(wv.StrikeName, spec.Ampere))
	}
	io.WriteString(ew, strings.Join(head, ",")+"\n")
	buf := make([]byte, 0, 32*len(head))
	num := func(v float64) {
		buf = append(buf, ',')
		buf = strconv.AppendFloat(buf, v, 'g', 9, 64)
	}
	for k, t := range wv.Time {
		buf = strconv.AppendFloat(buf[:0], t, 'g', 9, 64)
		for _, v := range wv.V {
			num(v[k])
		}
		for _, i := range wv.I {
			num(i[k])
		}
		for _, p := range wv.P {
			num(p[k])
		}
		if wv.Strike != nil {
			num(wv.Strike[k])
		}
		buf = append(buf, '\n')
		ew.Write(buf)
	}
	return ew.Err
}

// CSVPaths names one CSV file per run from target: with one run, target
// itself; with several, target is a folder (existing, or ending in a path
// separator) that receives one file per run named after the deck, variant,
// level and polarity ("demo_8kV_pos.csv", "demo_C1.value-1u_8kV_pos.csv"),
// or a pattern containing "{run}", replaced by the same name without the
// deck's.
//
// names are the runs' names (RunName), so that the paths are known, and
// checked, before any run is solved.
func CSVPaths(target, deck string, names []string) ([]string, error) {
	if target == "" {
		return nil, errors.New("--csv needs a file, a folder or a pattern with {run}")
	}
	if len(names) == 1 && !strings.Contains(target, "{run}") && !isDir(target) {
		return []string{target}, nil
	}
	base := strings.TrimSuffix(filepath.Base(deck), filepath.Ext(deck))
	var paths []string
	seen := map[string]bool{}
	for _, name := range names {
		var p string
		switch {
		case strings.Contains(target, "{run}"):
			p = strings.ReplaceAll(target, "{run}", name)
		case isDir(target):
			p = filepath.Join(target, base+"_"+name+".csv")
		default:
			return nil, fmt.Errorf("--csv %s: %d runs need a folder (ending in /) or a pattern with {run}, for example --csv 'out/{run}.csv'", target, len(names))
		}
		if seen[p] {
			return nil, fmt.Errorf("--csv %s: two runs would write %s", target, p)
		}
		seen[p] = true
		paths = append(paths, p)
	}
	return paths, nil
}

// column is a CSV column's heading: the name and its unit, "n1 [V]".
func column(name string, unit spec.Unit) string {
	if unit == "" {
		return name
	}
	return name + " [" + string(unit) + "]"
}

// RunName is a run's name for files: "8kV_pos", "C1.value-1u_8kV_pos";
// the level is in unit, the waveform's.
func RunName(v netlist.Variant, level float64, unit spec.Unit, polarity string) string {
	var parts []string
	for _, s := range v {
		parts = append(parts, s.Target()+"-"+s.Text)
	}
	parts = append(parts, spec.FormatSI(level, unit), polarity)
	name := strings.Join(parts, "_")
	return strings.Map(func(c rune) rune {
		switch {
		case c == ' ':
			return -1
		case c == 'µ':
			return 'u'
		case c == 'Ω':
			return 'R'
		case c == '/' || c == '\\' || c == ':' || c == '*' || c == '?' || c == '"' || c == '<' || c == '>' || c == '|':
			return '-'
		}
		return c
	}, name)
}

func isDir(p string) bool {
	if strings.HasSuffix(p, "/") || strings.HasSuffix(p, string(filepath.Separator)) {
		return true
	}
	st, err := os.Stat(p)
	return err == nil && st.IsDir()
}
