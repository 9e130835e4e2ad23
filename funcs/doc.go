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
// Default factors are Tier 1 estimates; regulated reporting follows the
// jurisdiction's rules and accredited verification.
package funcs
