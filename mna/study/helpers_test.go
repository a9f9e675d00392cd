package study

import (
	"context"

	"zapnet/netlist"
)

// execute solves the whole plan of c as the run command does.
func execute(c *netlist.Circuit, opt *Options) ([]Run, error) {
	jobs, err := Jobs(c, opt)
	if err != nil {
		return nil, err
	}
	return Execute(context.Background(), c, jobs, opt, nil)
}

// solve compiles the variant of c and solves one run with it.
func solve(c *netlist.Circuit, v netlist.Variant, level float64, polarity string, opt *Options) (*Run, error) {
	b, err := NewBench(c, v)
	if err != nil {
		return nil, err
	}
	return b.Solve(level, polarity, opt)
}
