package mna

import (
	"context"
	"errors"
	"testing"
)

// A solution whose context is done stops within checkEvery passes of its
// step loop, says Interrupted, and keeps the statistics of what it solved
// [practice: an interrupted study writes what finished].
func TestContextStopsTheSolution(t *testing.T) {
	s := referenceNetwork(t)
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	points := 0
	cutAt := 0
	set := &Settings{Stop: 400e-9, Context: ctx, Observe: func(*Point) {
		points++
		if points == 200 {
			cancel()
			cutAt = points
		}
	}}
	res, err := s.Transient(set)
	if !errors.Is(err, ErrInterrupted) || !errors.Is(err, context.Canceled) {
		t.Fatalf("error %v, want ErrInterrupted wrapping context.Canceled", err)
	}
	if res == nil || res.Status != Interrupted {
		t.Fatalf("result %+v, want status Interrupted", res)
	}
	// Two points a step (the stage's and the end's): at most checkEvery
	// steps past the cancel.
	if after := points - cutAt; after > 2*checkEvery+2 {
		t.Errorf("%d points after the cancel, want at most %d", after, 2*checkEvery+2)
	}
	if res.Stats.Steps == 0 {
		t.Error("the statistics of the steps solved are lost")
	}
	// The same network without the cancel runs to its end.
	full, err := s.Transient(&Settings{Stop: 400e-9, Context: context.Background()})
	if err != nil || full.Status != Completed {
		t.Fatalf("%v, %v", err, full.Status)
	}
}
