package main

import (
	"errors"
	"io"
)

// runRun is being built; see the open issues.
func runRun(args []string, stdout, stderr io.Writer) error {
	return errors.New("run: not built yet")
}
