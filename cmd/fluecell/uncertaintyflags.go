package main

import (
	"flag"
	"fmt"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/funcs/uncertainty"
)

// uncertaintyFlags choose how annotate and batch compute the 95 % intervals of the totals,
// with the names eval uses.
type uncertaintyFlags struct {
	approach string
	seed     uint64
	draws    int
}

func (f *uncertaintyFlags) register(fs *flag.FlagSet) {
	fs.StringVar(&f.approach, "uncertainty", "approach1", "compute the 95 % intervals of the totals by `APPROACH`: approach1 (error propagation, IPCC 2006 Vol 1 Ch 3 Eq 3.1/3.2) or approach2 (Monte Carlo)")
	fs.Uint64Var(&f.seed, "seed", 1, "approach2: seed of the Monte Carlo draws (the same seed gives the same intervals)")
	fs.IntVar(&f.draws, "draws", funcs.DefaultDraws, "approach2: number of Monte Carlo draws, 1 to 10000000")
}

// options checks the flags; the error names the flag and what it accepts.
func (f *uncertaintyFlags) options() (funcs.IntervalOptions, error) {
	a, err := funcs.ParseApproach(f.approach)
	if err != nil {
		return funcs.IntervalOptions{}, fmt.Errorf("--uncertainty %q: accepted are approach1 (error propagation) and approach2 (Monte Carlo)", f.approach)
	}
	if f.draws < 1 || f.draws > uncertainty.MaxDraws {
		return funcs.IntervalOptions{}, fmt.Errorf("--draws %d: give 1 to %d", f.draws, uncertainty.MaxDraws)
	}
	return funcs.IntervalOptions{Approach: a, Seed: f.seed, Draws: f.draws}, nil
}

// fingerprint is what batch keys its outputs by: another approach, seed or count of draws
// gives other intervals.
func (f *uncertaintyFlags) fingerprint() string {
	return fmt.Sprintf("uncertainty %s seed %d draws %d", f.approach, f.seed, f.draws)
}
