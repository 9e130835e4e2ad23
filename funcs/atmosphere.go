package funcs

import (
	"github.com/fluecell/fluecell/funcs/units"
)

// gtcPerPPM is the atmosphere row: GtC per ppm of CO2 (Global Carbon Budget).
func (e *Engine) gtcPerPPM(c *callCtx) (float64, error) {
	f := e.packs.lookup(CommonPack, "atmosphere", "gtc_per_ppm")
	if f == nil || f.Value <= 0 {
		return 0, &Error{Code: CodeMissingFactor, Msg: "no atmosphere/gtc_per_ppm row in the common pack"}
	}
	c.use(f)
	return f.Value, nil
}

// airborne reads the optional airborne fraction at index i: default 1, and it
// must lie in (0, 1].
func airborne(a argList, i int, c *callCtx) (float64, error) {
	v, given, err := a.optNum(i)
	if err != nil {
		return 0, err
	}
	if !given {
		return 1, nil
	}
	if v <= 0 || v > 1 {
		return 0, &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: "airborne_fraction",
			Msg: "must lie in (0, 1], got " + FormatNumber(v) + " (the long-run observed value is about 0.44)"}
	}
	if v < 1 {
		c.note("airborne fraction " + FormatNumber(v) + ": only that share of the emission stays in the atmosphere")
	}
	return v, nil
}

func callPPMFromGtC(e *Engine, c *callCtx, a argList) (float64, string, error) {
	gtc, err := a.num(0)
	if err != nil {
		return 0, "", err
	}
	af, err := airborne(a, 1, c)
	if err != nil {
		return 0, "", err
	}
	per, err := e.gtcPerPPM(c)
	if err != nil {
		return 0, "", err
	}
	return gtc * af / per, "", nil
}

func callPPMFromCO2(e *Engine, c *callCtx, a argList) (float64, string, error) {
	amount, err := a.num(0)
	if err != nil {
		return 0, "", err
	}
	us, err := a.str(1)
	if err != nil {
		return 0, "", err
	}
	u, err := units.ParseAs(us, units.Mass)
	if err != nil {
		return 0, "", withFunc(unitError("unit", err), a.fn.Name)
	}
	af, err := airborne(a, 2, c)
	if err != nil {
		return 0, "", err
	}
	per, err := e.gtcPerPPM(c)
	if err != nil {
		return 0, "", err
	}
	ratio, fs, err := e.co2PerCarbon(CommonPack)
	if err != nil {
		return 0, "", err
	}
	c.use(fs...)
	gtCO2 := amount * u.SIFloat() / 1e12
	return gtCO2 / ratFloat(ratio) * af / per, "", nil
}

func callGtCFromPPM(e *Engine, c *callCtx, a argList) (float64, string, error) {
	ppm, err := a.num(0)
	if err != nil {
		return 0, "", err
	}
	per, err := e.gtcPerPPM(c)
	if err != nil {
		return 0, "", err
	}
	return ppm * per, "", nil
}

func callCO2FromCarbon(e *Engine, c *callCtx, a argList) (float64, string, error) {
	return carbonRatio(e, c, a, false)
}

func callCarbonFromCO2(e *Engine, c *callCtx, a argList) (float64, string, error) {
	return carbonRatio(e, c, a, true)
}

// carbonRatio multiplies the mass argument by 44/12 (C to CO2), or divides
// it (CO2 to C) when inverse is set.
func carbonRatio(e *Engine, c *callCtx, a argList, inverse bool) (float64, string, error) {
	m, err := a.num(0)
	if err != nil {
		return 0, "", err
	}
	ratio, fs, err := e.co2PerCarbon(CommonPack)
	if err != nil {
		return 0, "", err
	}
	c.use(fs...)
	if inverse {
		return m / ratFloat(ratio), "", nil
	}
	return m * ratFloat(ratio), "", nil
}
