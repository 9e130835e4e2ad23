package funcs

import (
	"sort"
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// hoursPerYear is the 365-day year used for capacity factors (8 760 h).
const hoursPerYear = 8760

// technologies lists the ids with a life-cycle row in the common pack.
func (e *Engine) technologies() []string {
	var out []string
	if c := e.packs.packs[CommonPack]; c != nil {
		for k := range c.rows {
			if k.quantity == "lifecycle" {
				out = append(out, k.id)
			}
		}
	}
	sort.Strings(out)
	return out
}

// resolveTech resolves a technology name through the technology vocabulary (see
// technames.go): ids with case and separators folded ("Wind onshore"), names of statistics
// and planning models ("NGCC", "upv_7"). note says how a name other than an id was read.
func (e *Engine) resolveTech(fn, s string) (id, note string, err error) {
	return e.techs.resolve(fn, s)
}

func callLifecycle(e *Engine, c *callCtx, a argList) (float64, string, error) {
	tech, err := e.techArg(c, a, 0)
	if err != nil {
		return 0, "", err
	}
	stat, err := a.optStr(1, "median")
	if err != nil {
		return 0, "", err
	}
	f := e.packs.lookup(CommonPack, tech, "lifecycle")
	c.use(f)
	v, err := statValue(f, stat, a.fn.Name, tech)
	return v, "", err
}

// techArg resolves the technology argument at index i and notes how a name
// other than an id was read.
func (e *Engine) techArg(c *callCtx, a argList, i int) (string, error) {
	ts, err := a.str(i)
	if err != nil {
		return "", err
	}
	tech, note, err := e.resolveTech(a.fn.Name, ts)
	if err != nil {
		return "", err
	}
	if note != "" {
		c.note(note)
	}
	return tech, nil
}

// statValue is the median (value), min (low) or max (high) of a row. A row
// without the published bound asked for, or an unknown statistic, is an error
// of parameter stat.
func statValue(f *Factor, stat, fn, id string) (float64, error) {
	switch strings.ToLower(strings.TrimSpace(stat)) {
	case "median", "":
		return f.Value, nil
	case "min":
		if f.Low == nil {
			return 0, &Error{Code: CodeMissingFactor, Func: fn, Param: "stat", Msg: "no published minimum for " + id}
		}
		return *f.Low, nil
	case "max":
		if f.High == nil {
			return 0, &Error{Code: CodeMissingFactor, Func: fn, Param: "stat", Msg: "no published maximum for " + id}
		}
		return *f.High, nil
	}
	return 0, &Error{Code: CodeBadArgument, Func: fn, Param: "stat", Msg: "unknown statistic " + quote(stat) + ": accepted are min, median, max"}
}

// lifecycleParts are the parts of a life-cycle intensity, after the columns of
// IPCC AR5 WG3 Annex III Table A.III.2, and the quantity of each.
func lifecycleParts() []string {
	return []string{"direct", "infrastructure", "biogenic_albedo", "methane", "total"}
}

func partQuantity(part string) (string, bool) {
	p := strings.ToLower(strings.TrimSpace(part))
	switch p {
	case "total":
		return "lifecycle", true
	case "direct", "infrastructure", "biogenic_albedo", "methane":
		return p, true
	}
	return "", false
}

func checkPart(_ *Engine, s string) error {
	if _, ok := partQuantity(s); !ok {
		return &Error{Code: CodeBadArgument, Param: "part", Msg: "unknown part " + quote(s) + ": accepted are " + strings.Join(lifecycleParts(), ", ")}
	}
	return nil
}

func callLifecyclePart(e *Engine, c *callCtx, a argList) (float64, string, error) {
	tech, err := e.techArg(c, a, 0)
	if err != nil {
		return 0, "", err
	}
	ps, err := a.str(1)
	if err != nil {
		return 0, "", err
	}
	if err := checkPart(e, ps); err != nil {
		return 0, "", withFunc(err, a.fn.Name)
	}
	q, _ := partQuantity(ps)
	stat, err := a.optStr(2, "median")
	if err != nil {
		return 0, "", err
	}
	f := e.packs.lookup(CommonPack, tech, q)
	if f == nil {
		return 0, "", &Error{Code: CodeMissingFactor, Func: a.fn.Name, Param: "part",
			Msg: "the common pack has no " + ps + " part for " + tech + " (IPCC AR5 WG3 Annex III Table A.III.2); add the row with --factors, or use lifecycle_intensity for the total"}
	}
	c.use(f)
	v, err := statValue(f, stat, a.fn.Name, tech+" "+ps)
	return v, "", err
}

// embodiedPerMW computes t CO2e per MW for the arguments at indexes tech, cf,
// lifetime and stat of a: the infrastructure & supply-chain intensity (IPCC AR5
// WG3 Annex III Table A.III.2) times the lifetime output of 1 MW. It also returns the rows
// the value is a product of (the intensity, and the default capacity factor and lifetime
// when used), for its 95 % interval, and the statistic asked for.
func (e *Engine) embodiedPerMW(c *callCtx, a argList, techI, cfI, lifeI, statI int) (float64, []factorUse, string, error) {
	tech, err := e.techArg(c, a, techI)
	if err != nil {
		return 0, nil, "", err
	}
	infra := e.packs.lookup(CommonPack, tech, "infrastructure")
	if infra == nil {
		return 0, nil, "", &Error{Code: CodeMissingFactor, Func: a.fn.Name, Param: "tech",
			Msg: "no infrastructure & supply-chain intensity for " + tech + " in the common pack (IPCC AR5 WG3 Annex III Table A.III.2 gives none here): " +
				"its life-cycle intensity (lifecycle_intensity) mixes in fuel supply, so it is not used as embodied; add an infrastructure row with --factors"}
	}
	c.use(infra)
	uses := []factorUse{{infra, 1}}
	stat, err := a.optStr(statI, "median")
	if err != nil {
		return 0, nil, "", err
	}
	g, err := statValue(infra, stat, a.fn.Name, tech+" infrastructure")
	if err != nil {
		return 0, nil, "", err
	}
	c.note("embodied = infrastructure & supply-chain intensity " + FormatNumber(g) + " g CO2e/kWh (" + statName(stat) + "); combustion and fuel-supply methane are not embodied")
	cf, given, err := a.optNum(cfI)
	if err != nil {
		return 0, nil, "", err
	}
	if !given {
		f := e.packs.lookup(CommonPack, tech, "capacity_factor")
		if f == nil {
			return 0, nil, "", &Error{Code: CodeMissingFactor, Func: a.fn.Name, Param: "capacity_factor", Msg: "no default capacity factor for " + tech + ": pass capacity_factor"}
		}
		cf = f.Value
		c.use(f)
		uses = append(uses, factorUse{f, 1})
		c.note("capacity factor " + FormatNumber(cf) + " is the default for " + tech)
	} else if cf <= 0 || cf > 1 {
		return 0, nil, "", &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: "capacity_factor", Msg: "must lie in (0, 1], got " + FormatNumber(cf)}
	}
	life, given, err := a.optNum(lifeI)
	if err != nil {
		return 0, nil, "", err
	}
	if !given {
		f := e.packs.lookup(CommonPack, tech, "lifetime")
		if f == nil {
			return 0, nil, "", &Error{Code: CodeMissingFactor, Func: a.fn.Name, Param: "lifetime_years", Msg: "no default lifetime for " + tech + ": pass lifetime_years"}
		}
		life = f.si / (365 * 86400)
		c.use(f)
		uses = append(uses, factorUse{f, 1})
		c.note("lifetime " + FormatNumber(life) + " years is the default for " + tech)
	} else if life <= 0 || life > 200 {
		return 0, nil, "", &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: "lifetime_years", Msg: "must lie in (0, 200] years, got " + FormatNumber(life)}
	}
	// g/kWh x 1000 kWh/MWh x cf x 8760 h x years / 1e6 g/t = t CO2e per MW
	return g * 1000 * cf * hoursPerYear * life / 1e6, uses, stat, nil
}

