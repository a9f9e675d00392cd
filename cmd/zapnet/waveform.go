package main

import (
	"errors"
	"io"
)

// runWaveform is being built; see the open issues.
func runWaveform(args []string, stdout, stderr io.Writer) error {
	return errors.New("waveform: not built yet")
}
