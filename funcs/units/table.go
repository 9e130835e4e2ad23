package units

// unitDef declares one unit: its exact factor is factor times the factor of the unit named in
// of (the SI base unit when of is empty).
type unitDef struct {
	sym    string
	name   string
	dim    Dimension
	usual  Basis
	factor string // exact decimal, or a ratio of two exact decimals "288.15/273.15"
	of     string // symbol of an earlier unit of the same dimension; "" for the SI base
	source string
	// ref is the gas reference conditions of a volume unit that states them (Sm3, Nm3, scf):
	// see Unit.Reference. "" for a plain volume or another dimension.
	ref string
	// symExact makes the symbol itself match only as written: "m" must not catch "M".
	symExact bool
	spell    []string // other spellings, matched exactly, then case-insensitively when unique
	// exactOnly spellings are matched only as written: "a" (year) must not catch "A" (ampere).
	exactOnly []string
}

// ambiguity declares spellings that could mean more than one unit. They are matched
// case-insensitively and always fail with the alternatives.
type ambiguity struct {
	spell []string
	note  string // why it is ambiguous, when the alternatives do not say it
	alts  []alt
	// refused is the SI reading of a spelling refused because folding its case would change
	// it ("milliwatt hour" for "mWh"); see prefixTrap.
	refused string
}

// alt is one unit the user could have meant, with a short description.
type alt struct{ sym, desc string }

