package funcs

import (
	"strings"
	"testing"
)

// TestRecordTechNames: technology names of capacity statistics and planning models resolve
// to the IPCC AR5 WG3 Annex III Table A.III.2 technologies (data/tech_names.csv names each
// row's source).
func TestRecordTechNames(t *testing.T) {
	e := newTestEngine(t)
	for name, want := range map[string]string{
		"onshore wind": "wind_onshore", "land-based wind": "wind_onshore", "wind onshore": "wind_onshore",
		"Wind Turbine": "wind_onshore", "Onshore Wind": "wind_onshore", "offshore wind": "wind_offshore",
		"solar photovoltaic": "pv_utility", "Solar PV": "pv_utility", "utility-scale PV": "pv_utility", "UPV": "pv_utility",
		"DUPV": "pv_utility", "rooftop PV": "pv_rooftop", "distributed PV": "pv_rooftop", "solar thermal": "csp", "CSP": "csp",
		"csp-ns": "csp", "combined cycle": "gas_cc", "Combined Cycle": "gas_cc", "natural gas combined cycle": "gas_cc",
		"NGCC": "gas_cc", "gas-CC": "gas_cc", "CCGT": "gas_cc", "Natural Gas Fired Combined Cycle": "gas_cc",
		"conventional steam coal": "coal_pc", "coal": "coal_pc", "pulverized coal": "coal_pc",
		"supercritical coal": "coal_pc", "ultrasupercritical": "coal_pc", "coal-new": "coal_pc",
		"conventional hydroelectric": "hydropower", "hydro": "hydropower", "Hydro": "hydropower",
		"hydropower": "hydropower", "run-of-river": "hydropower", "nuclear": "nuclear", "geothermal": "geothermal",
		"biomass": "biomass_dedicated", "Biomass": "biomass_dedicated", "wood/wood waste biomass": "biomass_dedicated",
		"dedicated biomass": "biomass_dedicated", "biopower": "biomass_dedicated",
		"ocean": "ocean", "tidal": "ocean", "wave": "ocean",
		// resource-class suffixes
		"Onshore Wind Class 5": "wind_onshore", "wind-ons_3": "wind_onshore", "wind-ofs_10": "wind_offshore",
		"upv_7": "pv_utility", "Solar PV - Class 3": "pv_utility", "UPV TRG 4": "pv_utility",
	} {
		id, _, err := e.resolveTech("lifecycle_intensity", name)
		if err != nil || id != want {
			t.Errorf("%q -> %q, %v; want %s", name, id, err, want)
		}
	}
	r := call(t, e, `lifecycle_intensity("wind-ons_3")`)
	if r.Value != 11 || !hasNote(r, `technology "wind-ons_3" read as wind_onshore (ignoring "3")`) {
		t.Errorf("wind-ons_3: %v %q", r.Value, r.Notes)
	}
	if r := call(t, e, `lifecycle_intensity("wind_onshore")`); len(r.Notes) != 0 {
		t.Errorf("an id needs no note: %q", r.Notes)
	}
}

// TestUnmappedTechs: technologies without a life-cycle row are never replaced by another
// one; the message names the accepted technologies.
func TestUnmappedTechs(t *testing.T) {
	e := newTestEngine(t)
	for _, name := range []string{"gas-CT", "Combustion Turbine", "gas combustion turbine", "o-g-s", "battery",
		"Energy Storage", "pumped storage", "pumped-hydro", "coal-IGCC", "Fuel Cell", "Landfill Gas", "lfill-gas", "o-g-s_2"} {
		_, _, err := e.resolveTech("lifecycle_intensity", name)
		fe, ok := AsError(err)
		if !ok || fe.Param != "tech" || !strings.Contains(fe.Msg, "no life-cycle row for technology") ||
			!strings.Contains(fe.Msg, "accepted are biomass_dedicated, coal_pc") {
			t.Errorf("%q: %v", name, err)
		}
	}
	for _, name := range []string{"wind", "Solar", "PV"} {
		if _, _, err := e.resolveTech("lifecycle_intensity", name); err == nil || !strings.Contains(err.Error(), "ambiguous technology") {
			t.Errorf("%q: %v, want ambiguous", name, err)
		}
	}
	if _, _, err := e.resolveTech("embodied", strings.Repeat("wind ", 10000)); err == nil {
		t.Errorf("a paragraph resolved")
	}
}
