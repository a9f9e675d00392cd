package devices

import (
	"fmt"
	"math"

	"zapnet/netlist/datafile"
)

// IBISPin describes an IBIS input (datafile.PinModel, one corner) as a
// table path: the pin –R_pkg–L_pkg– die with C_pkg at the pin, C_comp at
// the die, the [GND Clamp] table as the low path and the [POWER Clamp]
// table as the up path, to the rail node when one is given, else to a
// supply of the model's POWER clamp reference voltage above the pin's
// reference. IBIS measures both tables' currents into the component, the
// GND clamp's against the pad's voltage and the POWER clamp's against the
// reference minus the pad (datafile turns the latter round). A GND clamp
// reference other than 0 V shifts the low table.
//
// IBIS tables are measured data and may dip where the current is only
// leakage; a table path must never conduct less at a higher voltage, so
// such dips are filled (each current raised to the largest before it) and
// reported with the table's position. IBIS carries no failure data: the
// pin's ifail is the user's to set.
func IBISPin(name string, nodes [2]string, rail string, pm *datafile.PinModel) (TableSpec, []string, error) {
	s := TableSpec{Name: name, Nodes: nodes, Rail: rail, C: pm.CComp, Rs: pm.Rpkg, Ls: pm.Lpkg, Cpkg: pm.Cpkg}
	var notes []string
	mk := func(what string, v, i []float64, shift float64, at datafile.Pos) (*IVTable, error) {
		if len(v) < 2 {
			return nil, fmt.Errorf("%s: the %s table has %d rows; a table path needs 2 or more", at, what, len(v))
		}
		vs := make([]float64, len(v))
		is := make([]float64, len(i))
		worst, worstV := 0.0, 0.0
		for k := range v {
			vs[k] = v[k] + shift
			is[k] = i[k]
			if k > 0 && is[k] < is[k-1] {
				if d := is[k-1] - is[k]; d > worst {
					worst, worstV = d, v[k]
				}
				is[k] = is[k-1]
			}
		}
		if worst > 0 {
			notes = append(notes, fmt.Sprintf("%s: the %s table's current falls as the voltage rises (by up to %.3g A, at %g V); filled to the level before it", at, what, worst, worstV))
		}
		return NewIVTable(vs, is)
	}
	var err error
	if len(pm.GNDV) > 0 {
		if s.Low, err = mk("GND clamp", pm.GNDV, pm.GNDI, pm.GNDRef, pm.GNDPos); err != nil {
			return s, nil, err
		}
	} else {
		s.Low, _ = NewIVTable([]float64{-1, 1}, []float64{0, 0})
		notes = append(notes, "no [GND Clamp] table: the pin has no path to its reference but C_comp")
	}
	if len(pm.PowerV) > 0 {
		if s.Up, err = mk("POWER clamp", pm.PowerV, pm.PowerI, 0, pm.PowerPos); err != nil {
			return s, nil, err
		}
		if rail == "" {
			s.UpRef = pm.PowerRef
		}
	} else if rail != "" {
		return s, nil, fmt.Errorf("model %s has no [POWER Clamp] table for the rail %s", pm.Model, rail)
	}
	if math.IsNaN(s.UpRef) {
		s.UpRef = 0
	}
	notes = append(notes, "IBIS carries no failure data: set the pin's ifail from its own TLP data or datasheet")
	return s, notes, nil
}
