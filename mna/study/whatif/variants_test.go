package whatif

import (
	"fmt"
	"strings"
	"testing"

	"zapnet/mna/study"
)

func TestVariantsFromSets(t *testing.T) {
	c := parse(t, "../../../testdata/signal-connector.zap") // vary R1.value=0.1,33,100
	// A set on a varied target replaces that line; a new target multiplies.
	vs, err := ParseSets(c, []string{"R1.value=10,47", "D2.ls=0.2n,0.5n,1n"})
	if err != nil {
		t.Fatal(err)
	}
	got, err := Variants(c, vs)
	if err != nil {
		t.Fatal(err)
	}
	// [calc] 2 × 3 variants, the first line varying slowest.
	want := []string{
		"R1.value=10 D2.ls=0.2n", "R1.value=10 D2.ls=0.5n", "R1.value=10 D2.ls=1n",
		"R1.value=47 D2.ls=0.2n", "R1.value=47 D2.ls=0.5n", "R1.value=47 D2.ls=1n",
	}
	if len(got) != len(want) {
		t.Fatalf("%d variants, want %d", len(got), len(want))
	}
	for i := range want {
		if s := got[i].String(); s != want[i] {
			t.Errorf("variant %d: %s, want %s", i, s, want[i])
		}
	}
	// Malformed sets, and values the parameter does not take, are
	// reported before any solve, in the deck's words but at no deck line.
	for _, bad := range []string{"R1value=1", "R1.value=", "R1.value=1,,2", "=3", "R1.value=-5", "R1.value=1uH"} {
		if _, err := ParseSets(c, []string{bad}); err == nil {
			t.Errorf("ParseSets(%q) must fail", bad)
		} else if strings.Contains(err.Error(), ".zap:") {
			t.Errorf("ParseSets(%q): %v names a deck line", bad, err)
		}
	}
	if _, err := ParseSets(c, []string{"R1.value=1", "R1.value=2"}); err == nil {
		t.Error("a target set twice must fail")
	}
	// Three lines of 30 values with the deck's 3 make 81 000 variants, past
	// the bound: refused before anything is built, naming the product.
	many := func(p string) string {
		s := make([]string, 30)
		for i := range s {
			s[i] = fmt.Sprintf("%dp", i+1)
		}
		return p + "=" + strings.Join(s, ",")
	}
	vs, err = ParseSets(c, []string{many("D2.ls"), many("D2.cj"), many("D2.rdyn")})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := Variants(c, vs); err == nil || !strings.Contains(err.Error(), "3 × 30 × 30 × 30 = 81000 variants") {
		t.Errorf("81 000 variants: %v", err)
	}
}

func TestRankVariants(t *testing.T) {
	// [practice] the variant whose worst run has the most margin ranks
	// first; a variant with an unsolved run ranks last.
	lim := func(p float64) *study.Limit { return &study.Limit{Element: "U1", Param: "vmax", Percent: p} }
	runs := []study.Run{
		{VariantIndex: 0, Level: 2000, Verdict: study.Pass, Worst: lim(40)},
		{VariantIndex: 0, Level: 8000, Verdict: study.Fail, Worst: lim(-5)},
		{VariantIndex: 1, Level: 2000, Verdict: study.Pass, Worst: lim(50)},
		{VariantIndex: 1, Level: 8000, Verdict: study.Pass, Worst: lim(12)},
		{VariantIndex: 2, Level: 2000, Verdict: study.Pass, Worst: lim(90)},
		{VariantIndex: 2, Level: 8000, Verdict: study.Error},
	}
	r := RankVariants(runs)
	if len(r) != 3 || r[0].VariantIndex != 1 || r[1].VariantIndex != 0 || r[2].VariantIndex != 2 {
		t.Fatalf("ranking %+v, want variants 1, 0, 2", r)
	}
	if r[0].Worst.Percent != 12 || r[0].WorstLevel != 8000 || r[1].Failed != 1 || r[2].Unsolved != 1 {
		t.Errorf("ranking details wrong: %+v", r)
	}
}
