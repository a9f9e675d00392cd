package whatif

import (
	"testing"

	"zapnet/cmd/internal/study"
	"zapnet/netlist"
)

func TestVariantsFromSets(t *testing.T) {
	c := parse(t, "../../../testdata/signal-connector.zap") // vary R1.value=0.1,33,100
	// A set on a varied target replaces that line; a new target multiplies.
	sets := []string{"R1.value=10,47", "D2.ls=0.2n,0.5n,1n"}
	var vs []netlist.Vary
	for _, s := range sets {
		v, err := ParseSet(s)
		if err != nil {
			t.Fatal(err)
		}
		vs = append(vs, v)
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
		if s := study.VariantString(got[i]); s != want[i] {
			t.Errorf("variant %d: %s, want %s", i, s, want[i])
		}
	}
	for _, bad := range []string{"R1value=1", "R1.value=", "R1.value=1,,2", "=3"} {
		if _, err := ParseSet(bad); err == nil {
			t.Errorf("ParseSet(%q) must fail", bad)
		}
	}
	v, _ := ParseSet("R1.value=-5")
	if _, err := Variants(c, []netlist.Vary{v}); err == nil {
		t.Error("a value the parameter does not take must be reported before any solve")
	}
}

func TestRankVariants(t *testing.T) {
	// [practice] the variant whose worst run has the most margin ranks
	// first; a variant with an unsolved run ranks last.
	lim := func(p float64) *study.Limit { return &study.Limit{Element: "U1", Param: "vmax", Percent: p} }
	runs := []study.Run{
		{Job: study.Job{VariantIndex: 0, Level: 2000}, Verdict: study.Pass, Worst: lim(40)},
		{Job: study.Job{VariantIndex: 0, Level: 8000}, Verdict: study.Fail, Worst: lim(-5)},
		{Job: study.Job{VariantIndex: 1, Level: 2000}, Verdict: study.Pass, Worst: lim(50)},
		{Job: study.Job{VariantIndex: 1, Level: 8000}, Verdict: study.Pass, Worst: lim(12)},
		{Job: study.Job{VariantIndex: 2, Level: 2000}, Verdict: study.Pass, Worst: lim(90)},
		{Job: study.Job{VariantIndex: 2, Level: 8000}, Verdict: study.Error},
	}
	r := RankVariants(runs)
	if len(r) != 3 || r[0].VariantIndex != 1 || r[1].VariantIndex != 0 || r[2].VariantIndex != 2 {
		t.Fatalf("ranking %+v, want variants 1, 0, 2", r)
	}
	if r[0].Worst.Percent != 12 || r[0].WorstLevel != 8000 || r[1].Failed != 1 || r[2].Unsolved != 1 {
		t.Errorf("ranking details wrong: %+v", r)
	}
}
