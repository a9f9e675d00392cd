package refdata

import (
	"os"
	"path/filepath"
	"slices"
	"testing"
)

// The provenance lines are skipped wherever they stand before the header,
// and the header and rows come back apart, as the reference scripts write
// them (testdata/reference/*.py).
func TestReadSkipsProvenance(t *testing.T) {
	path := filepath.Join(t.TempDir(), "table.csv")
	src := "# written by a script\n# Python 3, SciPy\nname,value\na,1.5\nb,-2e-3\n"
	if err := os.WriteFile(path, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	head, rows := Read(t, path)
	if !slices.Equal(head, []string{"name", "value"}) {
		t.Errorf("header %q", head)
	}
	if len(rows) != 2 || !slices.Equal(rows[0], []string{"a", "1.5"}) || !slices.Equal(rows[1], []string{"b", "-2e-3"}) {
		t.Errorf("rows %q", rows)
	}
}
