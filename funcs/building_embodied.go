package funcs

import (
	"sort"
	"strings"

	"github.com/fluecell/fluecell/funcs/units"
)

// Embodied emissions of buildings per unit of floor area, by building type:
// building_embodied rows of the common pack (kg CO2e per m2 of gross internal
// area, whole life without operational energy).

// buildingTypes lists the building types of the common pack, sorted.
func (e *Engine) buildingTypes() []string {
	var out []string
	if c := e.packs.packs[CommonPack]; c != nil {
		for k := range c.rows {
			if k.quantity == "building_embodied" {
				out = append(out, k.id)
			}
		}
	}
	sort.Strings(out)
	return out
}

// resolveBuilding folds case and separators ("Office" is office).
func (e *Engine) resolveBuilding(s string) (string, error) {
	id := strings.ReplaceAll(techKey(s), " ", "_")
	if len(s) <= maxLookupBytes && e.packs.lookup(CommonPack, id, "building_embodied") != nil {
		return id, nil
	}
	all := strings.Join(e.buildingTypes(), ", ")
	return "", &Error{Code: CodeBadArgument, Param: "building_type", Msg: "unknown building type " + quote(s) + ": accepted are " + all}
}

func checkAreaUnit(_ *Engine, s string) error {
	_, err := units.ParseAs(s, units.Area)
	return err
}

func checkBuilding(e *Engine, s string) error {
	_, err := e.resolveBuilding(s)
	return err
}

func callBuildingEmbodied(e *Engine, c *callCtx, a argList) (float64, string, error) {
	area, err := a.num(0)
	if err != nil {
		return 0, "", err
	}
	if area < 0 {
		return 0, "", &Error{Code: CodeBadArgument, Func: a.fn.Name, Param: "area", Msg: "must not be negative, got " + FormatNumber(area)}
	}
	us, err := a.str(1)
	if err != nil {
		return 0, "", err
	}
	u, err := units.ParseAs(us, units.Area)
	if err != nil {
		return 0, "", withFunc(unitError("unit", err), a.fn.Name)
	}
	bs, err := a.str(2)
	if err != nil {
		return 0, "", err
	}
	id, err := e.resolveBuilding(bs)
	if err != nil {
		return 0, "", withFunc(err, a.fn.Name)
	}
	stat, err := a.optStr(3, "median")
	if err != nil {
		return 0, "", err
	}
	f := e.packs.lookup(CommonPack, id, "building_embodied")
	c.use(f)
	v, err := statValue(f, stat, a.fn.Name, id)
	if err != nil {
		return 0, "", err
	}
	if strings.EqualFold(strings.TrimSpace(stat), "min") {
		c.note("min of " + id + " is the publication's 2030 target for a well-designed building, not a measured minimum")
	}
	c.note("whole life without operational energy (materials, construction, replacement, end of life) per m2 of gross internal area")
	c.recordBuild([]planTerm{{perUnit: f.si * u.SIFloat() / 1000, uses: []factorUse{{f, 1}}}}, stat, area)
	// kg CO2e per m2 (the row's unit, in SI via f.si) x m2 / 1000 = t CO2e
	return f.si * (v / f.Value) * area * u.SIFloat() / 1000, "", nil
}
