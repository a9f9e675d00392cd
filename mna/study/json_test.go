package study

import (
	"bytes"
	"encoding/json"
	"math"
	"reflect"
	"testing"

	"zapnet/netlist"
)

// The JSON of a sweep (OUTPUT.md) reads back into the study's own types:
// the run's fields, its limits (an energy's without a time), its nodes and
// elements keyed by name, and its ledger with the strike's entry negative
// and the balance beside the entries [the contract of OUTPUT.md].
func TestDocumentRoundTrip(t *testing.T) {
	r := newRun(Job{Index: 3, Level: 8000, Polarity: "neg",
		Variant: netlist.Variant{{Element: "C.1", Param: "value", Num: 1e-6, Text: "1u"}}})
	r.Waveform, r.LevelUnit = "iec61000-4-2", "V"
	r.Limits = []Limit{NewLimit("U1", "vmax", "V", 5.5, 4.8, 1e-9, true, "residual peak"),
		NewLimit("D1", "emax", "J", 1e-3, 2e-6, math.NaN(), true, "energy")}
	r.Nodes = NodeResults{{Name: "n2", Max: 4.8, TMax: 1e-9, Min: -0.3, TMin: 2e-9}}
	pk, at := 3.1, 5e-10
	r.Elements = ElementResults{
		{Name: "U1", Kind: "pin", PeakCurrent: 0.2, TPeak: 1e-9, Energy: 1e-8, Residual: &Residual{Name: "U1", Peak: 4.8, TPeak: 1e-9}},
		{Name: "C1", Kind: "capacitor", PeakCurrent: 1, TPeak: 2e-9, Energy: 2e-8, PeakVoltage: &pk, TPeakVoltage: &at},
	}
	r.Ledger = Ledger{Strike: -4e-6, Entries: []LedgerEntry{{Name: "C1", Energy: 2e-8}, {Name: "U1", Energy: 1e-8}}, Balance: 1e-15}
	r.Ledger.share()
	Judge(&r)
	doc := Document{Meta: Meta{Tool: "zapnet", Version: "test", Deck: "demo.zap", Title: "t"}, Runs: []Run{r}}
	b, err := json.Marshal(doc)
	if err != nil {
		t.Fatal(err)
	}
	var raw map[string]any
	if err := json.Unmarshal(b, &raw); err != nil {
		t.Fatal(err)
	}
	run := raw["runs"].([]any)[0].(map[string]any)
	if got := run["ledger"].(map[string]any); got["strike"] != -4e-6 || got["balance"] != 1e-15 || got["C1"] != 2e-8 {
		t.Errorf("ledger JSON %v", got)
	}
	if got := run["variant"].(map[string]any); got["C.1.value"] != "1u" {
		t.Errorf("variant JSON %v", got)
	}
	if _, ok := run["limits"].([]any)[1].(map[string]any)["at"]; ok {
		t.Errorf("an energy limit has a time")
	}

	var back Document
	if err := json.NewDecoder(bytes.NewReader(b)).Decode(&back); err != nil {
		t.Fatal(err)
	}
	got := back.Runs[0]
	if back.Meta != doc.Meta || got.Index != 3 || got.Level != 8000 || got.Verdict != Pass || got.Worst == nil || got.Worst.Name() != "U1 vmax" {
		t.Fatalf("decoded %+v", got)
	}
	if v := got.Variant; len(v) != 1 || v[0].Element != "C.1" || v[0].Param != "value" || v[0].Text != "1u" {
		t.Errorf("variant %+v: the element name keeps its dot", v)
	}
	if !math.IsNaN(got.Limits[1].At) || got.Limits[0].At != 1e-9 || got.Limits[0].Margin != r.Limits[0].Margin {
		t.Errorf("limits %+v", got.Limits)
	}
	if got.Ledger.Strike != -4e-6 || got.Ledger.Delivered != 4e-6 || !reflect.DeepEqual(got.Ledger.Entries, r.Ledger.Entries) {
		t.Errorf("ledger %+v, want %+v", got.Ledger, r.Ledger)
	}
	if got.Nodes[0].Name != "n2" || got.Nodes[0].Max != 4.8 {
		t.Errorf("nodes %+v", got.Nodes)
	}
	if p := got.Pins(); len(p) != 1 || p[0].Name != "U1" || p[0].Peak != 4.8 {
		t.Errorf("pins %+v", p)
	}
	again, _ := json.Marshal(back)
	if !bytes.Equal(again, b) {
		t.Errorf("re-encoding differs:\n%s\n%s", again, b)
	}
}
