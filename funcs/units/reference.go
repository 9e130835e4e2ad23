package units

// Gas volumes depend on temperature and pressure, so a gas volume unit may state the reference
// conditions it is measured at: Sm3 at 15 °C and 101.325 kPa (ISO 13443), Nm3 at 0 °C and
// 101.325 kPa, scf at 60 °F and 14.696 psia (40 CFR 98.6). A plain volume (m3, L, gal) states
// none; where a function converts such a volume of gas it reads it at the ISO 13443 standard
// reference conditions, i.e. m3 as Sm3, and says so with GasVolumeNote.
//
// Conversions between these units take the factors of the table: Nm3 to Sm3 is the ideal-gas
// ratio 288.15/273.15, while scf to m3 (and so to Sm3) is the cubic foot, 0.028316846592 m3,
// which leaves aside the 60 °F against 15 °C difference (288.706 K against 288.15 K, about
// 0.19 %).

// StandardReference is the gas reference conditions of ISO 13443, at which a gas volume given
// in a unit without reference conditions (m3, L) is read.
const StandardReference = "15 °C, 101.325 kPa (ISO 13443)"

// Reference returns the gas reference conditions a volume unit states: StandardReference for
// Sm3, kSm3 and MSm3; "0 °C, 101.325 kPa (normal conditions)" for Nm3, kNm3 and MNm3;
// "60 °F, 14.696 psia (40 CFR 98.6)" for scf, ccf, Mcf, MMcf, Bcf and Tcf; "" for any other
// unit (m3, L, gal, or a unit of another dimension) and for the zero Unit.
func (u Unit) Reference() string {
	if !table.known(u) {
		return ""
	}
	return table.ref[u.id]
}

// GasVolumeNote returns the note a function adds to its result when it converts an amount of
// gas given in u: for a volume unit that states no reference conditions, e.g.
//
//	gas volume in m3 read at standard reference conditions 15 °C, 101.325 kPa (ISO 13443); write Nm3 for 0 °C
//
// and "" for a unit that states them (Sm3, Nm3, scf) or that is not a volume.
func GasVolumeNote(u Unit) string {
	if u.Dim != Volume || !table.known(u) || table.ref[u.id] != "" {
		return ""
	}
	return "gas volume in " + u.Symbol + " read at standard reference conditions " + StandardReference +
		"; write Nm3 for 0 °C"
}
