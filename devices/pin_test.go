package devices

import (
	"fmt"
	"math"
	"testing"
)

// diodeIRef is the MODELS.md diode law written straight from the contract.
func diodeIRef(v, is, n, bv, ibv float64) float64 {
	i := is * (math.Exp(v/(n*vtRef)) - 1)
	if bv > 0 {
		i -= ibv * math.Exp(-(v+bv)/(n*vtRef))
	}
	return i
}

func pinVariants() []struct {
	num  map[string]float64
	rail bool
} {
	return []struct {
		num  map[string]float64
		rail bool
	}{
		{map[string]float64{}, false},
		{map[string]float64{"rs": 0}, false},
		{map[string]float64{"cin": 6e-12}, true},
		{map[string]float64{"rs": 0, "cin": 2e-12, "is": 1e-12, "n": 1.3}, true},
		{map[string]float64{"vbr": 5.5, "rdyn": 2}, false},
		{map[string]float64{"vbr": 5.5, "rdyn": 0, "rs": 0, "cin": 3e-12}, true},
		{map[string]float64{"vbr": 5.5, "rdyn": 1, "rs": 0.5, "it": 2e-3, "nbr": 1.5}, true},
	}
}

func TestPinJacobian(t *testing.T) {
	// Stamped Jacobian against central differences with each internal
	// junction forward, near zero, reverse and (with vbr) in breakdown.
	for vi, v := range pinVariants() {
		str := map[string]string{}
		if v.rail {
			str["rail"] = "vdd"
		}
		e := nlElement("pin", "U1", "p", "r", v.num, str)
		d := nlMust(t, e).(*Pin)
		terms := []int{0, 1}
		if v.rail {
			terms = append(terms, 2)
		}
		r := newNLRig(t, d, terms...)
		r.c.Gmin = 1e-12
		for _, u := range []float64{-0.75, -0.2, 0, 0.3, 0.72, 5.7} {
			x := nlRandom(r.n, 0.3, uint64(vi+7))
			// Lower junction: u = v(kl) − v(r) (clamp) or −(v(r) − v(kl)).
			x[d.kl] = x[d.r] + u
			if v.rail {
				// Upper junction v(ku) − v(rail), kept below 0.7 V so
				// that it does not swamp the lower one.
				x[d.rl] = x[d.ku] - math.Min(0.8*u-0.1, 0.7)
			}
			if u > 1 && !d.clamp {
				continue
			}
			r.checkJacobian(t, x, fmt.Sprintf("pin %d u=%g", vi, u))
		}
	}
}

func TestPinPathCurrent(t *testing.T) {
	// A DC current I forced into p flows through the internal paths only
	// (cin carries none at DC: KCL), so the probe reads I; the pin voltage
	// follows the MODELS.md laws plus the path's rs [calc].
	const vdd, gSrc = 3.3, 1e3 // stiff rail source, S
	for _, tc := range []struct {
		name string
		num  map[string]float64
		rail bool
		curr float64
		vp   func(num map[string]float64, curr float64) float64
	}{
		{"upper diode", map[string]float64{"cin": 5e-12, "rs": 1.5}, true, 0.2, func(num map[string]float64, curr float64) float64 {
			return vdd + curr/gSrc + vtRef*math.Log(1+curr/1e-14) + curr*1.5
		}},
		{"lower diode", map[string]float64{"cin": 5e-12}, true, -0.2, func(num map[string]float64, curr float64) float64 {
			return -(vtRef*math.Log(1-curr/1e-14) - curr*1)
		}},
		{"internal clamp", map[string]float64{"vbr": 5.5, "rdyn": 2}, false, 0.1, func(num map[string]float64, curr float64) float64 {
			lo, hi := 0.0, 10.0
			for range 200 {
				mid := (lo + hi) / 2
				if clampIRef(mid, 5.5, 1e-3, 1, 1e-14, 1, false) < curr {
					lo = mid
				} else {
					hi = mid
				}
			}
			return (lo+hi)/2 + curr*(1+2) // rs default 1 Ω plus rdyn
		}},
		{"internal clamp forward", map[string]float64{"vbr": 5.5, "rs": 0}, false, -0.1, func(num map[string]float64, curr float64) float64 {
			return -vtRef * math.Log(1-curr/1e-14)
		}},
	} {
		str := map[string]string{}
		terms := []int{0, Ground}
		if tc.rail {
			str["rail"] = "vdd"
			terms = append(terms, 1)
		}
		d := nlMust(t, nlElement("pin", "U1", "p", "gnd", tc.num, str)).(*Pin)
		r := newNLRig(t, d, terms...)
		r.extra = func(c *Context) {
			c.Inject(0, Ground, tc.curr)
			if tc.rail {
				c.Conductance(1, Ground, gSrc)
				c.Inject(1, Ground, vdd*gSrc)
			}
		}
		x := make([]float64, r.n)
		if _, err := r.newton(x, 200); err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		var probe [1]float64
		d.Probe(x, probe[:])
		if !nlClose(probe[0], tc.curr, 1e-9, 1e-15) {
			t.Errorf("%s: ipath = %.10g A, want %.10g A", tc.name, probe[0], tc.curr)
		}
		if want := tc.vp(tc.num, tc.curr); !nlClose(x[0], want, 1e-9, 1e-12) {
			t.Errorf("%s: v(p) = %.10g V, want %.10g V", tc.name, x[0], want)
		}
	}
}

func TestPinLayout(t *testing.T) {
	// The rail is a third terminal; each path with rs > 0 has its own node.
	d := nlMust(t, nlElement("pin", "U1", "p", "gnd", map[string]float64{}, map[string]string{"rail": "vdd"}))
	l := d.Layout()
	if len(l.Terminals) != 3 || l.Terminals[2] != "vdd" || len(l.Internal) != 2 {
		t.Errorf("layout %+v", l)
	}
	if p, ok := d.(Prober); !ok || len(p.Probes()) != 1 || p.Probes()[0].Name != "ipath" || p.Probes()[0].Unit != "A" {
		t.Error("pin must probe ipath")
	}
}
