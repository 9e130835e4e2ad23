package main

import (
	"flag"
	"fmt"

	"github.com/fluecell/fluecell/funcs"
	"github.com/fluecell/fluecell/importer"
	"github.com/fluecell/fluecell/importer/regfile"
)

// mappingFlag is the --mapping flag of the commands that read workbooks:
// a mapping file (importer.LoadMapping) saying how their tables are read.
type mappingFlag struct {
	path   string
	loaded *importer.Mapping
}

func (f *mappingFlag) register(fs *flag.FlagSet) {
	fs.StringVar(&f.path, "mapping", "", "read the tables as the mapping `M.json` says (write one with fluecell inspect --write-mapping): header rows, column roles, units and fuel names; a workbook that no longer fits it fails with what moved")
}

// load checks the mapping through e, once; without --mapping it does
// nothing. Errors name the file and the JSON path of the mistake.
func (f *mappingFlag) load(e *funcs.Engine) error {
	if f.path == "" || f.loaded != nil {
		return nil
	}
	if err := regfile.Check(f.path); err != nil {
		return fmt.Errorf("--mapping: %w", err)
	}
	m, err := importer.LoadMapping(e, f.path)
	if err != nil {
		return err
	}
	f.loaded = m
	return nil
}

// fingerprint identifies the mapping by its content, for the up-to-date
// check of batch; nil without a mapping.
func (f *mappingFlag) fingerprint() []string {
	if f.loaded == nil {
		return nil
	}
	return []string{"mapping " + f.loaded.Ref().SHA256}
}

// engine builds the engine of the flags and loads the mapping with it.
func (f *annotateFlags) engine() (*funcs.Engine, error) {
	e, err := f.engineFlags.engine()
	if err != nil {
		return nil, err
	}
	if err := f.mappingFlag.load(e); err != nil {
		return nil, err
	}
	if err := f.gwpSetFlag.check(e); err != nil {
		return nil, err
	}
	return e, nil
}
