package devices

// The small-signal (AC) system of a circuit at its DC operating point is
// Y(jω) = G + jω·C, with G = ∂F/∂x and C the derivatives of the states
// stamped on their rows: the engine gets both from every device's own Eval,
// so no model writes its small-signal behaviour twice. A device whose
// behaviour at a frequency is not of that form (a line's delay is
// e^(−jωT), not a polynomial in jω) implements SmallSignal instead, and the
// engine leaves its Eval out of the small-signal system.

// ACContext carries one small-signal stamp at angular frequency Omega. The
// engine owns Y (N×N, row-major, the unknowns of the transient system) and
// adds the rest of the circuit around it.
type ACContext struct {
	Omega float64 // rad/s; 0 asks for the operating point's incremental behaviour
	Y     []complex128
	N     int
}

// Add adds v to the admittance entry (row, col); Ground rows and columns
// are dropped.
func (c *ACContext) Add(row, col int, v complex128) {
	if row >= 0 && col >= 0 {
		c.Y[row*c.N+col] += v
	}
}

// SmallSignal is a device that stamps its own exact small-signal equations,
// linear in its unknowns, on the rows its Eval uses. It is called after the
// operating point is solved and must not allocate.
type SmallSignal interface {
	StampAC(c *ACContext)
}
