package report

import (
	"reflect"
	"testing"

	"zapnet/mna/study"
)

// A strike drawing current out of a node a supply holds takes energy: the
// ledger puts each element's energy in the column of its direction and
// gives shares of all the energy delivered (here the supply's 3 µJ and the
// capacitor's 1 µJ), so that the shares of what was absorbed add up to
// 100 % less the balance [calc: conservation of energy, the ledger's own
// identity].
func TestLedgerRowsDirections(t *testing.T) {
	r := &study.Run{
		Elements: []study.ElementResult{{Name: "V1", Kind: "supply"}, {Name: "C1", Kind: "capacitor"}, {Name: "R1", Kind: "resistor"}},
		Ledger: study.Ledger{Strike: 2e-6, Delivered: 4e-6, Balance: 0,
			Entries: []study.LedgerEntry{{Name: "V1", Energy: -3e-6}, {Name: "C1", Energy: -1e-6}, {Name: "R1", Energy: 2e-6}}},
	}
	want := [][]string{
		{"strike", "", "2 µJ", "50.0 %"},
		{"V1 (supply)", "3 µJ", "", "75.0 %"},
		{"C1 (capacitor)", "1 µJ", "", "25.0 %"},
		{"R1 (resistor)", "", "2 µJ", "50.0 %"},
		{"balance (solver residual)", "", "0 J", "0.0 %"},
	}
	if got := ledgerRows(r); !reflect.DeepEqual(got, want) {
		t.Errorf("rows\n%q\nwant\n%q", got, want)
	}
}
