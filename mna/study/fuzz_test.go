package study

import (
	"context"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"zapnet/netlist"
)

// FuzzStudy reads arbitrary decks and solves the small ones: a deck the
// reader accepts must solve or fail with a sentence, never panic (the
// study turns a panic into an "internal error" run, which fails here), and
// every number of a solved run must be finite. Each run has a tenth of a
// second: what is slower is stopped through its context, which is no
// failure.
func FuzzStudy(f *testing.F) {
	filepath.WalkDir(filepath.Join("..", "..", "testdata"), func(path string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() && strings.HasSuffix(path, ".zap") {
			if src, err := os.ReadFile(path); err == nil && len(src) < 4096 {
				f.Add(src)
			}
		}
		return nil
	})
	f.Add([]byte("strike s a gnd waveform=tlp level=1 width=1n rise=1p\nline T a b z0=50 delay=1f\nresistor R b gnd 1\n"))
	f.Add([]byte("strike s a gnd waveform=surge-8-20 level=1k\nclamp D a gnd vbr=5\ncapacitor C a gnd 1f\n"))
	name := filepath.Join("..", "..", "testdata", "fuzz.zap")
	f.Fuzz(func(t *testing.T, src []byte) {
		c, err := netlist.Parse(name, src)
		if err != nil || len(c.Elements) > 12 || c.Plan().Runs() > 4 {
			return
		}
		ctx, cancel := context.WithTimeout(context.Background(), 100*time.Millisecond*time.Duration(c.Plan().Runs()))
		defer cancel()
		jobs, err := Jobs(c, nil)
		if err != nil {
			return
		}
		runs, _ := Execute(ctx, c, jobs, &Options{Workers: 1}, nil)
		for _, r := range runs {
			if r.Err != nil {
				if strings.Contains(r.Err.Error(), "internal error") {
					t.Fatalf("%s: %v", r.Label(), r.Err)
				}
				continue
			}
			finite := func(what string, v float64) {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					t.Fatalf("%s: %s is %v", r.Label(), what, v)
				}
			}
			for _, n := range r.Nodes {
				finite(n.Name+" max", n.Max)
				finite(n.Name+" min", n.Min)
			}
			for _, e := range r.Elements {
				finite(e.Name+" peak current", e.PeakCurrent)
				finite(e.Name+" energy", e.Energy)
			}
			for _, l := range r.Limits {
				finite(l.Name()+" measured", l.Measured)
			}
			finite("balance", r.Ledger.Balance)
			if r.Verdict != Pass && r.Verdict != Fail {
				t.Fatalf("%s: verdict %s without an error", r.Label(), r.Verdict)
			}
		}
	})
}
