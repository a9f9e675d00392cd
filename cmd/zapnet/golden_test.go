package main

import (
	"path/filepath"
	"testing"

	goldenfile "zapnet/cmd/internal/golden"
)

// golden compares got with testdata/golden/NAME, or rewrites that file with
// go test ./cmd/zapnet -update (package golden declares the flag).
func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	goldenfile.Check(t, filepath.Join("testdata", "golden", name), got)
}
