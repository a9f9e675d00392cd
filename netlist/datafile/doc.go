// Package datafile reads the measured and published data a user brings to
// zapnet's fits and table models: TLP curves and impedance curves as CSV,
// Touchstone network data (.s1p, .s2p, version 1 and 2), IBIS buffer models
// (.ibs: clamp tables, C_comp, package parasitics) and zapnet's own small
// datasheet-points format. Every reader takes a name (shown in messages) and
// the file's bytes, reads the whole file and reports every problem it found
// as file:line:col: message, sorted by position, as the deck reader does
// (package textpos: at most MaxProblems of them and the count of the rest,
// characters a terminal would act on escaped); it returns no data when any
// problem is an error. Warnings (legal but doubtful data, such as a TLP
// curve whose voltage falls as its current rises) come back beside the data.
// Numbers with a prefix and a unit follow the deck's rules
// (spec.ParseNumber); columns of data hold plain numbers.
//
// The package reads only the standard library and two leaves of zapnet,
// devices/spec and netlist/textpos, so that device models and the deck
// reader can both use it.
package datafile
