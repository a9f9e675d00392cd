package main

import (
	"strings"
	"testing"
)

// `zapnet sensitivity --limit` ranks by the named limit's margin; the table
// says so, and a limit the deck does not have is unusable input. The signs
// come from the physics the whatif package's test states (a larger
// decoupling capacitor lowers the residual [practice]).
func TestSensitivityLimitFlag(t *testing.T) {
	out, errs, code := zapnet(t, "sensitivity", "../../testdata/demo-weak.zap", "--level", "8k", "--polarity", "pos",
		"--param", "C1.value,D1.rdyn", "--limit", "U1.vmax")
	if code != exitPass {
		t.Fatalf("exit %d, want 0; stderr:\n%s", code, errs)
	}
	for _, want := range []string{"effect on the margin of U1 vmax", "Baseline margin of U1 vmax:", "| C1.value |"} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
	if i, j := strings.Index(out, "C1.value"), strings.Index(out, "D1.rdyn"); i < 0 || j < 0 || i > j {
		t.Errorf("C1.value should rank above D1.rdyn at the pin:\n%s", out)
	}
	if _, errs, code := zapnet(t, "sensitivity", "../../testdata/demo-weak.zap", "--level", "8k", "--limit", "U9.vmax"); code != exitUnusable || !strings.Contains(errs, "U9.vmax") {
		t.Errorf("unknown limit: exit %d, stderr %q; want 2 naming it", code, errs)
	}
}
