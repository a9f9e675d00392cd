package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"sort"

	"zapnet/cmd/internal/report"
	"zapnet/devices/spec"
	"zapnet/mna/study"
	"zapnet/mna/study/whatif"
)

func runMerge(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("merge",
		"merge SHARD.json ... [-o FILE]",
		`  zapnet run deck.zap --shard 1/2 --json a.json
  zapnet run deck.zap --shard 2/2 --json b.json
  zapnet merge a.json b.json -o all.json

Joins the JSON of the shards of one sweep (run, margin, sensitivity or
spread, each run with --shard i/n) into exactly the JSON the unsharded
command writes, and prints its tables. Every shard must be there once: a
missing or interrupted slice is an error naming the missing items. A
spread's shards carry a summary of their circuits (the values while few,
sketches above) that adds up to the unsharded spread's statistics bit for
bit.
Exit status: as the unsharded command's (run, spread: 1 when something
failed its verdict), 2 when the files do not belong together.`,
		stderr)
	out := fs.StringP("output", "o", "", "write the merged JSON to `FILE` (default: stdout, the tables then go to stderr)")
	if err := fs.Parse(args); err != nil {
		return err
	}
	if fs.NArg() < 1 {
		fs.Usage()
		return errors.New("merge: give the JSON files of the shards")
	}
	return mergeFiles(fs.Args(), *out, stdout, stderr)
}

// mergeFiles reads the shards, merges them and writes the result.
func mergeFiles(paths []string, out string, stdout, stderr io.Writer) error {
	jsonPath := out
	if jsonPath == "" {
		jsonPath = "-"
	}
	check := newOutputs(paths...)
	check.file("-o", jsonPath)
	if err := check.err(); err != nil {
		return fmt.Errorf("merge: %w", err)
	}
	s, err := readShards(paths)
	if err != nil {
		return err
	}
	switch s.kind {
	case "run":
		docs, err := decodeShards(s, func() (any, *study.Meta, *study.Document) {
			d := &study.Document{}
			return d, &d.Meta, d
		})
		if err != nil {
			return err
		}
		return mergeRuns(docs, jsonPath, stdout, stderr)
	case "margin":
		return mergeResults(s, func() (any, *study.Meta, *whatif.MarginResult) {
			d := &whatif.MarginDocument{MarginResult: &whatif.MarginResult{}}
			return d, &d.Meta, d.MarginResult
		}, whatif.MergeMargins, writeMargins, jsonPath, stdout, stderr)
	case "sensitivity":
		return mergeResults(s, func() (any, *study.Meta, *whatif.SensitivityResult) {
			d := &whatif.SensitivityDocument{SensitivityResult: &whatif.SensitivityResult{}}
			return d, &d.Meta, d.SensitivityResult
		}, whatif.MergeSensitivities, writeSensitivity, jsonPath, stdout, stderr)
	default: // spread
		return mergeResults(s, func() (any, *study.Meta, *whatif.SpreadResult) {
			d := &whatif.SpreadDocument{SpreadResult: &whatif.SpreadResult{}}
			return d, &d.Meta, d.SpreadResult
		}, whatif.MergeSpreads, writeSpread, jsonPath, stdout, stderr)
	}
}

// mergeResults merges the shards of a what-if command, its documents
// made by newDoc, joined by merge and written by write as the unsharded
// command writes them.
func mergeResults[R any](s *shards, newDoc func() (any, *study.Meta, *R), merge func([]*R) (*R, error),
	write func(*R, study.Meta, string, io.Writer, io.Writer) error, jsonPath string, stdout, stderr io.Writer) error {
	parts, err := decodeShards(s, newDoc)
	if err != nil {
		return err
	}
	res, err := merge(parts)
	if err != nil {
		return fmt.Errorf("merge: %w", err)
	}
	return write(res, s.metas[0], jsonPath, stdout, stderr)
}

// shards are the JSON documents merge joins, as read.
type shards struct {
	kind  string // the command that wrote them
	paths []string
	raws  [][]byte
	metas []study.Meta // each shard's, once decoded
}

// readShards reads the files and refuses a set that more than one command
// wrote.
func readShards(paths []string) (*shards, error) {
	s := &shards{paths: paths}
	for _, p := range paths {
		b, err := os.ReadFile(p)
		if err != nil {
			return nil, fmt.Errorf("merge: %w", err)
		}
		k, err := docKind(b)
		if err != nil {
			return nil, fmt.Errorf("merge: %s: %w", p, err)
		}
		if s.kind != "" && k != s.kind {
			return nil, fmt.Errorf("merge: %s is %s output, %s is %s output: merge shards of one command", paths[0], s.kind, p, k)
		}
		s.kind = k
		s.raws = append(s.raws, b)
	}
	s.metas = make([]study.Meta, len(s.raws))
	return s, nil
}

