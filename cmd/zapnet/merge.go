package main

import (
	"errors"
	"io"
)

// runMerge is being built; see the open issues.
func runMerge(args []string, stdout, stderr io.Writer) error {
	return errors.New("merge: not built yet")
}
