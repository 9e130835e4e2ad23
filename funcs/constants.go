package funcs

import (
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// checkConstant validates a literal string argument the way the function
// will at run time, so that Compile can report it at its column.
func (e *Engine) checkConstant(f *Function, p Param, s string) error {
	var err error
	if p.check != nil {
		err = p.check(e, s)
	}
	switch p.kind {
	case kindFuel:
		_, _, err = e.resolveFuel(s)
	case kindAmountUnit:
		_, err = units.ParseAs(s, units.Energy, units.Mass, units.Volume)
	case kindEnergyUnit:
		_, err = units.ParseAs(s, units.Energy)
	case kindMassUnit:
		_, err = units.ParseAs(s, units.Mass)
	case kindPowerUnit:
		_, err = units.ParseAs(s, units.Power)
	case kindAnyUnit:
		_, err = units.Parse(s)
	case kindPack:
		_, err = e.resolvePack(s)
	case kindGWPSet:
		_, err = e.resolveGWPSet(s)
	case kindTech:
		_, _, err = e.resolveTech(f.Name, s)
	case kindStat:
		switch strings.ToLower(strings.TrimSpace(s)) {
		case "min", "median", "max":
		default:
			err = &Error{Code: CodeBadArgument, Param: p.Name, Msg: "unknown statistic " + quote(s) + ": accepted are min, median, max"}
		}
	}
	if err == nil {
		return nil
	}
	if _, ok := err.(*units.Error); ok {
		return unitError(p.Name, err)
	}
	if fe, ok := AsError(err); ok {
		c := *fe
		if c.Param == "" {
			c.Param = p.Name
		}
		return &c
	}
	return &Error{Code: CodeBadArgument, Param: p.Name, Msg: err.Error()}
}
