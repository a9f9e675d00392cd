// Package study runs the ESD study a deck describes and judges it: which runs
// there are (level × polarity × variant), solving them in parallel with one
// compiled system per worker, measuring while the engine solves, verdicts
// against the ratings of MODELS.md, and the margin to every limit. It renders
// nothing: package report turns Runs into tables, JSON and CSV.
//
// # Entry points
//
//   - Jobs(c, opt) lists the runs of the whole plan of a circuit (or of the
//     levels, polarities and variants that Options override) in plan order:
//     variant-major, then level, then polarity. It solves nothing.
//   - Execute(ctx, c, jobs, opt, done) solves those jobs, or any subset (a
//     sharded sweep, `--shard i/n`, takes every n-th), and returns one Run
//     per finished job in the order of jobs whatever the number of workers;
//     the merge step puts the Runs of shards back in Job.Index order.
//   - NewBench(c, variant) compiles one variant once; Bench.Solve(level,
//     polarity, opt) solves one run with it and can be called again and
//     again (one goroutine per Bench). A margin search bisects the level with
//     Bench.Solve and reads Run.Verdict and Run.Worst; a sensitivity study
//     builds a Bench per perturbed circuit (netlist's Circuit.With) and
//     compares Run.Worst.Percent; a statistical spread does the same with
//     drawn values and collects the measurements it wants from the Run.
//
// # Measurements
//
// Runs stream: the engine calls back at each accepted point and the study
// keeps only extremes, widths and integrals (waveforms.Tracker), so a sweep
// holds no waveform. Set Options.Record to keep the sampled waveforms in
// Run.Waves (for CSV and plots).
//
// Per run, the study measures every circuit node (highest and lowest voltage
// with their times), every element (largest |current| with its time, energy
// ∫ v·i dt from the engine's ledger), every protected pin (the residual
// pulse v(pin) − v(ref): peak, lowest value, time above vmax and below vmin,
// energy into the pin, peak current in its internal clamp paths from the
// "PIN.ipath" probe), every capacitor (largest |voltage| across it and on
// its dielectric, the "C.vc" probe) and the energy ledger: where the
// strike's energy went.
//
// # Limits, verdicts and margins
//
// A Limit is one rating compared with one measurement. What a rating is
// compared with is the catalogue's (spec.Rates: a measure, its side, and
// for some a device probe instead of the terminals):
//
//	watch NODE max=   highest voltage of the node               ≤ max
//	watch NODE min=   lowest voltage of the node                ≥ min
//	ipp, it2          largest |current| through the element     ≤ rating
//	emax              energy into the element                   ≤ rating
//	pmax              largest power into the element            ≤ rating
//	vrwm              |voltage| across it at rest               ≤ rating
//	pin vmax          highest residual voltage                  ≤ vmax
//	pin vmin          lowest residual voltage                   ≥ vmin
//	pin ifail         largest |ipath| current                   ≤ ifail
//	capacitor rating  largest |voltage| on its dielectric (vc)  ≤ rating
//
// The margin of a limit is the distance from the measured extreme to the
// limit, positive on the safe side, in the limit's own unit, and as a
// percentage: of |limit|, or for one side of a voltage window (vmax, vmin,
// a watch's max and min) of the headroom from the operating point to the
// limit (NewWindowLimit). A run FAILs when any margin is negative and
// PASSes otherwise (a run with no limits passes and says it checked none).
// The worst margin is the limit with the smallest percentage, reported with
// its name, for example "U1 vmax: 0.7 V (12.7 %)".
//
// # The simulated window
//
// With `window stop=` in the deck (or Options.Window.Stop) the span is the
// user's; when a reported extreme lands in its last 5 % the run carries a
// note naming a longer stop to use. Otherwise the default span is the longest
// of: the stimulus's own span; one period 2π√(L·C) of the largest inductance
// (inductors, bead l) with the largest capacitance (capacitors, pin cin); and
// three time constants R·C of each resistor (or supply r) with the largest
// capacitance on one of its nodes. The default is capped at DefaultCap (20 µs)
// or CapSpans (4) stimulus spans, whichever is longer; when an
// extreme lands in the last 5 % of a default span the run is solved again
// with the span doubled, up to the cap, and the note says so. An extreme
// counts only when it stands out: at least 1 % of the signal's largest
// excursion from its value at t = 0, so a tail settling by microvolts does
// not stretch the window.
//
// Without a `window accuracy=` the study solves at the engine's default
// accuracy (mna.DefaultAccuracy, 0.2 % on every reported extreme and
// energy).
package study
