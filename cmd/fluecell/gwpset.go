package main

import (
	"flag"
	"fmt"

	"github.com/fluecell/fluecell/funcs"
)

// gwpSetFlag is the --gwp-set flag of the commands that read workbooks: the
// IPCC assessment whose GWP-100 values weight CH4 and N2O in every call of
// the rules that names no set (importer.Options.GWPSet).
type gwpSetFlag struct {
	gwpSet string
}

func (f *gwpSetFlag) register(fs *flag.FlagSet) {
	fs.StringVar(&f.gwpSet, "gwp-set", "", "weight CH4 and N2O with the GWP-100 values of IPCC assessment `SET` (ar4, ar5 or ar6) in every call that names none (default: the mapping's gwp_set, else "+funcs.DefaultGWPSet+")")
}

// check refuses an unknown set before any workbook is read, naming the flag
// and the sets e accepts.
func (f *gwpSetFlag) check(e *funcs.Engine) error {
	if f.gwpSet == "" {
		return nil
	}
	if _, err := e.ResolveGWPSet(f.gwpSet); err != nil {
		fe, _ := funcs.AsError(err)
		return fmt.Errorf("--gwp-set %s: %s", f.gwpSet, fe.Msg)
	}
	return nil
}
