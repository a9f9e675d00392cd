package fit

import (
	"math"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"zapnet/internal/refdata"
	"zapnet/netlist/datafile"
)

// The same fits done by a general-purpose library: testdata/reference/fit.py
// invents the data (written as the CSV files read here) and fits them with
// SciPy's least_squares (Levenberg–Marquardt, tolerances 1e-15) on the same
// residuals [calc: SciPy 1.10.1 reference, testdata/reference/README.md].
// Two solvers of one problem must find one minimum: the parameters agree to
// 1e-4 (the loosely determined is of the clamp to 1e-3) and the costs to
// 1e-6.

const refDir = "../../testdata/reference"

func scipySummary(t *testing.T) map[string]map[string]float64 {
	t.Helper()
	_, recs := refdata.Read(t, filepath.Join(refDir, "fit-summary.csv"))
	out := map[string]map[string]float64{}
	for _, rec := range recs {
		v, err := strconv.ParseFloat(rec[2], 64)
		if err != nil {
			t.Fatal(err)
		}
		if out[rec[0]] == nil {
			out[rec[0]] = map[string]float64{}
		}
		out[rec[0]][rec[1]] = v
	}
	return out
}

func readRef(t *testing.T, name string) []byte {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(refDir, name))
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func agree(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s: zapnet %.10g, SciPy %.10g (%.2g relative, want within %g)", what, got, want, math.Abs(got/want-1), rel)
	}
}

func TestBeadFitAgreesWithSciPy(t *testing.T) {
	ref := scipySummary(t)
	for _, c := range []struct {
		file, name string
	}{{"fit-bead-a.csv", "bead-a"}, {"fit-bead-b.csv", "bead-b"}} {
		im, err := datafile.ReadImpedance(c.file, readRef(t, c.file))
		if err != nil {
			t.Fatal(err)
		}
		fit, err := FitBead(BeadCurveOf(im), nil)
		if err != nil {
			t.Fatal(err)
		}
		want := ref[c.name]
		agree(t, c.name+" rdc", fit.Params.Rdc, want["rdc"], 1e-4)
		agree(t, c.name+" l", fit.Params.L, want["l"], 1e-4)
		agree(t, c.name+" c", fit.Params.C, want["c"], 1e-4)
		agree(t, c.name+" rac", fit.Params.Rac, want["rac"], 1e-4)
		if _, ok := want["isat"]; ok {
			agree(t, c.name+" isat", fit.Params.Isat, want["isat"], 1e-4)
		}
		agree(t, c.name+" cost", fit.Result.Cost, want["cost"], 1e-6)
	}
}

func TestClampFitAgreesWithSciPy(t *testing.T) {
	ref := scipySummary(t)["clamp-a"]
	tl, err := datafile.ReadTLP("fit-clamp-a.csv", readRef(t, "fit-clamp-a.csv"))
	if err != nil {
		t.Fatal(err)
	}
	var data []Datum
	for _, p := range tl.Points {
		data = append(data, Datum{Kind: TLPRow, V: p.V, I: p.I})
	}
	fit, err := FitClamp(data, &ClampOptions{Polarity: "uni"})
	if err != nil {
		t.Fatal(err)
	}
	p := fit.Params
	agree(t, "vbr", p.Vbr, ref["vbr"], 1e-4)
	agree(t, "rdyn", p.Rdyn, ref["rdyn"], 1e-4)
	agree(t, "nbr", p.Nbr, ref["nbr"], 1e-4)
	agree(t, "is", p.Is, ref["is"], 1e-3)
	agree(t, "n", p.N, ref["n"], 1e-4)
	agree(t, "cost", fit.Result.Cost, ref["cost"], 1e-6)
}
