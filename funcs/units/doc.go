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
// Definitions worth knowing:
//   - Wyr…TWyr and yr use the 365-day year (8760 h): 1 Wyr = 31 536 000 J. The Julian year
//     (365.25 days) would give 31 557 600 J.
//   - Btu is the International Table Btu, 1055.05585262 J (NIST SP 811). therm is defined here
//     as 100 000 Btu = 105 505 585.262 J; NIST's US therm, 1.054804e8 J, is about 0.02 % lower.
//     Dth = 10 therm = MMBtu; quad = 10^15 Btu. The Btu family is usually stated on HHV in
//     North American practice (common practice): see Unit.Usual.
//   - kcal, Mcal and Gcal use the International Table calorie, 4.1868 J (NIST SP 811).
//   - toe = 41.868 GJ (IEA); tce = 29.3076 GJ (IEA/UN).
//   - gal is the US gallon, 3.785411784 L; gal_imp the imperial gallon, 4.54609 L; bbl = 42 gal.
//   - scf is the standard cubic foot, a gas volume at 60 °F and 14.696 psia (40 CFR 98.6). Its
//     factor is the cubic foot, 0.028316846592 m3, so the m3 it converts to is at the same
//     standard conditions. ccf, Mcf, MMcf, Bcf and Tcf are 100, 10^3, 10^6, 10^9 and 10^12 scf.
//   - M = 10^3 and MM = 10^6 in US oil, gas and steam usage: Mcf, MMcf, Mbbl, MMbbl, Mlb (= klb,
//     steam billed per thousand pounds), MMlb. kgal is 1000 US gallons. Mgal stays ambiguous
//     (a thousand on some bills, a million in others), like MBtu.
//   - A magnitude word before any unit scales it: "Thousand Barrels" is Mbbl, "Billion Btu" the
//     derived unit "billion Btu", "'000 L" is kL. The words are short-scale (billion = 10^9).
//   - The e, p and th suffixes of power units (MWe, MWp, MWth) are accepted and read as the
//     plain unit (MW).
package units
