package report

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"

	"zapnet/mna/study"
	"zapnet/mna/study/signal"
	"zapnet/netlist"
)

// acResult analyses an invented 5 V rail input (the bead and capacitor of
// CHECKS.md's peaking cases) with a pin, and a two-port at its ends.
func acResult(t *testing.T) (*netlist.Circuit, *signal.Result) {
	t.Helper()
	c, err := netlist.Parse("rail.zap", []byte(`title "Rail input with a bead"
strike esd in gnd waveform=iec61000-4-2 level=8k
clamp D1 in gnd vbr=6.8 cj=50p m=0.4 polarity=uni
bead FB1 in out l=1.2u rdc=0.3 c=1.7p rac=1.1k
capacitor C1 out gnd 1u esr=5m esl=0.5n
pin U1 out gnd cin=5p
watch out
port P1 in gnd
port P2 out gnd z0=50
`))
	if err != nil {
		t.Fatal(err)
	}
	req, err := signal.FromCircuit(c)
	if err != nil {
		t.Fatal(err)
	}
	req.Targets[0].CMax = 1e-9
	res, err := signal.Analyse(c, req, &signal.Options{From: 1e3, To: 1e9, PerDecade: 10})
	if err != nil {
		t.Fatal(err)
	}
	return c, res
}

func TestACTables(t *testing.T) {
	c, res := acResult(t)
	var b bytes.Buffer
	if err := ACTables(&b, res, &TableOptions{Title: c.Title, Deck: "rail.zap"}); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	for _, want := range []string{"Transfer from in", "Peaking above the gain at 1 kHz", "OVER", "Damping", "C1 esr", "Capacitance seen at 1 MHz", "Two-port P1 → P2"} {
		if !strings.Contains(out, want) {
			t.Errorf("no %q in the tables:\n%s", want, out)
		}
	}
	if !strings.HasSuffix(out, Caution+"\n") {
		t.Error("the report does not end with the caution")
	}
}

// The JSON carries OUTPUT.md's fields: nodes.NODE.{freq, gain_db,
// phase_deg} and peaking[] with node, gain_db, freq, q.
func TestACJSONFields(t *testing.T) {
	c, res := acResult(t)
	var b bytes.Buffer
	if err := EncodeJSON(&b, signal.Document{Meta: study.Meta{Tool: "zapnet", Version: "test", Deck: "rail.zap", Title: c.Title}, Result: res}); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Tool  string
		Nodes map[string]struct {
			Freq     []float64 `json:"freq"`
			GainDB   []float64 `json:"gain_db"`
			PhaseDeg []float64 `json:"phase_deg"`
		}
		Peaking []struct {
			Node   string
			GainDB float64 `json:"gain_db"`
			Freq   float64
			Q      float64
		}
	}
	if err := json.Unmarshal(b.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	n, ok := doc.Nodes["out"]
	if doc.Tool != "zapnet" || !ok || len(n.Freq) == 0 || len(n.GainDB) != len(n.Freq) || len(n.PhaseDeg) != len(n.Freq) {
		t.Errorf("nodes: %+v", doc.Nodes)
	}
	if len(doc.Peaking) != 1 || doc.Peaking[0].Node != "out" || !(doc.Peaking[0].GainDB > 3) || doc.Peaking[0].Freq == 0 || doc.Peaking[0].Q == 0 {
		t.Errorf("peaking: %+v", doc.Peaking)
	}
}
