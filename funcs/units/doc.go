// Package units parses unit strings and converts between units with exact factors.
//
// Every unit has an exact factor to the SI unit of its dimension (energy J, mass kg, volume m3,
// power W, time s, length m, area m2), kept as a *big.Rat and checked in the tests against the
// publication that defines it (SI, NIST SP 811, IEA, the UK Weights and Measures Act 1985,
// 40 CFR 98.6, ISO 13443). The factors are exact decimals, except Nm3 (288.15/273.15 Sm3), which
// List writes as the fraction 1921/1821. Conversion factors between two units are computed
// exactly and rounded to float64 once.
//
// An energy unit may carry a heating-value basis ("MMBtu HHV", "GJ (NCV)"). Units convert
// freely unless both sides declare different bases: going from HHV to NCV depends on the fuel
// and is not a unit conversion.
//
// Spellings that could mean more than one unit ("ton", "MT", "MBtu", "ml", "Mgal", "scm") are
// errors that name the alternatives; the package never guesses.
//
// Case is ignored only where it cannot change an SI prefix or read another SI unit: "mwh" and
// "KWH" are MWh and kWh, but "mWh", "mJ" and "mW" (milli), "pJ", "nm3" and "T" (the tesla) are
// refused with the unit a case-insensitive match would have given (prefix.go).
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
//     A spelling that says imperial or UK ("imperial gallons", "UK gal", "gallon (UK)",
//     "imp gal", "gal (imp)") is gal_imp; a bare gallon ("gal", "gallons", "kgal") is the US
//     gallon, and SpellingNote returns GallonNote for it, for results to carry.
//   - Sm3 is 1 m3 of gas at the ISO 13443 standard reference conditions, 15 °C and 101.325 kPa;
//     Nm3 is 1 m3 at 0 °C and 101.325 kPa, 288.15/273.15 Sm3 for an ideal gas. kSm3, MSm3,
//     kNm3 and MNm3 are 10^3 and 10^6 of them. A gas volume in a unit that states no reference
//     conditions (m3, L) is read as at the standard conditions, i.e. m3 as Sm3: a function that
//     converts one adds GasVolumeNote. Unit.Reference gives the conditions a unit states.
//   - mi is the international mile, 1609.344 m, nmi the nautical mile, 1852 m, ft2 the square
//     foot, 0.09290304 m2 (NIST SP 811); ha is 10^4 m2 (SI Brochure Table 8).
//   - scf is the standard cubic foot, a gas volume at 60 °F and 14.696 psia (40 CFR 98.6). Its
//     factor is the cubic foot, 0.028316846592 m3, so the m3 it converts to is at the same
//     standard conditions; converting scf to Sm3 leaves aside the difference between 60 °F and
//     15 °C (288.706 K against 288.15 K, about 0.19 %). ccf, Mcf, MMcf, Bcf and Tcf are 100,
//     10^3, 10^6, 10^9 and 10^12 scf.
//   - M = 10^3 and MM = 10^6 in US oil, gas and steam usage: Mcf, MMcf, Mbbl, MMbbl, Mlb (= klb,
//     steam billed per thousand pounds), MMlb. kgal is 1000 US gallons. Mgal stays ambiguous
//     (a thousand on some bills, a million in others), like MBtu.
//   - A magnitude word before any unit scales it: "Thousand Barrels" is Mbbl, "Billion Btu" the
//     derived unit "billion Btu", "'000 L" is kL. The words are short-scale (billion = 10^9).
//   - The e, p and th suffixes of power units (MWe, MWp, MWth) are accepted and read as the
//     plain unit (MW).
package units
