// Package plots draws the pictures of a study as SVG figures with
// gonum.org/v1/plot: what the strike drove, what the watched nodes saw, the
// clamp current, the residual pulse at each protected pin with its vmax and
// vmin drawn, the energy ledger as bars, overlays of one quantity across the
// runs of a sweep, a margin-against-level curve for a margin search, and the
// figures of a sensitivity study and a tolerance spread.
//
// It measures nothing and decides nothing: every number comes from a
// study.Run solved with study.Options.Record (or, for MarginCurve, from the
// caller). Package report embeds the figures in its HTML report; the command
// line writes them as files with --plot.
//
//   - RunFigures(c, r, opt) draws one recorded run: "strike", "nodes",
//     "clamps", "residual-PIN" for each protected pin, and "ledger". A
//     figure against time has two panels on one vertical scale: a close-up
//     of the first instants (twelve times the strike's time to peak, 10 or
//     20 ns for the IEC 61000-4-2 current) and the whole window.
//   - Overlays(c, runs, opt) draws one quantity across runs: the residual of
//     each pin and the current of each clamp, one line per run, with the
//     limits drawn once: the first variant across levels and polarities
//     ("overlay-residual-U1"), and with a vary line every variant at the
//     top level, per polarity ("overlay-variants-pos-residual-U1").
//   - MarginCurve(title, unit, curves, opt) draws the worst margin found at
//     each level a margin search tried, one line per polarity or variant,
//     with the zero line where PASS turns into FAIL.
//   - SensitivityBars(title, res, opt) draws a sensitivity study: per
//     parameter, the margin with it lowered and raised by the step, against
//     the baseline margin drawn as a vertical line.
//   - SpreadHistograms(title, c, res, opt) draws a tolerance spread: each
//     pin's residual peak and each clamp's energy over the drawn circuits,
//     with p1, p50, p99 and the rating where the deck gives one.
//
// Axes are in engineering units: each axis picks the SI prefix that keeps its
// tick labels between 0.1 and 1000 (ns or µs, mV or V or kV, mA or A, µJ), and
// says the unit in its label. The legend stands beside the plot area, never
// over the data. Text in a figure (the deck's title, element names) is
// escaped by the SVG writer, so a deck cannot put markup into a figure.
package plots
