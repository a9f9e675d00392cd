package fit

import "math"

// param is one model parameter of a fit: free ones are fitted through
// their logarithm, fixed ones keep their value.
type param struct {
	name  string
	value float64
	free  bool
}

// paramSet maps a fit's vector x to named parameter values.
type paramSet struct {
	p    []param
	free []int // indices in p of the free parameters, in x order
}

func (s *paramSet) add(name string, value float64, free bool) {
	s.p = append(s.p, param{name: name, value: value, free: free})
	if free {
		s.free = append(s.free, len(s.p)-1)
	}
}

// x returns the starting vector (logarithms of the free values).
func (s *paramSet) x() []float64 {
	x := make([]float64, len(s.free))
	for k, i := range s.free {
		x[k] = math.Log(s.p[i].value)
	}
	return x
}

// set writes x into the parameters.
func (s *paramSet) set(x []float64) {
	for k, i := range s.free {
		s.p[i].value = math.Exp(x[k])
	}
}

// get returns a parameter's value.
func (s *paramSet) get(name string) float64 {
	for _, p := range s.p {
		if p.name == name {
			return p.value
		}
	}
	panic("fit: no parameter " + name)
}

// isFree reports whether a parameter is fitted.
func (s *paramSet) isFree(name string) bool {
	for _, i := range s.free {
		if s.p[i].name == name {
			return true
		}
	}
	return false
}

// names lists the free parameters in x order.
func (s *paramSet) names() []string {
	var out []string
	for _, i := range s.free {
		out = append(out, s.p[i].name)
	}
	return out
}