func callEmbodiedPerMW(e *Engine, c *callCtx, a argList) (float64, string, error) {
	v, uses, stat, err := e.embodiedPerMW(c, a, 0, 1, 2, 3)
	if err == nil {
		c.recordEmbodied(v, uses, stat, 1)
	}
	return v, "", err
}

func callEmbodied(e *Engine, c *callCtx, a argList) (float64, string, error) {
	capacity, err := a.num(1)
	if err != nil {
		return 0, "", err
	}
	us, err := a.str(2)
	if err != nil {
		return 0, "", err
	}
	u, err := e.parseUnit(us)
	if err == nil && u.Dim != units.Power {
		_, err = units.ParseAs(us, units.Power)
	}
	if err != nil {
		return 0, "", withFunc(unitError("unit", err), a.fn.Name)
	}
	perMW, uses, stat, err := e.embodiedPerMW(c, a, 0, 3, 4, 5)
	if err != nil {
		return 0, "", err
	}
	c.recordEmbodied(perMW, uses, stat, capacity*u.SIFloat()/1e6)
	return perMW * capacity * u.SIFloat() / 1e6, "", nil
}

// statName names a statistic for notes: "median" when left out.
func statName(stat string) string {
	if s := strings.ToLower(strings.TrimSpace(stat)); s != "" {
		return s
	}
	return "median"
}
