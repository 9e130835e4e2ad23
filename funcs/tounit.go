package funcs

import "github.com/fluecell/fluecell/funcs/units"

func callToUnit(e *Engine, c *callCtx, a argList) (float64, string, error) {
	v, err := a.num(0)
	if err != nil {
		return 0, "", err
	}
	fromS, err := a.str(1)
	if err != nil {
		return 0, "", err
	}
	toS, err := a.str(2)
	if err != nil {
		return 0, "", err
	}
	from, err := e.parseUnit(fromS)
	if err != nil {
		return 0, "", withFunc(unitError("from", err), a.fn.Name)
	}
	to, err := e.parseUnit(toS)
	if err != nil {
		return 0, "", withFunc(unitError("to", err), a.fn.Name)
	}
	k, err := units.Factor(from, to)
	if err != nil {
		return 0, "", withFunc(unitError("to", err), a.fn.Name)
	}
	return v * k, to.String(), nil
}