// unitDefs returns the unit table. Factors are exact by definition; the tests check each one
// against its publication.
func unitDefs() []unitDef {
	const (
		si      = "SI"
		btu     = "NIST SP 811 (Btu IT)"
		calIT   = "NIST SP 811 (cal IT)"
		year365 = "definition (365-day year, 8760 h)"
		// therm: 100 000 Btu IT here; NIST SP 811's US therm is 1.054804e8 J, about 0.02 % lower.
		therm = "definition (100 000 Btu IT)"
		scf   = "NIST SP 811 (ft3); standard conditions per 40 CFR 98.6"
		// M = 10^3 and MM = 10^6 in US oil and gas usage, as defined in SEC Form 10-K
		// glossaries (e.g. Kosmos Energy 2013 10-K: MBbl thousand barrels, MMcf million cubic
		// feet); B = 10^9 and T = 10^12 follow the same usage (common practice).
		oilGas = "US oil and gas usage: M = 10^3, MM = 10^6 (SEC Form 10-K glossaries)"
		bt     = "US oil and gas and EIA usage: B = 10^9, T = 10^12 (common practice)"
		// Steam is billed per thousand pounds, written Mlb (City of Duluth Resolution
		// 06-0351R: "per thousand pounds of steam (Mlbs)") or klb.
		steam = "NIST SP 811 (lb); US steam billing: Mlb = klb = 1000 lb (City of Duluth Resolution 06-0351R)"
		// Gas reference conditions (see Unit.Reference).
		isoRef = "ISO 13443 (standard reference conditions 15 °C, 101.325 kPa)"
		normal = "normal conditions 0 °C, 101.325 kPa (common practice); ideal gas: 1 Nm3 = 288.15/273.15 Sm3"
		sm3Ref = StandardReference
		nm3Ref = "0 °C, 101.325 kPa (normal conditions)"
		scfRef = "60 °F, 14.696 psia (40 CFR 98.6)"
	)
	e, m, v, p, t, l, ar := Energy, Mass, Volume, Power, Time, Length, Area
	return []unitDef{
		// Energy, SI base J.
		{sym: "J", name: "joule", dim: e, factor: "1", source: si, spell: []string{"joule", "joules"}},
		{sym: "kJ", name: "kilojoule", dim: e, factor: "1e3", of: "J", source: si, spell: []string{"kilojoule", "kilojoules"}},
		{sym: "MJ", name: "megajoule", dim: e, factor: "1e6", of: "J", source: si, spell: []string{"megajoule", "megajoules"}},
		{sym: "GJ", name: "gigajoule", dim: e, factor: "1e9", of: "J", source: si, spell: []string{"gigajoule", "gigajoules"}},
		{sym: "TJ", name: "terajoule", dim: e, factor: "1e12", of: "J", source: si, spell: []string{"terajoule", "terajoules"}},
		{sym: "PJ", name: "petajoule", dim: e, factor: "1e15", of: "J", source: si, spell: []string{"petajoule", "petajoules"}},
		{sym: "EJ", name: "exajoule", dim: e, factor: "1e18", of: "J", source: si, spell: []string{"exajoule", "exajoules"}},
		{sym: "Wh", name: "watt hour", dim: e, factor: "3600", of: "J", source: si, spell: []string{"W·h", "watt hour", "watt hours", "watt-hour", "watt-hours", "watthour", "watthours"}},
		{sym: "kWh", name: "kilowatt hour", dim: e, factor: "1e3", of: "Wh", source: si, spell: []string{"kW·h", "kilowatt hour", "kilowatt hours", "kilowatt-hour", "kilowatt-hours", "kilowatthour", "kilowatthours"}},
		{sym: "MWh", name: "megawatt hour", dim: e, factor: "1e6", of: "Wh", source: si, spell: []string{"MW·h", "megawatt hour", "megawatt hours", "megawatt-hour", "megawatt-hours", "megawatthour", "megawatthours"}},
		{sym: "GWh", name: "gigawatt hour", dim: e, factor: "1e9", of: "Wh", source: si, spell: []string{"GW·h", "gigawatt hour", "gigawatt hours", "gigawatt-hour", "gigawatt-hours", "gigawatthour", "gigawatthours"}},
		{sym: "TWh", name: "terawatt hour", dim: e, factor: "1e12", of: "Wh", source: si, spell: []string{"TW·h", "terawatt hour", "terawatt hours", "terawatt-hour", "terawatt-hours", "terawatthour", "terawatthours"}},
		// A watt for a 365-day year: 31 536 000 J (the Julian year would give 31 557 600 J).
		{sym: "Wyr", name: "watt year (365-day year)", dim: e, factor: "31536000", of: "J", source: year365, spell: []string{"W·yr", "W-yr", "watt year", "watt years"}},
		{sym: "kWyr", name: "kilowatt year (365-day year)", dim: e, factor: "1e3", of: "Wyr", source: year365, spell: []string{"kW·yr", "kW-yr", "kilowatt year", "kilowatt years"}},
		{sym: "MWyr", name: "megawatt year (365-day year)", dim: e, factor: "1e6", of: "Wyr", source: year365, spell: []string{"MW·yr", "MW-yr", "megawatt year", "megawatt years"}},
		{sym: "GWyr", name: "gigawatt year (365-day year)", dim: e, factor: "1e9", of: "Wyr", source: year365, spell: []string{"GW·yr", "GW-yr", "gigawatt year", "gigawatt years"}},
		{sym: "TWyr", name: "terawatt year (365-day year)", dim: e, factor: "1e12", of: "Wyr", source: year365, spell: []string{"TW·yr", "TW-yr", "terawatt year", "terawatt years"}},
		{sym: "Btu", name: "British thermal unit (International Table)", dim: e, usual: HHV, factor: "1055.05585262", of: "J", source: btu, spell: []string{"British thermal unit", "British thermal units", "Btu_IT"}},
		{sym: "kBtu", name: "thousand Btu", dim: e, usual: HHV, factor: "1e3", of: "Btu", source: btu, spell: []string{"thousand Btu"}},
		{sym: "MMBtu", name: "million Btu", dim: e, usual: HHV, factor: "1e6", of: "Btu", source: btu, spell: []string{"mmBtu", "MMbtu", "million Btu"}},
		{sym: "TBtu", name: "trillion Btu", dim: e, usual: HHV, factor: "1e12", of: "Btu", source: btu + "; " + bt, spell: []string{"trillion Btu"}},
		{sym: "therm", name: "therm (100 000 Btu)", dim: e, usual: HHV, factor: "1e5", of: "Btu", source: therm, spell: []string{"therms", "thm"}},
		{sym: "Dth", name: "dekatherm", dim: e, usual: HHV, factor: "10", of: "therm", source: therm, spell: []string{"dekatherm", "dekatherms", "decatherm", "decatherms"}},
		{sym: "quad", name: "quad (10^15 Btu)", dim: e, usual: HHV, factor: "1e15", of: "Btu", source: btu, spell: []string{"quads", "quadrillion Btu"}},
		{sym: "toe", name: "tonne of oil equivalent", dim: e, factor: "41.868e9", of: "J", source: "IEA (toe)", spell: []string{"tonne of oil equivalent", "tonnes of oil equivalent"}},
		{sym: "ktoe", name: "thousand tonnes of oil equivalent", dim: e, factor: "1e3", of: "toe", source: "IEA (toe)", spell: []string{"thousand tonnes of oil equivalent"}},
		{sym: "Mtoe", name: "million tonnes of oil equivalent", dim: e, factor: "1e6", of: "toe", source: "IEA (toe)", spell: []string{"million tonnes of oil equivalent"}},
		{sym: "tce", name: "tonne of coal equivalent", dim: e, factor: "29.3076e9", of: "J", source: "IEA/UN (tce)", spell: []string{"tonne of coal equivalent", "tonnes of coal equivalent"}},
		{sym: "ktce", name: "thousand tonnes of coal equivalent", dim: e, factor: "1e3", of: "tce", source: "IEA/UN (tce)", spell: []string{"thousand tonnes of coal equivalent"}},
		{sym: "Mtce", name: "million tonnes of coal equivalent", dim: e, factor: "1e6", of: "tce", source: "IEA/UN (tce)", spell: []string{"million tonnes of coal equivalent"}},
		{sym: "kcal", name: "kilocalorie (International Table)", dim: e, factor: "4186.8", of: "J", source: calIT, spell: []string{"kcal_IT", "kilocalorie", "kilocalories"}},
		{sym: "Mcal", name: "megacalorie (International Table)", dim: e, factor: "1e3", of: "kcal", source: calIT, spell: []string{"Mcal_IT", "megacalorie", "megacalories"}},
		{sym: "Gcal", name: "gigacalorie (International Table)", dim: e, factor: "1e6", of: "kcal", source: calIT, spell: []string{"Gcal_IT", "gigacalorie", "gigacalories"}},

		// Mass, SI base kg.
		{sym: "g", name: "gram", dim: m, factor: "0.001", of: "", source: si, spell: []string{"gram", "grams"}},
		{sym: "kg", name: "kilogram", dim: m, factor: "1", source: si, spell: []string{"kilogram", "kilograms", "kgs"}},
		{sym: "t", name: "tonne", dim: m, factor: "1000", source: si, spell: []string{"tonne", "tonnes", "metric ton", "metric tons", "metric tonne", "metric tonnes", "Mg"}},
		{sym: "kt", name: "kilotonne", dim: m, factor: "1e3", of: "t", source: si, spell: []string{"kilotonne", "kilotonnes", "Gg"}},
		{sym: "Mt", name: "megatonne", dim: m, factor: "1e6", of: "t", source: si, spell: []string{"megatonne", "megatonnes", "Tg"}},
		{sym: "Gt", name: "gigatonne", dim: m, factor: "1e9", of: "t", source: si, spell: []string{"gigatonne", "gigatonnes", "Pg"}},
		{sym: "lb", name: "pound (avoirdupois)", dim: m, factor: "0.45359237", source: "NIST SP 811 (lb)", spell: []string{"lbs", "pound", "pounds"}},
		{sym: "klb", name: "thousand pounds", dim: m, factor: "1e3", of: "lb", source: steam, spell: []string{"klbs", "kLbs", "Mlb", "Mlbs", "thousand pounds"}},
		{sym: "MMlb", name: "million pounds", dim: m, factor: "1e6", of: "lb", source: steam + "; MM = 10^6", spell: []string{"MMlbs", "million pounds"}},
		{sym: "short_ton", name: "short ton (2000 lb)", dim: m, factor: "2000", of: "lb", source: "NIST SP 811 (ton, short)", spell: []string{"short ton", "short tons", "short_tons", "US ton", "US tons"}},
		{sym: "long_ton", name: "long ton (2240 lb)", dim: m, factor: "2240", of: "lb", source: "NIST SP 811 (ton, long)", spell: []string{"long ton", "long tons", "long_tons"}},

		// Volume, SI base m3.
		{sym: "m3", name: "cubic metre", dim: v, factor: "1", source: si, spell: []string{"m³", "m^3", "cubic metre", "cubic metres", "cubic meter", "cubic meters"}},
		{sym: "L", name: "litre", dim: v, factor: "0.001", source: si, spell: []string{"l", "litre", "litres", "liter", "liters", "ltr", "ltrs", "lts"}},
		{sym: "mL", name: "millilitre", dim: v, factor: "0.001", of: "L", source: si, spell: []string{"millilitre", "millilitres", "milliliter", "milliliters"}},
		{sym: "kL", name: "kilolitre", dim: v, factor: "1e3", of: "L", source: si, spell: []string{"kilolitre", "kilolitres", "kiloliter", "kiloliters"}},
		{sym: "ML", name: "megalitre", dim: v, factor: "1e6", of: "L", source: si, spell: []string{"megalitre", "megalitres", "megaliter", "megaliters"}},
		{sym: "gal", name: "US gallon", dim: v, factor: "3.785411784", of: "L", source: "NIST SP 811 (gallon, US)", spell: []string{"gallon", "gallons", "gals", "US gal", "gal (US)", "USG", "US gallon", "US gallons"}, exactOnly: []string{"GA", "Ga", "ga"}},
		// Water and fuel utilities bill in thousands of gallons, written kgal (common practice).
		{sym: "kgal", name: "thousand US gallons", dim: v, factor: "1e3", of: "gal", source: "NIST SP 811 (gallon, US); k = 10^3 (common practice)", spell: []string{"kgals", "thousand gallons"}},
		// A gallon is read as imperial only when the spelling says so; a bare gallon is the US
		// gallon, and SpellingNote says so.
		{sym: "gal_imp", name: "imperial gallon", dim: v, factor: "4.54609", of: "L", source: "UK Weights and Measures Act 1985",
			spell: []string{"imperial gallon", "imperial gallons", "imperial gal", "imp gal", "imp. gal", "imp gallon", "imp gallons",
				"gal (imp)", "gal (UK)", "gallon (UK)", "gallons (UK)", "gallon (imperial)", "gallons (imperial)",
				"UK gallon", "UK gallons", "UK gal", "gal_UK"}},
		{sym: "bbl", name: "barrel (42 US gallons)", dim: v, factor: "42", of: "gal", source: "NIST SP 811 (barrel, petroleum)", spell: []string{"barrel", "barrels", "bbls"}},
		{sym: "Mbbl", name: "thousand barrels", dim: v, factor: "1e3", of: "bbl", source: oilGas, spell: []string{"MBbl", "MBBL", "Mbbls", "thousand barrels"}},
		{sym: "MMbbl", name: "million barrels", dim: v, factor: "1e6", of: "bbl", source: oilGas, spell: []string{"MMBbl", "MMBBL", "MMbbls", "million barrels"}},
		// The standard cubic foot is the gas volume at 60 °F and 14.696 psia (40 CFR 98.6); its
		// factor is the cubic foot, so the m3 it converts to is at the same standard conditions.
		// "Cubic feet" alone is not read as scf: only standard cubic feet, or the gas trade's
		// Mcf, MMcf and their spelled forms ("Million cubic feet"), imply standard conditions.
		{sym: "scf", name: "standard cubic foot (60 °F, 14.696 psia)", dim: v, factor: "0.028316846592", source: scf, ref: scfRef, spell: []string{"standard cubic foot", "standard cubic feet"}},
		// C = 100 (Roman numeral), as on US gas bills (common practice).
		{sym: "ccf", name: "hundred standard cubic feet", dim: v, factor: "100", of: "scf", source: scf + "; C = 100 (common practice)", ref: scfRef, spell: []string{"hundred cubic feet"}},
		{sym: "Mcf", name: "thousand standard cubic feet", dim: v, factor: "1e3", of: "scf", source: scf + "; " + oilGas, ref: scfRef, spell: []string{"Mscf", "thousand cubic feet"}},
		{sym: "MMcf", name: "million standard cubic feet", dim: v, factor: "1e6", of: "scf", source: scf + "; " + oilGas, ref: scfRef, spell: []string{"MMscf", "million cubic feet"}},
		{sym: "Bcf", name: "billion standard cubic feet", dim: v, factor: "1e9", of: "scf", source: scf + "; " + bt, ref: scfRef, spell: []string{"billion cubic feet"}},
		{sym: "Tcf", name: "trillion standard cubic feet", dim: v, factor: "1e12", of: "scf", source: scf + "; " + bt, ref: scfRef, spell: []string{"trillion cubic feet"}},

		// Gas volumes at reference conditions. Sm3 is 1 m3 of gas at the standard reference
		// conditions of ISO 13443, 15 °C and 101.325 kPa, so a plain m3 of gas is an Sm3 (see
		// GasVolumeNote). Nm3 is 1 m3 at 0 °C and 101.325 kPa: the same amount of an ideal gas
		// fills 288.15/273.15 m3 at 15 °C. Real gases differ slightly; the ratio is exact for an
		// ideal gas only. k = 10^3 and M = 10^6 (SI prefixes, as in the European gas trade).
		{sym: "Sm3", name: "standard cubic metre (15 °C, 101.325 kPa)", dim: v, factor: "1", of: "m3", source: isoRef, ref: sm3Ref, spell: []string{"Sm³", "Sm^3", "standard m3", "standard m³", "standard cubic metre", "standard cubic metres", "standard cubic meter", "standard cubic meters"}},
		{sym: "kSm3", name: "thousand standard cubic metres", dim: v, factor: "1e3", of: "Sm3", source: isoRef + "; SI prefix k", ref: sm3Ref, spell: []string{"kSm³"}},
		{sym: "MSm3", name: "million standard cubic metres", dim: v, factor: "1e6", of: "Sm3", source: isoRef + "; SI prefix M", ref: sm3Ref, spell: []string{"MSm³"}},
		{sym: "Nm3", name: "normal cubic metre (0 °C, 101.325 kPa)", dim: v, factor: "288.15/273.15", of: "Sm3", source: normal, ref: nm3Ref, spell: []string{"Nm³", "Nm^3", "normal m3", "normal m³", "normal cubic metre", "normal cubic metres", "normal cubic meter", "normal cubic meters"}},
		{sym: "kNm3", name: "thousand normal cubic metres", dim: v, factor: "1e3", of: "Nm3", source: normal + "; SI prefix k", ref: nm3Ref, spell: []string{"kNm³"}},
		{sym: "MNm3", name: "million normal cubic metres", dim: v, factor: "1e6", of: "Nm3", source: normal + "; SI prefix M", ref: nm3Ref, spell: []string{"MNm³"}},

		// Power, SI base W. The e (electric), p (peak) and th (thermal) suffixes say what is
		// measured, not a different unit.
		{sym: "W", name: "watt", dim: p, factor: "1", source: si, spell: []string{"watt", "watts"}},
		{sym: "kW", name: "kilowatt", dim: p, factor: "1e3", source: si, spell: []string{"kWe", "kWp", "kWth", "kilowatt", "kilowatts"}},
		{sym: "MW", name: "megawatt", dim: p, factor: "1e6", source: si, spell: []string{"MWe", "MWp", "MWth", "megawatt", "megawatts"}},
		{sym: "GW", name: "gigawatt", dim: p, factor: "1e9", source: si, spell: []string{"GWe", "GWp", "GWth", "gigawatt", "gigawatts"}},
		{sym: "TW", name: "terawatt", dim: p, factor: "1e12", source: si, spell: []string{"terawatt", "terawatts"}},

		// Time, SI base s.
		{sym: "s", name: "second", dim: t, factor: "1", source: si, spell: []string{"sec", "secs", "second", "seconds"}},
		{sym: "min", name: "minute", dim: t, factor: "60", source: si, spell: []string{"mins", "minute", "minutes"}},
		{sym: "h", name: "hour", dim: t, factor: "3600", source: si, spell: []string{"hr", "hrs", "hour", "hours"}},
		{sym: "d", name: "day", dim: t, factor: "86400", source: si, spell: []string{"day", "days"}},
		{sym: "yr", name: "year (365 days)", dim: t, factor: "365", of: "d", source: year365, spell: []string{"year", "years"}, exactOnly: []string{"a"}},

		// Length, SI base m. "M" is no spelling of the metre (it is a prefix, and a thousand
		// in US oil and gas usage).
		{sym: "m", name: "metre", dim: l, factor: "1", source: si, symExact: true, spell: []string{"metre", "metres", "meter", "meters"}},
		{sym: "km", name: "kilometre", dim: l, factor: "1e3", of: "m", source: si, spell: []string{"kilometre", "kilometres", "kilometer", "kilometers", "kms"}},
		{sym: "mi", name: "mile (international)", dim: l, factor: "1609.344", of: "m", source: "NIST SP 811 (mile, international)", spell: []string{"mile", "miles", "international mile", "international miles"}},
		{sym: "nmi", name: "nautical mile", dim: l, factor: "1852", of: "m", source: "NIST SP 811 (nautical mile); SI Brochure Table 8", spell: []string{"nautical mile", "nautical miles"}},

		// Area, SI base m2.
		{sym: "m2", name: "square metre", dim: ar, factor: "1", source: si, spell: []string{"m²", "m^2", "sq m", "sqm", "square metre", "square metres", "square meter", "square meters"}},
		{sym: "ft2", name: "square foot", dim: ar, factor: "0.09290304", of: "m2", source: "NIST SP 811 (square foot)", spell: []string{"ft²", "ft^2", "sq ft", "sqft", "sq. ft.", "square foot", "square feet"}},
		{sym: "ha", name: "hectare", dim: ar, factor: "1e4", of: "m2", source: "SI Brochure Table 8 (hectare = 10^4 m2)", spell: []string{"hectare", "hectares"}},
		{sym: "km2", name: "square kilometre", dim: ar, factor: "1e6", of: "m2", source: si, spell: []string{"km²", "km^2", "sq km", "square kilometre", "square kilometres", "square kilometer", "square kilometers"}},
	}
}

