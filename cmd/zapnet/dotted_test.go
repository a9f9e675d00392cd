package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"
)

// dottedDeck names its capacitor C.1: element names may hold dots, so every
// ELEMENT.PARAM splits at the last one (LANGUAGE.md).
const dottedDeck = `title "Dotted names"
strike zap in gnd waveform=iec61000-4-2 level=2k
resistor R.s in out 10
capacitor C.1 out gnd 10n
pin U.1 out gnd cin=5p vmax=6 vmin=-1
`

// The command line, the JSON, a merge and a sensitivity all address the
// capacitor C.1 by C.1.value, as the deck's vary line does [LANGUAGE.md].
func TestDottedElementNames(t *testing.T) {
	dir := t.TempDir()
	deck := filepath.Join(dir, "dotted.zap")
	if err := os.WriteFile(deck, []byte(dottedDeck), 0o644); err != nil {
		t.Fatal(err)
	}
	out, errs, code := zapnet(t, "run", deck, "--set", "C.1.value=100n,220n", "--json", "-")
	if code != exitPass {
		t.Fatalf("run --set C.1.value: exit %d\n%s", code, errs)
	}
	var doc struct {
		Runs []struct {
			Variant map[string]string `json:"variant"`
		} `json:"runs"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Runs) != 2 || doc.Runs[0].Variant["C.1.value"] != "100n" || doc.Runs[1].Variant["C.1.value"] != "220n" {
		t.Fatalf("variants %+v, want C.1.value=100n and 220n", doc.Runs)
	}

	// Shards of the same sweep merge back, variants and all.
	a, b := filepath.Join(dir, "a.json"), filepath.Join(dir, "b.json")
	for i, f := range []string{a, b} {
		if _, errs, code := zapnet(t, "run", deck, "--set", "C.1.value=100n,220n", "--shard", []string{"1/2", "2/2"}[i], "--json", f); code != exitPass {
			t.Fatalf("shard %d: exit %d\n%s", i+1, code, errs)
		}
	}
	if out, errs, code := zapnet(t, "merge", a, b); code != exitPass {
		t.Fatalf("merge: exit %d\n%s%s", code, out, errs)
	}

	if _, errs, code := zapnet(t, "sensitivity", deck, "--param", "C.1.value,R.s.value", "--limit", "U.1.vmax"); code != exitPass {
		t.Fatalf("sensitivity with dotted names: exit %d\n%s", code, errs)
	}
}
