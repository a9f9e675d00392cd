// Package report renders study results: human tables on a writer
// (tablewriter), the JSON document of OUTPUT.md, and CSV waveforms. It
// measures nothing and decides nothing; everything it prints comes from
// study.Run, so the what-if commands (margin, sensitivity, spread) and the
// plot reports reuse it with their own runs.
//
//   - Tables(w, runs, opt) prints each run's detail, then Summary.
//   - Summary(w, runs) prints one line per run: level × polarity (× variant)
//     → verdict and worst margin, then the Caution line.
//   - JSON(w, meta, runs) writes the Document of OUTPUT.md; Decode reads one
//     back (for merge). Document and its parts are exported so that other
//     commands can embed runs in their own JSON.
//   - CSV(w, run) writes one recorded run's waveforms; CSVPaths names the
//     files of several runs from a pattern or a folder.
//   - WriteFile writes a file whole or not at all (a temporary file in the
//     same folder, then a rename).
//
// Numbers in tables use netlist.FormatSI (four significant digits, an SI
// prefix), so tables are stable for golden tests; wall times appear only in
// JSON.
package report

// Caution is the line every report ends with (SAFETY.md).
const Caution = "A simulation is an estimate, not a compliance result: confirm on real hardware, by an accredited laboratory, against the standard that applies (see SAFETY.md)."
