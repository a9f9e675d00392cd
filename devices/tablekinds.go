package devices

import (
	"errors"
	"fmt"

	"zapnet/devices/spec"
	"zapnet/netlist/datafile"
)

// The table paths as the deck's clamp and pin use them:
//
//	clamp NAME line ref table="curve.csv" [ls=H] [cj=F] [ipp=A] [emax=J]
//	pin   NAME node ref table="curve.csv" [cin=F] [vmax=V] [vmin=V] [ifail=A]
//	pin   NAME node ref ibis="part.ibs" model=NAME [corner=typ|min|max] [rail=NODE] [cin=F] ...
//
// A table is a TLP curve in datafile's CSV form (columns v and i, optional
// leak): its intact rows (those before a failure the leak column shows),
// both polarities, with the origin, as one table path from the terminal to
// the reference (datafile.TLP.Table). An IBIS pin is IBISPin's table path:
// package, C_comp, the GND clamp to the reference and the POWER clamp to the
// rail (or to a supply of the model's reference voltage when the deck gives
// no rail). The junction parameters of clamp and pin have no effect on a
// table path; cin adds to an IBIS file's C_comp.

// ibisCaution is reported with every run of a pin that reads an IBIS file.
const ibisCaution = "%s: IBIS carries no failure data; set the pin's ifail from its own TLP data or datasheet"

// readTLPTable reads a TLP curve file as a table.
func readTLPTable(path string) (*IVTable, error) {
	src, err := datafile.ReadFile(path)
	if err != nil {
		return nil, err
	}
	t, err := datafile.ReadTLP(path, src)
	if err != nil {
		return nil, err
	}
	v, i, err := t.Table()
	if err != nil {
		return nil, err
	}
	return NewIVTable(v, i)
}

// newTableClamp builds a clamp whose conduction is a TLP curve.
func newTableClamp(name string, nodes [2]string, path string, v *spec.Values) (Device, error) {
	tab, err := readTLPTable(path)
	if err != nil {
		return nil, fmt.Errorf("clamp %s: %w", name, err)
	}
	return NewTablePath(TableSpec{Name: name, Nodes: nodes, Low: tab, Ls: v.Num("ls"), C: v.Num("cj")})
}

// newTablePin builds a pin from a TLP curve or an IBIS model.
func newTablePin(name string, nodes [2]string, v *spec.Values) (Device, error) {
	table, ibis, model, rail := v.Word("table"), v.Word("ibis"), v.Word("model"), v.Word("rail")
	switch {
	case table != "" && ibis != "":
		return nil, fmt.Errorf("pin %s: give table= or ibis=, not both", name)
	case table != "" && rail != "":
		return nil, fmt.Errorf("pin %s: a TLP table already holds every path of the pin to its reference; drop rail=", name)
	case ibis != "" && model == "":
		return nil, fmt.Errorf("pin %s: ibis= needs model=NAME, a [Model] or a pin of the file", name)
	case ibis == "" && model != "":
		return nil, fmt.Errorf("pin %s: model= names a model of an IBIS file; give ibis=\"file.ibs\"", name)
	}
	if table != "" {
		tab, err := readTLPTable(table)
		if err != nil {
			return nil, fmt.Errorf("pin %s: %w", name, err)
		}
		return NewTablePath(TableSpec{Name: name, Nodes: nodes, Low: tab, C: v.Num("cin")})
	}
	src, err := datafile.ReadFile(ibis)
	if err != nil {
		return nil, fmt.Errorf("pin %s: %w", name, err)
	}
	ib, err := datafile.ReadIBIS(ibis, src)
	if err != nil {
		return nil, fmt.Errorf("pin %s: %w", name, err)
	}
	corner := datafile.CornerIndex(v.Word("corner"))
	if corner < 0 {
		corner = datafile.Typ
	}
	pm, err := ib.PinModel(model, corner)
	if err != nil {
		var de *datafile.Error
		if errors.As(err, &de) && de.Pos.File == "" {
			de.Pos.File = ibis
		}
		return nil, fmt.Errorf("pin %s: %w", name, err)
	}
	s, _, err := IBISPin(name, nodes, rail, pm)
	if err != nil {
		return nil, fmt.Errorf("pin %s: %w", name, err)
	}
	s.C += v.Num("cin")
	return NewTablePath(s)
}
