package main

// golden compares a test's output with a file kept under testdata/golden,
// or rewrites that file with go test ./cmd/zapnet -update.

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf8"
)

// update rewrites the golden files instead of comparing with them:
// go test ./PACKAGE -update.
var update = flag.Bool("update", false, "rewrite the golden files under testdata")

// golden compares got with testdata/golden/NAME, or rewrites that file
// (and makes its folder) with -update. A mismatch names the first differing
// line and column.
func golden(t testing.TB, name string, got []byte) {
	t.Helper()
	path := filepath.Join("testdata", "golden", name)
	if *update {
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (create it with go test -update)", err)
	}
	if bytes.Equal(got, want) {
		return
	}
	gl := strings.Split(string(got), "\n")
	wl := strings.Split(string(want), "\n")
	for k := 0; k < len(gl) || k < len(wl); k++ {
		var g, w string
		if k < len(gl) {
			g = gl[k]
		}
		if k < len(wl) {
			w = wl[k]
		}
		if g == w {
			continue
		}
		col, i := 1, 0
		for i < len(g) && i < len(w) && g[i] == w[i] {
			_, n := utf8.DecodeRuneInString(g[i:])
			i += n
			col++
		}
		t.Errorf("%s:%d:%d: output differs (go test -update rewrites it)\ngot:  %s\nwant: %s", path, k+1, col, g, w)
		return
	}
}