// ambiguities returns the spellings that are errors because they could mean several units.
func ambiguities() []ambiguity {
	tonne := alt{"t", "tonne, 1000 kg"}
	return []ambiguity{
		{spell: []string{"ton", "tons"}, alts: []alt{tonne, {"short_ton", "2000 lb"}, {"long_ton", "2240 lb"}}},
		{spell: []string{"MT"}, alts: []alt{tonne, {"Mt", "megatonne, 1e9 kg"}}},
		{spell: []string{"MBtu"}, alts: []alt{{"kBtu", "thousand Btu"}, {"MMBtu", "million Btu"}}},
		{spell: []string{"mg"}, note: "milligram is not supported and megagram is t",
			alts: []alt{tonne, {"g", "gram"}}},
		{spell: []string{"ml"}, alts: []alt{{"mL", "millilitre"}, {"ML", "megalitre"}}},
		// USGS water-use reports write Mgal for a million gallons; many utilities write it for a
		// thousand (from memory).
		{spell: []string{"Mgal", "Mgals"}, note: "M means a thousand on some bills and a million in others",
			alts: []alt{{"kgal", "thousand US gallons"}, {"million gal", "million US gallons"}}},
		{spell: []string{"cal", "calorie", "calories"}, note: "the calorie has several definitions",
			alts: []alt{{"kcal", "International Table calorie"}, {"J", "joule"}}},
		{spell: []string{"lt", "LT"}, alts: []alt{{"L", "litre"}, {"long_ton", "2240 lb"}}},
		// 40 CFR 60.2 defines scm at 20 °C and 101.325 kPa (from memory); elsewhere scm is the
		// ISO 13443 standard cubic metre.
		{spell: []string{"scm", "SCM"}, note: "standard cubic metre at 15 °C (ISO 13443) or at 20 °C (US EPA)",
			alts: []alt{{"Sm3", "standard cubic metre, 15 °C, 101.325 kPa"}, {"Nm3", "normal cubic metre, 0 °C, 101.325 kPa"}}},
	}
}
