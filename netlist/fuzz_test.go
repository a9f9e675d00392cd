package netlist

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// FuzzParse feeds arbitrary text to the parser. A deck is user input: the
// parser must never panic, and must return either a circuit or an ErrorList
// of positioned problems, never both and never neither.
func FuzzParse(f *testing.F) {
	filepath.WalkDir(filepath.Join("..", "testdata"), func(path string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() && strings.HasSuffix(path, ".zap") {
			if src, err := os.ReadFile(path); err == nil {
				f.Add(src)
			}
		}
		return nil
	})
	for _, s := range []string{
		"", "\\", "\"", "strike", "title \"a\\\"b\"", "resistor R1 a gnd 1k \\\n",
		"watch\x00", "level=2k,,", "vary A.=1", "tolerance .x=5%", "window stop=-1",
		"strike s a a waveform=pwl level=1 file=\"\"",
	} {
		f.Add([]byte(s))
	}
	// The deck sits beside the demo decks so that includes of the part
	// library resolve.
	name := filepath.Join("..", "testdata", "fuzz.zap")
	f.Fuzz(func(t *testing.T, src []byte) {
		c, err := Parse(name, src)
		if err != nil {
			var l ErrorList
			if !errors.As(err, &l) || len(l) == 0 || c != nil {
				t.Fatalf("error %T %v with circuit %v", err, err, c)
			}
			for _, e := range l {
				if e.Summary() {
					continue // stands for the problems past MaxProblems
				}
				if e.Msg == "" || !e.Pos.IsValid() && e.Pos.File == "" {
					t.Fatalf("error without message or position: %#v", e)
				}
			}
			return
		}
		if c == nil {
			t.Fatal("no circuit and no error")
		}
		pl := c.Plan()
		if pl.Runs() < 1 {
			t.Fatalf("a checked deck plans no run: %+v", pl)
		}
		for _, v := range pl.Variants {
			if _, err := c.With(v...); err != nil {
				t.Fatalf("a variant of a checked deck fails: %v", err)
			}
		}
		// What the check accepts the models accept: a checked deck
		// builds every device.
		for _, e := range c.Elements {
			if _, err := e.Kind.New(e.Name, e.Nodes, &e.Values); err != nil {
				t.Fatalf("a checked element does not build: %v", err)
			}
		}
	})
}
