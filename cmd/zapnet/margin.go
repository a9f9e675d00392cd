package main

import (
	"errors"
	"io"
)

// runMargin is being built; see the open issues.
func runMargin(args []string, stdout, stderr io.Writer) error {
	return errors.New("margin: not built yet")
}
