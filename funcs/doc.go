// Package funcs is the domain of fluecell: factor packs, fuel names, the carbon
// functions of the catalog, and the expression engine that runs them.
//
// It knows nothing of HTTP or workbooks. Every number it returns carries its
// unit, the factor rows it was computed from (each with its publication and
// table) and notes on the assumptions made (alias mappings, basis conversions).
//
// The usual entry points are New, which loads the embedded packs plus any user
// packs, Engine.Call for one catalog function with named arguments, and
// Engine.Compile, which compiles an expression once so that a Runner can
// evaluate it for many rows.
//
// Names as records write them are data: data/fuel_names.csv (retail grades, blends such
// as E10 and B20, US EIA energy source codes, qualifier words such as "bulk") and
// data/tech_names.csv (technology names of capacity statistics and planning models), each
// row with its source. Engine.LookupFuel classifies a name without building a message.
//
// Energy in the Btu family (Btu, kBtu, MMBtu, therm, Dth, quad) without a stated basis is
// read as HHV, the North American practice; other energy units without one are read on the
// pack's basis. A note says so.
//
// Default factors are Tier 1 estimates; regulated reporting follows the
// jurisdiction's rules and accredited verification.
package funcs
