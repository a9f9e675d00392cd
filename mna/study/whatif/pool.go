package whatif

// Progress is told how many items of a sweep have finished, of how many.
// Calls never overlap (study.ForEach runs the sweeps).
type Progress func(done, total int)
