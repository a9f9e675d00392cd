package devices

import (
	"sort"

	"zapnet/devices/spec"
)

// Kind is an element kind of the deck language: its description, written
// once beside its model, and the constructor of the model.
type Kind struct {
	spec.Kind
	// New builds the device of an element named name between nodes from
	// its checked values (the table's rules already hold, defaults are
	// filled in). New must not modify v.
	New func(name string, nodes [2]string, v *spec.Values) (Device, error)
}

var catalogue = map[string]*Kind{}

// Register adds a kind to the catalogue; each model file registers its kind
// in an init function. Registering a name twice is a programming error.
func Register(k *Kind) {
	if _, dup := catalogue[k.Name]; dup {
		panic("devices: kind registered twice: " + k.Name)
	}
	if k.New == nil {
		panic("devices: kind without a constructor: " + k.Name)
	}
	k.Values() // panics on a table too large for a value set
	catalogue[k.Name] = k
}

// Lookup returns the kind called name, or nil.
func Lookup(name string) *Kind { return catalogue[name] }

// Catalogue lists every kind in documentation order.
func Catalogue() []*Kind {
	out := make([]*Kind, 0, len(catalogue))
	for _, k := range catalogue {
		out = append(out, k)
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].Order != out[j].Order {
			return out[i].Order < out[j].Order
		}
		return out[i].Name < out[j].Name
	})
	return out
}
