package signal

import (
	"os"
	"strings"
	"testing"

	"zapnet/devices/spec"
)

// The budgets table in README.md and Budgets agree row for row: the README
// is where a user reads and edits them.
func TestBudgetsMatchREADME(t *testing.T) {
	data, err := os.ReadFile("../../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	text := string(data)
	start := strings.Index(text, "## Interface budgets")
	if start < 0 {
		t.Fatal("README.md has no Interface budgets section")
	}
	var rows [][]string
	for _, line := range strings.Split(text[start:], "\n")[1:] {
		if strings.HasPrefix(line, "## ") {
			break
		}
		if !strings.HasPrefix(line, "| `") {
			continue
		}
		var cells []string
		for _, c := range strings.Split(strings.Trim(line, "|"), "|") {
			cells = append(cells, strings.TrimSpace(c))
		}
		rows = append(rows, cells)
	}
	if len(rows) != len(Budgets) {
		t.Fatalf("README lists %d interfaces, Budgets %d", len(rows), len(Budgets))
	}
	for i, b := range Budgets {
		r := rows[i]
		if r[0] != "`"+b.Name+"`" || r[2] != spec.FormatSI(b.CMax, spec.Farad) || r[3] != spec.FormatSI(b.Rise, spec.Second) {
			t.Errorf("README row %d %q; Budgets has %s, %s, %s", i+1, r, b.Name, spec.FormatSI(b.CMax, spec.Farad), spec.FormatSI(b.Rise, spec.Second))
		}
	}
	if b, ok := LookupBudget("USB2-HS"); !ok || b.CMax != 3e-12 {
		t.Errorf("LookupBudget(USB2-HS) = %+v, %v", b, ok)
	}
}
