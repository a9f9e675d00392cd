package textpos

import (
	"fmt"
	"io"
	"os"
)

// ReadFile reads the text file at path, of at most limit bytes. It refuses
// what is not a regular file (a folder, a device, a pipe: a read of
// /dev/zero would never end) and a file past the limit, in words that name
// what was to be read ("a deck", "a TLP curve").
func ReadFile(path string, limit int64, what string) ([]byte, error) {
	fi, err := os.Stat(path)
	if err != nil {
		return nil, unwrapPathErr(err)
	}
	if !fi.Mode().IsRegular() {
		return nil, fmt.Errorf("%s is not a regular file", path)
	}
	if fi.Size() == 0 {
		// Empty, or a kernel file whose size is unknown and whose read
		// might block: either way there is nothing to read.
		return nil, nil
	}
	if fi.Size() > limit {
		return nil, fmt.Errorf("%s is larger than %d MiB; %s is text", path, limit>>20, what)
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, unwrapPathErr(err)
	}
	defer f.Close()
	b, err := io.ReadAll(io.LimitReader(f, limit+1))
	if err != nil {
		return nil, unwrapPathErr(err)
	}
	if int64(len(b)) > limit {
		return nil, fmt.Errorf("%s grew past %d MiB while read; %s is text", path, limit>>20, what)
	}
	return b, nil
}

// unwrapPathErr says what failed on which file without Go's operation
// names ("open", "stat").
func unwrapPathErr(err error) error {
	if pe, ok := err.(*os.PathError); ok {
		return fmt.Errorf("cannot read %s: %v", pe.Path, pe.Err)
	}
	return err
}
