// Package refdata reads the reference tables of testdata/reference for the
// tests that compare the program with them. A table is a CSV file whose
// first lines, each starting with '#', record how it was made (the script,
// its library versions, the date), followed by a header line and the rows.
package refdata

import (
	"encoding/csv"
	"os"
	"testing"
)

// Read returns the header and the rows of the reference table at path,
// skipping its '#' lines. Every row has as many fields as the header. A
// missing, malformed or empty table fails the test: a comparison with
// nothing would pass unseen.
func Read(t testing.TB, path string) (head []string, rows [][]string) {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	recs, err := r.ReadAll()
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	if len(recs) == 0 {
		t.Fatalf("%s: no header line", path)
	}
	return recs[0], recs[1:]
}
