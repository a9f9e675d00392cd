package mna

import (
	"errors"

	"zapnet/netlist"
	"zapnet/waveforms"
)

// This file holds the engine's entry points until the engine lands; it is
// replaced whole by the implementation.

var errNotBuilt = errors.New("mna: engine not built yet")

// System is a compiled circuit, reusable across runs (one per goroutine).
type System struct{}

// Compile numbers the nodes of c, builds its devices and allocates every
// buffer a solution needs.
func Compile(c *netlist.Circuit) (*System, error) { return nil, errNotBuilt }

// Nodes are the circuit's node names (gnd excluded), in result order.
func (s *System) Nodes() []string { return nil }

// Elements are the element names, in result order.
func (s *System) Elements() []string { return nil }

// Probes are the names of the devices' probes, "ELEMENT.probe", in result order.
func (s *System) Probes() []string { return nil }

// SetStimulus sets the strike of the next runs; sign is +1 or −1; nil: none.
func (s *System) SetStimulus(st *waveforms.Stimulus, sign float64) {}

// OperatingPoint solves the DC state (strike off, supplies on) and returns
// the node voltages in Nodes order.
func (s *System) OperatingPoint(set *Settings) ([]float64, error) { return nil, errNotBuilt }

// Transient solves from the operating point to the stop time.
func (s *System) Transient(set *Settings) (*Result, error) { return nil, errNotBuilt }
