package main

import (
	"fmt"
	"io"
	"os"
	"strings"
	"sync"
	"time"

	"github.com/mattn/go-isatty"
)

// isTerminal reports whether w is a terminal, where a progress bar helps;
// in a log file, a pipe or /dev/null it would only be noise (a character
// device is not enough: /dev/null is one too).
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok || os.Getenv("TERM") == "dumb" {
		return false
	}
	return isatty.IsTerminal(f.Fd())
}

// progressBar draws "label [#####.....] done/total  elapsed" on one line of
// a terminal, redrawn at most ten times a second.
type progressBar struct {
	w     io.Writer
	label string
	start time.Time
	mu    sync.Mutex
	last  time.Time
	drawn bool
}

// newProgress returns a progress callback that draws a bar on stderr when
// stderr is a terminal, and a function that clears the bar at the end. When
// stderr is not a terminal the callback is nil and the clear does nothing.
func newProgress(stderr io.Writer, label string) (func(done, total int), func()) {
	if !isTerminal(stderr) {
		return nil, func() {}
	}
	p := &progressBar{w: stderr, label: label, start: time.Now()}
	return p.update, p.clear
}

const barWidth = 30

func (p *progressBar) update(done, total int) {
	p.mu.Lock()
	defer p.mu.Unlock()
	now := time.Now()
	if done < total && now.Sub(p.last) < 100*time.Millisecond {
		return
	}
	p.last = now
	fill := 0
	if total > 0 {
		fill = barWidth * done / total
	}
	fmt.Fprintf(p.w, "\r%s [%s%s] %d/%d  %s ", p.label, strings.Repeat("#", fill), strings.Repeat(".", barWidth-fill),
		done, total, now.Sub(p.start).Round(time.Second))
	p.drawn = true
}

func (p *progressBar) clear() {
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.drawn {
		fmt.Fprintf(p.w, "\r%s\r", strings.Repeat(" ", len(p.label)+barWidth+40))
		p.drawn = false
	}
}
