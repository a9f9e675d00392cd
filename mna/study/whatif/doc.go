// Package whatif answers the questions an engineer asks once a deck runs:
// which variant has the most margin, how high a level still passes, which
// parameter buys the most margin, and how a batch of real parts spreads.
// It is plain code over package study (Bench.Solve, ForEach) and
// renders nothing; package report prints its results.
//
//   - Variants builds the variant list of a study from the deck's vary lines
//     and command-line settings (ParseSets), and RankVariants orders the
//     variants of a finished sweep by their worst margin over every level and
//     polarity.
//   - Margins searches, per variant and polarity, the highest level that
//     still passes: a coarse scan of the range, then bisection to the
//     resolution (0.1 kV for discharges). The scan is also the check that the
//     verdict is monotonic in level; where it is not, the result says so.
//   - Sensitivities perturbs every numeric design parameter (or the ones
//     named) by ±10 % and ranks them by their effect on the worst margin.
//   - Spreads draws circuits from the deck's tolerance lines and reports the
//     distribution of the residual peak, the clamp energy and the worst
//     margin (percentiles) and the pass fraction with its Wilson 95 %
//     interval. Every circuit's draw depends only on the seed and its index,
//     so the result does not depend on the number of workers or shards.
//     The percentiles are exact up to ExactCircuits and read from a
//     mergeable Sketch above, so memory does not grow with the circuits.
//   - Shard selects one slice of any of these sweeps (`--shard i/n`) and the
//     Merge functions join the slices into exactly the unsharded result.
//
// Every sweep takes a context: when it is cancelled (Ctrl-C) no new work
// starts, the work in progress finishes, and the result holds what finished
// with Interrupted set.
package whatif

import "zapnet/mna/study"

// The what-if documents (OUTPUT.md, "What-if commands"): the tool, version,
// deck and title of study.Meta, then the result's own fields.

// MarginDocument is the JSON of `zapnet margin`.
type MarginDocument struct {
	study.Meta
	*MarginResult
}

// SensitivityDocument is the JSON of `zapnet sensitivity`.
type SensitivityDocument struct {
	study.Meta
	*SensitivityResult
}

// SpreadDocument is the JSON of `zapnet spread`.
type SpreadDocument struct {
	study.Meta
	*SpreadResult
}
