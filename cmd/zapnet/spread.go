package main

import (
	"errors"
	"io"
)

// runSpread is being built; see the open issues.
func runSpread(args []string, stdout, stderr io.Writer) error {
	return errors.New("spread: not built yet")
}
