// Package units parses unit strings and converts between units with exact factors.
//
// Every unit has an exact decimal factor to its SI base unit (J, kg, m3, W, s), kept as a
// *big.Rat and checked in the tests against the publication that defines it (SI, NIST SP 811,
// IEA, the UK Weights and Measures Act 1985, 40 CFR 98.6). Conversion factors between two units
// are computed exactly and rounded to float64 once.
//
// An energy unit may carry a heating-value basis ("MMBtu HHV", "GJ (NCV)"). Units convert
// freely unless both sides declare different bases: going from HHV to NCV depends on the fuel
// and is not a unit conversion.
//
// Spellings that could mean more than one unit ("ton", "MT", "MBtu", "ml", "gallon (UK)") are
// errors that name the alternatives; the package never guesses.
//
// The year used by Wyr…TWyr and yr is the 365-day year (8760 h), not the Julian year of
// 365.25 days.
package units
