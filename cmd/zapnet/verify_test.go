package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
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
		{demoDeck, "Error bar: every number within the 0.2 % asked of it, solved again at 0.02 %", false},
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
						Name            string
						Value, Relative float64
						Within          bool
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
		html, _ := os.ReadFile(page)
		if !strings.Contains(string(html), `id="run-1-verify"`) {
			t.Errorf("%s: the page has no table of the error bar", c.deck)
		}
	}
}
