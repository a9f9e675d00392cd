package main

import (
	"errors"
	"io"
)

// runSensitivity is being built; see the open issues.
func runSensitivity(args []string, stdout, stderr io.Writer) error {
	return errors.New("sensitivity: not built yet")
}
