package devices

import (
	"math"
	"strconv"
	"testing"

	"zapnet/internal/refdata"
)

func TestIVTableAgreesWithSciPy(t *testing.T) {
	// The interpolant inside the table against SciPy's PchipInterpolator
	// through the same points, values and slopes [calc: SciPy 1.10.1
	// reference, testdata/reference/fit.py and README.md].
	_, rows := refdata.Read(t, "../testdata/reference/fit-pchip.csv")
	tab := mustTable(t, pinTabV, pinTabI)
	n := 0
	for _, rec := range rows {
		var x [3]float64
		for k := range x {
			var err error
			if x[k], err = strconv.ParseFloat(rec[k], 64); err != nil {
				t.Fatal(err)
			}
		}
		i, g := tab.Eval(x[0])
		if math.Abs(i-x[1]) > 1e-12*math.Max(1e-3, math.Abs(x[1])) || math.Abs(g-x[2]) > 1e-10*math.Max(1e-3, math.Abs(x[2])) {
			t.Errorf("at %g V: i %.15g, slope %.15g; SciPy %.15g, %.15g", x[0], i, g, x[1], x[2])
		}
		n++
	}
	if n < 100 {
		t.Fatalf("only %d reference points", n)
	}
}
