package main

import (
	"fmt"
	"os"
	"strings"
	"testing"

	"zapnet/devices"
	"zapnet/devices/spec"
	"zapnet/waveforms"
)

// kindsTable renders the table of element kinds README shows, from the
// catalogue each kind describes itself in: the README cannot drift from
// what the deck reader takes.
func kindsTable() string {
	var b strings.Builder
	b.WriteString("| kind | nodes | parameters (unit, default) |\n| --- | --- | --- |\n")
	for _, k := range devices.Catalogue() {
		// A bar inside a cell would end it: |v| is written \|v\|.
		cell := strings.ReplaceAll(kindParams(k), "|", `\|`)
		fmt.Fprintf(&b, "| `%s` | %s %s | %s |\n", k.Name, k.Terminals[0], k.Terminals[1], cell)
	}
	return b.String()
}

// kindParams describes a kind's parameters in one cell: the design and
// model parameters, the words, then the ratings with what each is judged
// on.
func kindParams(k *devices.Kind) string {
	parts := []string{k.Summary}
	var ratings []string
	for _, p := range k.Table.Params {
		if p.Rates != nil {
			r := fmt.Sprintf("`%s` %s (%s", p.Key, p.Unit, p.Rates.Says)
			if p.Note != "" {
				r += ", " + p.Note
			}
			ratings = append(ratings, r+")")
			continue
		}
		parts = append(parts, paramText(p))
	}
	for _, w := range k.Table.Words {
		parts = append(parts, wordText(w))
	}
	if len(ratings) > 0 {
		parts = append(parts, "ratings "+strings.Join(ratings, ", ")+", optional")
	}
	return strings.Join(parts, "; ")
}

// paramText is one numeric parameter: "`ls` H (0)", "value Ω, required, > 0".
func paramText(p spec.Param) string {
	s := "`" + p.Key + "`"
	if p.Key == "value" {
		s = "value"
	}
	if p.Unit != "" {
		s += " " + string(p.Unit)
	}
	switch {
	case p.Required && p.Unless != "":
		s += ", required unless `" + p.Unless + "` is given"
	case p.Required:
		s += ", required"
	case p.HasDefault:
		s += " (" + spec.FormatSI(p.Default, p.Unit) + ")"
	default:
		s += ", optional"
	}
	switch p.Rule {
	case spec.Positive:
		if p.Required {
			s += ", > 0"
		}
	case spec.Fraction:
		s += ", from 0 up to but not including 1"
	case spec.Count:
		s += ", a whole number"
	}
	if p.OnlyWith != "" {
		s += ", only with `" + p.OnlyWith + "`"
	}
	if p.Note != "" {
		s += ", " + p.Note
	}
	return s
}

// wordText is one word parameter: "`polarity` `uni` or `bi` (uni)".
func wordText(w spec.Word) string {
	switch {
	case w.Node:
		return "`" + w.Key + "=NODE`, optional"
	case w.Path:
		return "`" + w.Key + "=\"FILE\"`, optional"
	case len(w.Choices) == 0:
		return "`" + w.Key + "=NAME`"
	}
	q := make([]string, len(w.Choices))
	for i, c := range w.Choices {
		q[i] = "`" + c + "`"
	}
	s := "`" + w.Key + "` "
	if len(q) > 1 {
		s += strings.Join(q[:len(q)-1], ", ") + " or " + q[len(q)-1]
	} else {
		s += strings.Join(q, "")
	}
	if w.Default != "" {
		s += " (" + w.Default + ")"
	}
	return s
}

// README's table of element kinds is the catalogue's; go test -update
// rewrites it between its markers.
func TestREADMEKindsTable(t *testing.T) {
	const begin, end = "<!-- kinds table: generated from the catalogue by go test ./cmd/zapnet -update -->\n", "<!-- end of kinds table -->\n"
	b, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	s := string(b)
	i, j := strings.Index(s, begin), strings.Index(s, end)
	if i < 0 || j < i {
		t.Fatalf("README.md lacks the markers of the kinds table")
	}
	want := kindsTable()
	if got := s[i+len(begin) : j]; got != want {
		if *update {
			if err := os.WriteFile("../../README.md", []byte(s[:i+len(begin)]+want+s[j:]), 0o644); err != nil {
				t.Fatal(err)
			}
			return
		}
		t.Errorf("README's kinds table differs from the catalogue (go test ./cmd/zapnet -update rewrites it):\n%s", want)
	}
}

// README's table of stimuli names every waveform of the catalogue, in its
// order, with the unit its levels are in, and no other.
func TestREADMEStimuliTable(t *testing.T) {
	b, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	var names, units []string
	in := false
	for _, l := range strings.Split(string(b), "\n") {
		switch {
		case strings.HasPrefix(l, "| `waveform=` |"):
			in = true
		case in && strings.HasPrefix(l, "| `"):
			cells := strings.Split(l, " | ")
			names = append(names, strings.Trim(cells[0], "| `"))
			units = append(units, strings.Fields(cells[2])[0])
		case in && !strings.HasPrefix(l, "|"):
			in = false
		}
	}
	var want, wantUnits []string
	for _, w := range waveforms.Catalogue() {
		want = append(want, w.Name)
		u := string(w.Unit)
		if u == "" {
			u = "scale"
		}
		wantUnits = append(wantUnits, u)
	}
	if strings.Join(names, " ") != strings.Join(want, " ") {
		t.Errorf("README lists the waveforms\n%q\nthe catalogue has\n%q", names, want)
	}
	if strings.Join(units, " ") != strings.Join(wantUnits, " ") {
		t.Errorf("README gives the level units\n%q\nthe catalogue\n%q", units, wantUnits)
	}
}
