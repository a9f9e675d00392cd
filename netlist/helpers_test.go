package netlist

import "testing"

// nums is every numeric parameter of e that has a value, by key.
func nums(e *Element) map[string]float64 {
	m := map[string]float64{}
	for _, p := range e.Values.Table().Params {
		if v, ok := e.Values.Lookup(p.Key); ok {
			m[p.Key] = v
		}
	}
	return m
}

// words is every word parameter of e that has a value, and "part" for the
// part it takes.
func words(e *Element) map[string]string {
	m := map[string]string{}
	for _, w := range e.Values.Table().Words {
		if s := e.Values.Word(w.Key); s != "" {
			m[w.Key] = s
		}
	}
	if e.Part != "" {
		m["part"] = e.Part
	}
	return m
}

// setting reads target=text against c, failing the test when it does not
// fit.
func setting(t *testing.T, c *Circuit, target, text string) Setting {
	t.Helper()
	s, err := c.Setting(target, text)
	if err != nil {
		t.Fatal(err)
	}
	return s
}
