package whatif

import (
	"runtime"
)

// Progress is told how many items of a sweep have finished, of how many.
// Calls never overlap (study.ForEach runs the sweeps).
type Progress func(done, total int)

// workerCount is the pool size for opt.Workers.
func workerCount(n int) int {
	if n <= 0 {
		return runtime.GOMAXPROCS(0)
	}
	return n
}
