package mna

import "zapnet/devices"

// Device is the compiled device of the element called name, or nil: for
// analyses that steer a device's optional behaviour (a port driven or
// terminated for the edge check) between runs.
func (s *System) Device(name string) devices.Device {
	for i, e := range s.elements {
		if e == name {
			return s.devs[i].dev
		}
	}
	return nil
}
