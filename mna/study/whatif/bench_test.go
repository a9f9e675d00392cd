package whatif

import (
	"context"
	"runtime"
	"syscall"
	"testing"
	"time"

	"zapnet/mna/study"
	"zapnet/netlist"
)

// Speed targets of the what-if sweeps. Each benchmark uses every core
// GOMAXPROCS allows, one compiled circuit per worker. Compare core counts in
// separate processes (one -cpu value each; a -cpu list in one process gave
// inconsistent wall times here), on a machine with nothing else running:
//
//	go test -c -o whatif.test ./cmd/internal/whatif
//	./whatif.test -test.run - -test.bench 'Strikes|Spread$' -test.benchtime 1x -test.cpu 1
//	./whatif.test -test.run - -test.bench 'Strikes|Spread$' -test.benchtime 1x -test.cpu 2
//
// cpu-ms/run is the CPU time per run, which other work on the machine does
// not inflate.

// BenchmarkStrikes solves 1,000 strikes of reference network A: 500 levels
// from 2 kV to 8 kV, both polarities, as one sweep.
func BenchmarkStrikes(b *testing.B) {
	c := parse(b, "../../../testdata/reference/net-a.zap")
	var levels []float64
	for k := range 500 {
		levels = append(levels, 2000+float64(k)*6000/499)
	}
	opt := &study.Options{Levels: levels, Polarities: []string{"pos", "neg"}, Workers: runtime.GOMAXPROCS(0)}
	jobs, err := study.Jobs(c, opt)
	if err != nil {
		b.Fatal(err)
	}
	n := 0
	cpu0 := cpuTime()
	for b.Loop() {
		runs, err := study.Execute(context.Background(), c, jobs, opt, nil)
		if err != nil {
			b.Fatal(err)
		}
		n += len(runs)
	}
	b.ReportMetric(float64(n)/b.Elapsed().Seconds(), "runs/s")
	b.ReportMetric(1e3*(cpuTime()-cpu0).Seconds()/float64(n), "cpu-ms/run")
}

// cpuTime is the CPU time the process has used, user and system: on a
// machine shared with other work it shows the cost per run that the wall
// clock hides.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// BenchmarkSpread draws and solves 200 circuits of reference network A with
// six tolerances (testdata/net-a-spread.zap): each circuit is compiled anew,
// since its values differ, and struck once at 8 kV. The metric s/10k-runs
// extrapolates the per-circuit cost to a spread of 10,000.
func BenchmarkSpread(b *testing.B) {
	c := parse(b, "testdata/net-a-spread.zap")
	const runs = 200
	opt := &SpreadOptions{Runs: runs, Seed: 1}
	opt.Study.Workers = runtime.GOMAXPROCS(0)
	n := 0
	cpu0 := cpuTime()
	for b.Loop() {
		r, err := Spreads(context.Background(), c, opt)
		if err != nil {
			b.Fatal(err)
		}
		if r.Solved != runs {
			b.Fatalf("%d of %d circuits solved", r.Solved, runs)
		}
		n += runs
	}
	per := b.Elapsed().Seconds() / float64(n)
	b.ReportMetric(1e3*per, "ms/run")
	b.ReportMetric(1e4*per, "s/10k-runs")
	b.ReportMetric(1e3*(cpuTime()-cpu0).Seconds()/float64(n), "cpu-ms/run")
}

// BenchmarkDrawCompile is the part of a spread run that is not the solve:
// drawing the values, applying them to the circuit and compiling it.
func BenchmarkDrawCompile(b *testing.B) {
	c := parse(b, "testdata/net-a-spread.zap")
	k := 0
	for b.Loop() {
		x, err := c.With(Draw(c, c.Tolerances, 1, k)...)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := study.NewBench(x, netlist.Variant(nil)); err != nil {
			b.Fatal(err)
		}
		k++
	}
}