// decodeShards decodes every shard into the document newDoc makes, keeping
// its meta and result (parts of the document that newDoc points at), and
// checks that the shards come from one deck and version.
func decodeShards[R any](s *shards, newDoc func() (doc any, meta *study.Meta, res *R)) ([]*R, error) {
	parts := make([]*R, len(s.raws))
	for i, raw := range s.raws {
		doc, meta, res := newDoc()
		d := json.NewDecoder(bytes.NewReader(raw))
		if err := d.Decode(doc); err != nil {
			return nil, fmt.Errorf("merge: %s: %w", s.paths[i], err)
		}
		s.metas[i] = *meta
		parts[i] = res
	}
	if err := sameMeta(s.paths, s.metas); err != nil {
		return nil, err
	}
	return parts, nil
}

// docKind tells which command wrote a JSON document by its fields.
func docKind(b []byte) (string, error) {
	var m map[string]json.RawMessage
	if err := json.Unmarshal(b, &m); err != nil {
		return "", fmt.Errorf("not a zapnet JSON document: %w", err)
	}
	if string(m["tool"]) != `"zapnet"` {
		return "", errors.New("not a zapnet JSON document (no \"tool\": \"zapnet\")")
	}
	switch {
	case m["margins"] != nil:
		return "margin", nil
	case m["parameters"] != nil:
		return "sensitivity", nil
	case m["pass_fraction"] != nil || m["samples"] != nil:
		return "spread", nil
	case bytes.HasPrefix(bytes.TrimSpace(m["runs"]), []byte("[")):
		return "run", nil
	}
	return "", errors.New("not the JSON of run, margin, sensitivity or spread")
}

// sameMeta checks that every shard comes from the same tool version, deck
// and title: shards of different decks cannot be joined.
func sameMeta(paths []string, metas []study.Meta) error {
	for i := 1; i < len(metas); i++ {
		if metas[i] != metas[0] {
			return fmt.Errorf("merge: %s and %s come from different decks or versions (%s %s, %q; %s %s, %q)",
				paths[0], paths[i], metas[0].Deck, metas[0].Version, metas[0].Title, metas[i].Deck, metas[i].Version, metas[i].Title)
		}
	}
	return nil
}

// mergeRuns joins run shards into the document `zapnet run` writes for the
// whole sweep, and prints its summary.
func mergeRuns(docs []*study.Document, jsonPath string, stdout, stderr io.Writer) error {
	total := -1
	var infos []*study.ShardInfo
	for _, d := range docs {
		n := len(d.Runs)
		if d.Shard != nil {
			n = d.Shard.Total
		}
		if total >= 0 && n != total {
			return fmt.Errorf("merge: shards of %d and of %d runs: they are not shards of one sweep", total, n)
		}
		total = n
		infos = append(infos, d.Shard)
	}
	merged := study.Document{Meta: docs[0].Meta, Runs: []study.Run{}}
	var idx []int
	for _, d := range docs {
		for _, r := range d.Runs {
			merged.Runs = append(merged.Runs, r)
			idx = append(idx, r.Index)
		}
	}
	if err := study.Joined(infos, idx, total, "runs"); err != nil {
		return fmt.Errorf("merge: %w", err)
	}
	sort.Slice(merged.Runs, func(a, b int) bool { return merged.Runs[a].Index < merged.Runs[b].Index })

	tables := tablesOut(jsonPath, stdout, stderr)
	fmt.Fprintf(tables, "%s (%s): %d shards, %d runs\n\n", merged.Title, merged.Deck, len(docs), len(merged.Runs))
	if err := report.Summary(tables, merged.Runs); err != nil {
		return err
	}
	if err := writeOutput(jsonPath, stdout, merged); err != nil {
		return fmt.Errorf("merge: %w", err)
	}
	var errs []error
	failed := false
	for _, r := range merged.Runs {
		switch {
		case r.Error != "":
			errs = append(errs, fmt.Errorf("%s %s: %s", spec.FormatSI(r.Level, r.LevelUnit), r.Polarity, r.Error))
		case r.Verdict != study.Pass:
			failed = true
		}
	}
	if len(errs) > 0 {
		return errors.Join(errs...)
	}
	if failed {
		return errVerdictFail
	}
	return nil
}
