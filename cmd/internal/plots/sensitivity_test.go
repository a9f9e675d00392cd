package plots

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"zapnet/mna/study/whatif"
)

// The bar chart names every parameter it draws, in the legend says which
// bar is which step, and draws the baseline; an unsolved parameter and one
// with an unbounded margin are left out and counted in the caption
// [practice: the figure shows what the sensitivity table ranks].
func TestSensitivityBars(t *testing.T) {
	res := &whatif.SensitivityResult{Baseline: 12.5, Step: 0.10, Parameters: []whatif.ParamEffect{
		{Param: "D1.ls", Minus10: 20, Plus10: 5, Effect: -7.5},
		{Param: "Lpad.value", Minus10: 10, Plus10: 15, Effect: 2.5},
		{Param: "D1.vbr", Minus10: 14, Plus10: 11, Effect: -1.5},
		{Param: "C1.value", Minus10: -math.MaxFloat64, Plus10: 3},
		{Param: "U1.cin", Error: "at −10 %: no convergence"},
	}}
	f, err := SensitivityBars("Deck title", res, nil)
	if err != nil {
		t.Fatal(err)
	}
	if f.Name != "sensitivity" {
		t.Errorf("name %q", f.Name)
	}
	want := []string{"−10 %", "+10 %", "baseline 12.5 %"}
	if !slices.Equal(f.Series, want) {
		t.Errorf("series %q, want %q", f.Series, want)
	}
	if !strings.Contains(f.Caption, "2 left out") {
		t.Errorf("caption %q does not count the parameters left out", f.Caption)
	}
	texts, elems := svgText(t, "sensitivity", f.SVG)
	for _, w := range append(want, "D1.ls", "Lpad.value", "D1.vbr", "Deck title", "worst margin (% of the limit)") {
		if !slices.Contains(texts, w) {
			t.Errorf("no text %q in %q", w, texts)
		}
	}
	for _, w := range []string{"C1.value", "U1.cin"} {
		if slices.Contains(texts, w) {
			t.Errorf("%s is drawn though it has no finite margin", w)
		}
	}
	// Every margin here is positive: no zero line.
	if slices.Contains(texts, "0 %: PASS right, FAIL left") {
		t.Error("a zero line was drawn though no bar reaches it")
	}
	if elems["path"] == 0 {
		t.Error("no path drawn")
	}

	// Bars on both sides of 0 % bring the zero line; a step of 5 % is
	// named so.
	res.Step = 0.05
	res.Parameters[0].Plus10 = -4
	f, err = SensitivityBars("", res, nil)
	if err != nil {
		t.Fatal(err)
	}
	if want := []string{"−5 %", "+5 %", "baseline 12.5 %", "0 %: PASS right, FAIL left"}; !slices.Equal(f.Series, want) {
		t.Errorf("series %q, want %q", f.Series, want)
	}

	// Ranked by a named limit, the axis says which.
	res.Limit = "U1.vmax"
	f, err = SensitivityBars("", res, nil)
	if err != nil {
		t.Fatal(err)
	}
	if texts, _ := svgText(t, "sensitivity", f.SVG); !slices.Contains(texts, "margin of U1 vmax (% of the limit)") {
		t.Errorf("the axis does not name the limit: %q", texts)
	}
}

// More than MaxBars parameters: the first MaxBars in ranking order are
// drawn and the caption says so.
func TestSensitivityBarsBounded(t *testing.T) {
	res := &whatif.SensitivityResult{Baseline: 0, Step: 0.1}
	for i := 0; i < MaxBars+5; i++ {
		res.Parameters = append(res.Parameters, whatif.ParamEffect{Param: fmt.Sprintf("R%d.value", i), Minus10: float64(-i), Plus10: float64(i)})
	}
	f, err := SensitivityBars("", res, nil)
	if err != nil {
		t.Fatal(err)
	}
	texts, _ := svgText(t, "sensitivity", f.SVG)
	if !slices.Contains(texts, fmt.Sprintf("R%d.value", MaxBars-1)) || slices.Contains(texts, fmt.Sprintf("R%d.value", MaxBars)) {
		t.Errorf("want the first %d parameters drawn, got %q", MaxBars, texts)
	}
	if !strings.Contains(f.Caption, fmt.Sprintf("first %d of %d", MaxBars, MaxBars+5)) {
		t.Errorf("caption %q", f.Caption)
	}
	if _, err := SensitivityBars("", &whatif.SensitivityResult{Step: 0.1}, nil); err == nil {
		t.Error("a study without parameters drew a figure")
	}
}
