package plots

import (
	"os"
	"slices"
	"strings"
	"testing"

	"zapnet/mna/study/signal"
	"zapnet/netlist"
)

func acDemo(t *testing.T) *signal.Result {
	t.Helper()
	c, err := netlist.Parse("rail.zap", []byte(`strike esd in gnd waveform=iec61000-4-2 level=8k
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
	res, err := signal.Analyse(c, req, &signal.Options{NoDamping: true})
	if err != nil {
		t.Fatal(err)
	}
	return res
}

// The signal-side figures are well-formed SVG with a log frequency axis
// labelled by decades, and name their curves in the legend.
func TestACFigures(t *testing.T) {
	res := acDemo(t)
	figs, err := ACFigures("Rail input", res, nil)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, f := range figs {
		names = append(names, f.Name)
		texts, elems := svgText(t, f.Name, f.SVG)
		if elems["path"] == 0 {
			t.Errorf("%s: nothing drawn", f.Name)
		}
		all := strings.Join(texts, "|")
		for _, want := range []string{"10 kHz", "1 MHz", "1 GHz", "frequency", "Rail input"} {
			if !strings.Contains(all, want) {
				t.Errorf("%s: no %q among the texts %q", f.Name, want, texts)
			}
		}
		if dir := os.Getenv("ZAPNET_FIGURES"); dir != "" {
			os.WriteFile(dir+"/"+f.Name+".svg", f.SVG, 0o644)
		}
	}
	if !slices.Equal(names, []string{"transfer-gain", "transfer-phase", "impedance", "s-parameters"}) {
		t.Errorf("figures %v", names)
	}
	if !slices.Contains(figs[2].Series, "FB1") || !slices.Contains(figs[2].Series, "at in") {
		t.Errorf("impedance series %v", figs[2].Series)
	}
}

func TestSILabel(t *testing.T) {
	for _, tc := range []struct {
		v    float64
		unit string
		want string
	}{{1e4, "Hz", "10 kHz"}, {1e9, "Hz", "1 GHz"}, {0.1, "", "100m"}, {1, "", "1"}, {1e3, "", "1k"}} {
		if got := siLabel(tc.v, tc.unit); got != tc.want {
			t.Errorf("siLabel(%g, %q) = %q, want %q", tc.v, tc.unit, got, tc.want)
		}
	}
}
