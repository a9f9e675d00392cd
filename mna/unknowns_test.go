package mna

import (
	"path/filepath"
	"strings"
	"testing"

	"zapnet/devices"
	"zapnet/netlist"
)

// The deck reader counts the unknowns as the engine numbers them, so that
// check refuses a circuit too large to solve with the engine's own count;
// past devices.MaxUnknowns the message says how many [practice].
func TestUnknownsCountedAlike(t *testing.T) {
	decks, _ := filepath.Glob(filepath.Join("..", "testdata", "*.zap"))
	if len(decks) < 5 {
		t.Fatalf("%d demo decks", len(decks))
	}
	for _, d := range decks {
		c, err := netlist.ParseFile(d)
		if err != nil {
			t.Fatal(err)
		}
		s, err := Compile(c)
		if err != nil {
			t.Fatal(err)
		}
		if c.Unknowns != s.n {
			t.Errorf("%s: the deck counts %d unknowns, the engine %d", d, c.Unknowns, s.n)
		}
	}
	if devices.TooManyUnknowns(devices.MaxUnknowns) != nil {
		t.Error("the bound itself is refused")
	}
	if err := devices.TooManyUnknowns(devices.MaxUnknowns + 1); err == nil || !strings.Contains(err.Error(), "the circuit has 250001 unknowns") {
		t.Errorf("%v", err)
	}
}
