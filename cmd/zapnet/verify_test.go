package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"zapnet/mna"
)

// --verify solves every run again at a tenth of its accuracy: at the
// default accuracy the demo's numbers hold (the engine's promise, checked
// against SciPy references in mna), while a deliberately coarse window
// (accuracy=10%) draws a warning naming the number that moved most; the
// JSON carries every number with its difference and the page shows the
// table [practice: the difference to a tenfold tighter solution bounds
// the error of the first].
func TestVerifyWarnsWhenCoarse(t *testing.T) {
	dir := t.TempDir()
	src, err := os.ReadFile(demoDeck)
	if err != nil {
		t.Fatal(err)
	}
	coarse := filepath.Join(filepath.Dir(demoDeck), "coarse-verify-test.zap")
	deck := strings.Replace(string(src), "\nstrike", "\nwindow accuracy=10%\nstrike", 1)
	if err := os.WriteFile(coarse, []byte(deck), 0o644); err != nil {
		t.Fatal(err)
	}
	defer os.Remove(coarse)

	for _, c := range []struct {
		deck, want string
		beyond     bool
	}{
		{demoDeck, "Error bar: every number within the 0.2 % (a pin's currents 1 %) asked of it, solved again at 0.02 %", false},
		{coarse, "WARNING: ", true},
	} {
		js := filepath.Join(dir, "v.json")
		page := filepath.Join(dir, "v.html")
		out, errs, code := runMain(t, c.deck, "--level", "8k", "--polarity", "pos", "--verify", "--json", js, "--html", page)
		if code == exitUnusable {
			t.Fatalf("%s: exit %d\n%s", c.deck, code, errs)
		}
		if !strings.Contains(out, c.want) {
			t.Errorf("%s: the report lacks %q:\n%s", c.deck, c.want, out)
		}
		var doc struct {
			Runs []struct {
				Verify *struct {
					Accuracy, Tighter float64
					Beyond            int
					Quantities        []struct {
						Name                     string
						Value, Tighter, Relative float64
						Asked                    float64
						Within                   bool
					}
				}
			}
		}
		b, err := os.ReadFile(js)
		if err != nil {
			t.Fatal(err)
		}
		if err := json.Unmarshal(b, &doc); err != nil {
			t.Fatal(err)
		}
		v := doc.Runs[0].Verify
		if v == nil || len(v.Quantities) < 10 || (v.Beyond > 0) != c.beyond || v.Tighter != v.Accuracy/10 {
			t.Fatalf("%s: verify %+v", c.deck, v)
		}
		// Each number once, held to the accuracy the engine states for
		// it (mna.PinCurrentFactor for a pin's currents).
		seen := map[[2]float64]string{}
		for _, q := range v.Quantities {
			if k := [2]float64{q.Value, q.Tighter}; q.Value != 0 && seen[k] != "" {
				t.Errorf("%s: %s is %s again", c.deck, q.Name, seen[k])
			} else {
				seen[k] = q.Name
			}
			want := v.Accuracy
			if q.Name == "U1 internal-path current" || q.Name == "U1 peak current" {
				want = mna.PinCurrentFactor * v.Accuracy
			}
			if q.Asked != want || q.Within != (q.Relative <= q.Asked) {
				t.Errorf("%s: %s held to %g, within %v at %g; want held to %g", c.deck, q.Name, q.Asked, q.Within, q.Relative, want)
			}
		}
		html, _ := os.ReadFile(page)
		if !strings.Contains(string(html), `id="run-1-verify"`) {
			t.Errorf("%s: the page has no table of the error bar", c.deck)
		}
	}
}
