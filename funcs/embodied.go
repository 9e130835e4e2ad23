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
	ts, err := a.str(0)
	if err != nil {
		return 0, "", err
	}
	tech, note, err := e.resolveTech(a.fn.Name, ts)
	if err != nil {
		return 0, "", err
	}
	if note != "" {
		c.note(note)
	}
	stat, err := a.optStr(1, "median")
	if err != nil {
		return 0, "", err
	}
	f := e.packs.lookup(CommonPack, tech, "lifecycle")
	c.use(f)
	switch strings.ToLower(strings.TrimSpace(stat)) {
	case "median", "":
		return f.Value, "", nil
	case "min":
		if f.Low == nil {
			return 0, "", &Error{Code: CodeMissingFactor, Func: a.fn.Name, Param: "stat", Msg: "no published minimum for " + tech}
		}
		return *f.Low, "", nil
	case "max":
		if f.High == nil {
			return 0, "", &Error{Code: CodeMissingFactor, Func: a.fn.Name, Param: "stat", Msg: "no published maximum for " + tech}
		}
		return *f.High, "", nil
	}
	return 0, "", &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: "stat", Msg: "unknown statistic " + quote(stat) + ": accepted are min, median, max"}
}

// embodiedPerMW computes t CO2e per MW for the arguments at indexes
// tech, cf and lifetime of a.
func (e *Engine) embodiedPerMW(c *callCtx, a argList, techI, cfI, lifeI int) (float64, error) {
	ts, err := a.str(techI)
	if err != nil {
		return 0, err
	}
	tech, note, err := e.resolveTech(a.fn.Name, ts)
	if err != nil {
		return 0, err
	}
	if note != "" {
		c.note(note)
	}
	lc := e.packs.lookup(CommonPack, tech, "lifecycle")
	c.use(lc)
	direct := 0.0
	if d := e.packs.lookup(CommonPack, tech, "direct"); d != nil {
		direct = d.Value
		c.use(d)
		c.note("embodied = life-cycle median " + FormatNumber(lc.Value) + " - direct median " + FormatNumber(d.Value) + " g CO2e/kWh")
	} else {
		c.note("no direct (combustion) intensity is published for " + tech + ": the whole life-cycle median " + FormatNumber(lc.Value) + " g CO2e/kWh counts as embodied")
	}
	cf, given, err := a.optNum(cfI)
	if err != nil {
		return 0, err
	}
	if !given {
		f := e.packs.lookup(CommonPack, tech, "capacity_factor")
		if f == nil {
			return 0, &Error{Code: CodeMissingFactor, Func: a.fn.Name, Param: "capacity_factor", Msg: "no default capacity factor for " + tech + ": pass capacity_factor"}
		}
		cf = f.Value
		c.use(f)
		c.note("capacity factor " + FormatNumber(cf) + " is the default for " + tech)
	} else if cf <= 0 || cf > 1 {
		return 0, &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: "capacity_factor", Msg: "must lie in (0, 1], got " + FormatNumber(cf)}
	}
	life, given, err := a.optNum(lifeI)
	if err != nil {
		return 0, err
	}
	if !given {
		f := e.packs.lookup(CommonPack, tech, "lifetime")
		if f == nil {
			return 0, &Error{Code: CodeMissingFactor, Func: a.fn.Name, Param: "lifetime_years", Msg: "no default lifetime for " + tech + ": pass lifetime_years"}
		}
		life = f.si / (365 * 86400)
		c.use(f)
		c.note("lifetime " + FormatNumber(life) + " years is the default for " + tech)
	} else if life <= 0 || life > 200 {
		return 0, &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: "lifetime_years", Msg: "must lie in (0, 200] years, got " + FormatNumber(life)}
	}
	// g/kWh x 1000 kWh/MWh x cf x 8760 h x years / 1e6 g/t = t CO2e per MW
	return (lc.Value - direct) * 1000 * cf * hoursPerYear * life / 1e6, nil
}

func callEmbodiedPerMW(e *Engine, c *callCtx, a argList) (float64, string, error) {
	v, err := e.embodiedPerMW(c, a, 0, 1, 2)
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
	perMW, err := e.embodiedPerMW(c, a, 0, 3, 4)
	if err != nil {
		return 0, "", err
	}
	return perMW * capacity * u.SIFloat() / 1e6, "", nil
}
