#!/usr/bin/env python3
"""Reference CO2 totals for the real-world corpus, computed without fluecell.

For every file this script reads the activity data the way a careful analyst
would (which rows, which columns, which fuel, which unit), converts it to
energy on a net-calorific-value basis and applies the IPCC 2006 default CO2
emission factors. It prints the activity sums and the resulting tonnes of
fossil CO2 so that every number in expect.csv and devset.csv can be
reproduced.

    python3 reference.py                       # the files in this folder
    python3 reference.py --devset DIR          # also the development set in DIR
    python3 reference.py --write [--devset DIR]  # rewrite expect.csv (and devset.csv)

Only the standard library and openpyxl are used. Legacy .xls files are read
after a one-off conversion with LibreOffice (soffice --headless).

Published values (see /work/shared/REFERENCES.md for the table):
  IPCC 2006 Guidelines Vol 2 Ch 1 Table 1.2 (NCV, TJ/Gg) and Table 1.4
  (CO2 EF, kg CO2/TJ on a NCV basis); US EPA GHG Emission Factors Hub /
  40 CFR 98 Table C-1 for the heat content of natural gas (1.026 mmBtu/Mcf, HHV).
Conventions (stated in the brief; ratios from memory):
  Btu, MMBtu, therm and quad quantities are gross (HHV); NCV = 0.90 x GCV
  for natural gas and 0.95 x GCV for oil and coal (IPCC 2006 Vol 2 Ch 1 1.4.1).
  Energy in SI units (J, Wh) with no stated basis is taken as NCV.
Densities (kg/m3 at 15 C): motor gasoline 747.5 and gas/diesel oil 832.5
  (EN 228 / EN 590 midpoints, from memory); jet and other kerosene 800,
  residual fuel oil 980, LPG/propane 508, petroleum coke 1141 (EIA's
  5 barrels per short ton) - all from memory / common practice.
"""

import argparse
import csv
import glob
import os
import shutil
import subprocess
import sys
import tempfile

import openpyxl

# IPCC 2006 Vol 2 Ch 1: NCV (TJ/Gg) from Table 1.2, CO2 EF (kg CO2/TJ) from Table 1.4.
IPCC = {
    "motor_gasoline": (44.3, 69300),
    "jet_kerosene": (44.1, 71500),
    "other_kerosene": (43.8, 71900),
    "gas_diesel_oil": (43.0, 74100),
    "residual_fuel_oil": (40.4, 77400),
    "lpg": (47.3, 63100),
    "natural_gas": (48.0, 56100),
    "coking_coal": (28.2, 94600),
    "other_bituminous_coal": (25.8, 94600),
    "petroleum_coke": (32.5, 97500),
}

# Assumed densities, kg/m3 (see the module doc for their status).
DENSITY = {
    "motor_gasoline": 747.5,
    "gas_diesel_oil": 832.5,
    "jet_kerosene": 800.0,
    "other_kerosene": 800.0,
    "residual_fuel_oil": 980.0,
    "lpg": 508.0,
    "petroleum_coke": 907.18474 / (5 * 0.158987294928),
}

# NCV/GCV ratios by fuel family (IPCC 2006 Vol 2 Ch 1 1.4.1, from memory).
NCV_PER_GCV = {"natural_gas": 0.90}
DEFAULT_NCV_PER_GCV = 0.95

BTU_J = 1055.05585262          # NIST SP 811
US_GAL_M3 = 3.785411784e-3
BBL_M3 = 42 * US_GAL_M3
SHORT_TON_T = 0.90718474
NG_MMBTU_PER_MCF = 1.026       # 40 CFR 98 Table C-1 (HHV)


def ncv_ratio(fuel):
    return NCV_PER_GCV.get(fuel, DEFAULT_NCV_PER_GCV)


def tco2_from_tj_ncv(fuel, tj):
    """Tonnes CO2 from energy in TJ on a NCV basis."""
    return tj * IPCC[fuel][1] / 1000.0


def tco2_from_mass_t(fuel, tonnes):
    """Tonnes CO2 from a mass in tonnes (NCV from Table 1.2)."""
    return tco2_from_tj_ncv(fuel, tonnes / 1000.0 * IPCC[fuel][0])


def tco2_from_volume_m3(fuel, m3):
    return tco2_from_mass_t(fuel, m3 * DENSITY[fuel] / 1000.0)


def tco2_from_btu_gross(fuel, btu):
    return tco2_from_tj_ncv(fuel, btu * BTU_J / 1e12 * ncv_ratio(fuel))


def tco2_from_scf(scf):
    """Natural gas volume: 1.026 mmBtu/Mcf (HHV), then NCV = 0.9 x GCV."""
    return tco2_from_btu_gross("natural_gas", scf / 1000.0 * NG_MMBTU_PER_MCF * 1e6)


UNITS = {
    # unit -> (kind, factor to the base of that kind): btu, m3, t, scf, j
    "Btu": ("btu", 1.0), "MMBtu": ("btu", 1e6), "BBtu": ("btu", 1e9),
    "TBtu": ("btu", 1e12), "quad": ("btu", 1e15), "therm": ("btu", 1e5),
    "gal": ("m3", US_GAL_M3), "bbl": ("m3", BBL_M3), "kbbl": ("m3", 1000 * BBL_M3),
    "t": ("t", 1.0), "kt_short": ("t", 1000 * SHORT_TON_T), "Mt": ("t", 1e6),
    "scf": ("scf", 1.0), "Mcf": ("scf", 1e3), "CCF": ("scf", 100.0), "MMcf": ("scf", 1e6),
    "GWh": ("j", 3.6e12), "kWh": ("j", 3.6e6),
}


def tco2(fuel, amount, unit):
    """Tonnes of fossil CO2 for amount of fuel in unit (see UNITS)."""
    kind, f = UNITS[unit]
    x = amount * f
    if kind == "btu":
        return tco2_from_btu_gross(fuel, x)
    if kind == "m3":
        return tco2_from_volume_m3(fuel, x)
    if kind == "t":
        return tco2_from_mass_t(fuel, x)
    if kind == "scf":
        assert fuel == "natural_gas"
        return tco2_from_scf(x)
    if kind == "j":
        return tco2_from_tj_ncv(fuel, x / 1e12)
    raise ValueError(unit)


class Ref:
    """The reference for one file: activity sums by (fuel, unit) and rows."""

    def __init__(self):
        self.rows = 0
        self.act = {}

    def add(self, fuel, amount, unit):
        key = (fuel, unit)
        self.act[key] = self.act.get(key, 0.0) + amount

    def total(self):
        return sum(tco2(f, a, u) for (f, u), a in self.act.items())

    def working(self):
        parts = []
        for (f, u), a in sorted(self.act.items()):
            parts.append("%s %.6g %s x %s / 1000 = %.6g t" % (f, a, u, chain(f, u), tco2(f, a, u)))
        return "; ".join(parts)


def chain(fuel, unit):
    """The conversion from one unit of fuel to kg CO2, spelled out."""
    kind, f = UNITS[unit]
    ncv, ef = IPCC[fuel]
    efgj = "%g kg/GJ" % (ef / 1000.0)
    if kind == "btu":
        return "%.6g GJ x %.2f NCV/GCV x %s" % (f * BTU_J / 1e9, ncv_ratio(fuel), efgj)
    if kind == "m3":
        return "%.6g m3 x %g t/m3 x %g GJ/t x %s" % (f, DENSITY[fuel] / 1000, ncv, efgj)
    if kind == "t":
        return "%g t x %g GJ/t x %s" % (f, ncv, efgj)
    if kind == "scf":
        return "%g scf x 1026 Btu/scf (HHV) x %.6g GJ/Btu x 0.90 NCV/GCV x %s" % (f, BTU_J / 1e9, efgj)
    return "%g GJ (NCV) x %s" % (f / 1e9, efgj)


def num(v):
    """A cell as a float, or None (text such as 'Not Available', '--', '')."""
    if isinstance(v, bool):
        return None
    if isinstance(v, (int, float)):
        return float(v)
    if isinstance(v, str):
        s = v.strip().replace(",", "")
        try:
            return float(s)
        except ValueError:
            return None
    return None


_XLS_CACHE = {}


def open_book(path):
    """openpyxl workbook (values) for .xlsx, or for .xls via LibreOffice."""
    if path.lower().endswith(".xls"):
        if path not in _XLS_CACHE:
            out = tempfile.mkdtemp(prefix="refxls")
            soffice = shutil.which("soffice") or shutil.which("libreoffice")
            if not soffice:
                sys.exit("reading %s needs LibreOffice (soffice)" % path)
            subprocess.run([soffice, "--headless", "--convert-to", "xlsx", "--outdir", out, path],
                           check=True, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
            _XLS_CACHE[path] = glob.glob(os.path.join(out, "*.xlsx"))[0]
        path = _XLS_CACHE[path]
    return openpyxl.load_workbook(path, read_only=True, data_only=True)


# ---------------------------------------------------------------- new corpus

def aer_t8_4c(path):
    """EIA AER Table 8.4c: coal (B) and natural gas (F), Billion Btu, 2 sectors."""
    r = Ref()
    ws = open_book(path).active
    for row in ws.iter_rows(min_row=10, max_row=63, values_only=True):
        if not isinstance(row[0], int):
            continue
        coal, gas = num(row[1]), num(row[5])
        if coal is None and gas is None:
            continue
        r.rows += 1
        if coal is not None:
            r.add("other_bituminous_coal", coal, "BBtu")
        if gas is not None:
            r.add("natural_gas", gas, "BBtu")
    return r


def farm_energy(path):
    """Farm energy use, sheet 'Ag Cons by Use' rows 6-45, Trillion Btu."""
    r = Ref()
    ws = open_book(path)["Ag Cons by Use"]
    fuels = ["motor_gasoline", "gas_diesel_oil", "lpg", "natural_gas"]
    for row in ws.iter_rows(min_row=6, max_row=45, values_only=True):
        vals = [num(v) for v in row[1:5]]
        if not isinstance(row[0], int) or all(v is None for v in vals):
            continue
        r.rows += 1
        for f, v in zip(fuels, vals):
            if v is not None:
                r.add(f, v, "TBtu")
    return r


def weekly_product_supplied(path):
    """Weekly product supplied, thousand barrels per day: x 7 days per week."""
    r = Ref()
    ws = open_book(path)["Data 1"]
    # B total (skipped: sum), C gasoline, D jet, E distillate, F residual,
    # G propane/propylene, H other oils (skipped: unspecified).
    fuels = {2: "motor_gasoline", 3: "jet_kerosene", 4: "gas_diesel_oil", 5: "residual_fuel_oil", 6: "lpg"}
    for row in ws.iter_rows(min_row=4, values_only=True):
        vals = {i: num(row[i]) for i in fuels if i < len(row)}
        if all(v is None for v in vals.values()):
            continue
        r.rows += 1
        for i, v in vals.items():
            if v is not None:
                r.add(fuels[i], v * 7, "kbbl")
    return r


def eia_series_csv(path):
    """EIA browser CSV: 4 preamble lines, header, 'Month,value' in MMcf."""
    r = Ref()
    with open(path, newline="") as f:
        rows = list(csv.reader(f))
    for row in rows[5:]:
        if len(row) >= 2 and num(row[1]) is not None:
            r.rows += 1
            r.add("natural_gas", num(row[1]), "MMcf")
    return r


MER_COAL_LEAVES = {
    "CLRCPUS": "other_bituminous_coal", "CLC3PUS": "other_bituminous_coal",
    "CLC4PUS": "other_bituminous_coal", "CLKCPUS": "coking_coal",
    "CLI3PUS": "other_bituminous_coal", "CLI4PUS": "other_bituminous_coal",
    "CLACPUS": "other_bituminous_coal", "CLEIPUS": "other_bituminous_coal",
}


def mer_t6_2(path):
    """MER Table 6.2, annual (YYYY13) rows of the leaf sectors, thousand short tons."""
    r = Ref()
    with open(path, newline="") as f:
        for d in csv.DictReader(f):
            fuel = MER_COAL_LEAVES.get(d["MSN"])
            v = num(d["Value"])
            if fuel and d["YYYYMM"].endswith("13") and v is not None:
                r.rows += 1
                r.add(fuel, v, "kt_short")
    return r


# ------------------------------------------------------------------ dev set

def ecos(path):
    """'Building Utilities': ECoS share of natural gas (col N, MMBtu), rows 8-28."""
    r = Ref()
    ws = open_book(path)["Building Utilities"]
    for row in ws.iter_rows(min_row=8, max_row=28, values_only=True):
        v = num(row[13])
        if row[0] and v is not None:
            r.rows += 1
            r.add("natural_gas", v, "MMBtu")
    return r


YALE = {
    ("Gas Firm", "MCF"): ("natural_gas", "Mcf"), ("Gas Firm", "CCF"): ("natural_gas", "CCF"),
    ("Gas Bundled", "MCF"): ("natural_gas", "Mcf"), ("Gas Bundled", "CCF"): ("natural_gas", "CCF"),
    ("Gas Interruptable", "MCF"): ("natural_gas", "Mcf"),
    ("Gas Fuel Cell", "MCF"): ("natural_gas", "Mcf"), ("Gas Fuel Cell", "CCF"): ("natural_gas", "CCF"),
    ("Oil #2", "GAL"): ("gas_diesel_oil", "gal"), ("Diesel", "GAL"): ("gas_diesel_oil", "gal"),
    ("Propane", "GAL"): ("lpg", "gal"),
}


def yale(path):
    """Long table: type + unit + value; fuel types with a stated unit only."""
    r = Ref()
    ws = open_book(path).active
    rows = ws.iter_rows(values_only=True)
    next(rows)
    for row in rows:
        m = YALE.get((row[3], row[4]))
        v = num(row[5])
        if m and v is not None:
            r.rows += 1
            r.add(m[0], v, m[1])
    return r


def umn_morris(path):
    """Fleet fill-ups: Gallons (col G), motor gasoline (ethanol blend)."""
    r = Ref()
    ws = open_book(path).active
    rows = ws.iter_rows(values_only=True)
    next(rows)
    for row in rows:
        v = num(row[6])
        if v is not None:
            r.rows += 1
            r.add("motor_gasoline", v, "gal")
    return r


def uk_gas(path):
    """Local-authority rows and the two leaf 'Unallocated' rows, All meters GWh."""
    r = Ref()
    wb = open_book(path)
    for name in wb.sheetnames:
        if not name.isdigit():
            continue
        for row in wb[name].iter_rows(min_row=7, values_only=True):
            code, la, v = row[0], row[2], num(row[9])
            if not code or v is None or la == "All local authorities":
                continue
            if code == "Unallocated Great Britain":
                continue  # = England and Wales + Scotland unallocated
            r.rows += 1
            r.add("natural_gas", v, "GWh")
    return r


def mer_t1_3(path):
    """Sheet MER_T01_03, annual rows of coal (CLTCBUS) and natural gas (NNTCBUS)."""
    r = Ref()
    ws = open_book(path)["MER_T01_03"]
    rows = ws.iter_rows(values_only=True)
    next(rows)
    fuels = {"CLTCBUS": "other_bituminous_coal", "NNTCBUS": "natural_gas"}
    for row in rows:
        f = fuels.get(row[0])
        v = num(row[2])
        if f and str(row[1]).endswith("13") and v is not None:
            r.rows += 1
            r.add(f, v, "quad")
    return r


TRURO = {"Oil": "gas_diesel_oil", "Propane": "lpg", "Gasoline": "motor_gasoline", "Diesel": "gas_diesel_oil"}


def truro(path):
    """account_fuel + use (US gallons implied: mmbtu/use = 0.139/0.091/0.124)."""
    r = Ref()
    with open(path, newline="") as f:
        for d in csv.DictReader(f):
            fuel = TRURO.get(d["account_fuel"])
            v = num(d["use"])
            if fuel and v is not None:
                r.rows += 1
                r.add(fuel, v, "gal")
    return r


def eia_ng_xls(path):
    """Natural gas by end use (MMcf): leaf columns C, D, F-J; B and E are sums."""
    r = Ref()
    ws = open_book(path)["Data 1"]
    leaves = [2, 3, 5, 6, 7, 8, 9]
    for row in ws.iter_rows(min_row=4, values_only=True):
        vals = [num(row[i]) for i in leaves if i < len(row)]
        vals = [v for v in vals if v is not None]
        if not vals:
            continue
        r.rows += 1
        r.add("natural_gas", sum(vals), "MMcf")
    return r


def pdp7a(path):
    """'Fuel consumption (Mt) Coal': 63, 95, 129 for 2020, 2025, 2030."""
    r = Ref()
    with open(path, newline="") as f:
        rows = list(csv.reader(f))
    start = next(i for i, row in enumerate(rows) if row and row[0].startswith("Fuel consumption"))
    for row in rows[start + 2:]:
        if len(row) > 3 and row[0].isdigit() and num(row[3]) is not None:
            r.rows += 1
            r.add("other_bituminous_coal", num(row[3]), "Mt")
    return r


DBEDT = {
    # State sheet, series name -> (fuel, unit); section headers make 'Barrels of
    # Oil Consumed' fuel oil (residual) or diesel.
    "Gasoline": ("motor_gasoline", "gal"),
    "Diesel Oil (non-hwy)": ("gas_diesel_oil", "gal"),
    "Diesel Oil (hwy use)": ("gas_diesel_oil", "gal"),
    "LPG (off hwy)": ("lpg", "gal"),
    "LPG (hwy use)": ("lpg", "gal"),
    "Small Boat (gas)": ("motor_gasoline", "gal"),
    "Small Boat (diesel)": ("gas_diesel_oil", "gal"),
    "Aviation Fuel": ("jet_kerosene", "gal"),
}


def dbedt(path):
    """State sheet: liquid fuel tax base (gallons) and utility fuel (barrels)."""
    r = Ref()
    ws = open_book(path)["State"]
    section = ""
    for row in ws.iter_rows(min_row=5, values_only=True):
        name, unit = row[0], row[1]
        if name and unit is None:
            section = str(name)
            continue
        m = None
        if section == "Liquid Fuel Tax Base":
            m = DBEDT.get(str(name).strip())
        elif name == "Barrels of Oil Consumed":
            if section.startswith("Fuel Oil"):
                m = ("residual_fuel_oil", "bbl")
            elif section.startswith("Diesel Oil"):
                m = ("gas_diesel_oil", "bbl")
        if not m:
            continue
        vals = [num(v) for v in row[2:]]
        vals = [v for v in vals if v is not None]
        if vals:
            r.rows += 1
            r.add(m[0], sum(vals), m[1])
    return r


SEDS = {}
for _msn in ("CLRCP", "CLCCP", "CLICP", "CLACP", "CLEIP"):
    SEDS[_msn] = ("other_bituminous_coal", "kt_short")
for _msn in ("NGRCP", "NGCCP", "NGICP", "NGACP", "NGEIP"):
    SEDS[_msn] = ("natural_gas", "MMcf")
for _msn in ("DFRCP", "DFCCP", "DFICP", "DFACP", "DFEIP"):
    SEDS[_msn] = ("gas_diesel_oil", "kbbl")
for _msn in ("RFCCP", "RFICP", "RFACP", "RFEIP"):
    SEDS[_msn] = ("residual_fuel_oil", "kbbl")
for _msn in ("MGCCP", "MGICP", "MGACP"):
    SEDS[_msn] = ("motor_gasoline", "kbbl")
for _msn in ("KSRCP", "KSCCP", "KSICP"):
    SEDS[_msn] = ("other_kerosene", "kbbl")
for _msn in ("HLRCP", "HLCCP", "HLICP", "HLACP"):
    SEDS[_msn] = ("lpg", "kbbl")
for _msn in ("PCCCP", "PCICP", "PCEIP"):
    SEDS[_msn] = ("petroleum_coke", "kbbl")
SEDS["JFACP"] = ("jet_kerosene", "kbbl")


def seds(path):
    """Sector-level physical consumption (P series), 1960-2016, leaves only."""
    r = Ref()
    with open(path, newline="") as f:
        rows = list(csv.reader(f))
    for row in rows[1:]:
        m = SEDS.get(row[2])
        if not m:
            continue
        vals = [num(v) for v in row[4:]]
        vals = [v for v in vals if v is not None]
        if vals:
            r.rows += 1
            r.add(m[0], sum(vals), m[1])
    return r


# ------------------------------------------------------------------ registry

IPCC_SRC = "IPCC 2006 Vol 2 Ch 1 Tables 1.2 (NCV) and 1.4 (CO2 EF)"
EPA_NG = "; 40 CFR 98 Table C-1 (1.026 mmBtu/Mcf HHV)"
HHV = "; HHV->NCV 0.90 gas / 0.95 oil+coal (mem)"
DENS = "; densities gasoline 747.5 diesel 832.5 (EN 228/590 mem)"

# file, kind, function, note (what the analyst computes), source
NEW = [
    ("eia_aer_t8_4c_electricity_fuel_ci.xlsx", "compute", aer_t8_4c,
     "coal (B) + natural gas (F) Billion Btu, commercial + industrial, 1989-2014; petroleum/other gases not a single IPCC fuel",
     IPCC_SRC + HHV),
    ("farm_energy_use_miranowski.xlsx", "compute", farm_energy,
     "'Ag Cons by Use' 1965-2002 gasoline, diesel, LP gas, natural gas (Trillion Btu); shares block (rows 52-89) and totals skipped",
     IPCC_SRC + HHV),
    ("eia_weekly_product_supplied.xls", "compute", weekly_product_supplied,
     "kb/d x 7 d per week: gasoline, jet, distillate, residual, propane; total and 'other oils' skipped",
     IPCC_SRC + DENS + "; jet 800 resid 980 propane 508 (mem)"),
    ("eia_colorado_natural_gas_industrial.csv", "compute", eia_series_csv,
     "monthly MMcf, natural gas",
     IPCC_SRC + EPA_NG + HHV),
    ("eia_mer_t06_02_coal_consumption_2010on.csv", "compute", mer_t6_2,
     "annual (YYYY13) rows of the 8 leaf sectors, thousand short tons; totals and monthly rows skipped; coke plants as coking coal",
     IPCC_SRC),
    ("eia_us_net_generation_monthly.csv", "nocompute", None,
     "electricity generated by fuel (thousand MWh) is output, not fuel input: no fossil CO2 without heat rates", ""),
    ("eia_existing_capacity_by_state_2016.csv", "nocompute", None,
     "nameplate/summer capacity (MW) by fuel source: no fuel quantity", ""),
    ("eia_aer_t3_3_consumer_prices.xlsx", "negative", None, "prices in dollars per million Btu", ""),
    ("eia_propane_spot_price.xls", "negative", None, "propane spot price, dollars per gallon", ""),
    ("eia_residual_fuel_oil_price.csv", "negative", None, "residual fuel oil wholesale price, dollars per gallon", ""),
    ("tedb_fuel_heat_content.csv", "negative", None, "heat content per gallon/ft3 (factor table)", ""),
    ("epa_fuel_emission_factors.csv", "negative", None, "emission factor table (kg CO2 per mmBtu/short ton)", ""),
]

DEV = [
    ("ECoS_GHG_Inventory_CY2019.xlsx", "compute", ecos,
     "'Building Utilities' Prop Natural Gas (col N, MMBtu): the ECoS share the inventory reports (709.96 MMBtu); total-building column and existing MtCO2e not re-added; vehicles have miles only",
     IPCC_SRC + HHV),
    ("yale_buildings_data_deduplicated.xlsx", "compute", yale,
     "gas types with MCF/CCF units, Oil #2, Diesel and Propane GAL; Combined MMBTU (aggregate), steam, chilled water, electricity, unit-less rows and 'Gas 2 Equivalent' (meaning unknown) skipped",
     IPCC_SRC + EPA_NG + HHV + DENS + "; propane 508 (mem)"),
    ("umn_morris_Ethanol_Billing_Combined_Clean.xlsx", "compute", umn_morris,
     "Gallons of retail ethanol-blended gasoline as motor gasoline (blend share not stated; E10 would make fossil CO2 ~10% lower)",
     IPCC_SRC + DENS),
    ("uk_subnational_gas_consumption_non_weather_corrected_2015-2021.xlsx", "compute", uk_gas,
     "LA rows + E&W and Scotland 'Unallocated', All meters GWh, 7 year sheets; region/country totals skipped; GWh taken as NCV (file states no basis; GCV would be 10% lower)",
     IPCC_SRC),
    ("needs_prescriptive_builds.xlsx", "nocompute", None,
     "capacity build plan (MW): fossil CO2 needs assumed capacity factors", ""),
    ("needs_v6_New_Capacity_Hardwired.csv", "nocompute", None,
     "unit list with MW and heat rate: fuel use needs an assumed capacity factor", ""),
    ("eia_MER_T01_03.xlsx", "compute", mer_t1_3,
     "sheet MER_T01_03 annual (YYYY13) coal + natural gas rows, quad Btu; monthly rows, totals, the two duplicate sheets and petroleum (no single IPCC fuel) skipped",
     IPCC_SRC + HHV),
    ("truro_municipal_energy.csv", "compute", truro,
     "Oil (heating oil #2), Propane, Gasoline, Diesel 'use' in gallons; Electric rows and existing mtco2e skipped",
     IPCC_SRC + DENS + "; propane 508 (mem)"),
    ("eia_NG_CONS_SUM_DCU_NUS_M.xls", "compute", eia_ng_xls,
     "per month the leaf end uses (lease/plant, pipeline, residential, commercial, industrial, vehicle, electric power) MMcf; Total and Delivered-to-consumers are sums",
     IPCC_SRC + EPA_NG + HHV),
    ("vn_List_of_coal_power_plants.xlsx", "nocompute", None,
     "capacity, generation and efficiency per plant, no fuel quantity", ""),
    ("vn_PDP7A_Objectives.csv", "compute", pdp7a,
     "'Fuel consumption (Mt) Coal' 63+95+129 as other bituminous coal (type not stated); capacity, supply GWh and % not fuel",
     IPCC_SRC),
    ("epa_ghg-emission-factors-hub-2021.xlsx", "negative", None, "emission factor tables", ""),
    ("eu_mrv_2020-v181-01122022_Publication_of_information.xlsx", "nocompute", None,
     "fuel consumption in tonnes without fuel type; reported CO2 exists: the fuel must be asked, not guessed", ""),
    ("uk_fuelfinder_forecourt_prices_2026-02.csv", "negative", None, "pence per litre prices", ""),
    ("hawaii_dbedt_Monthly_Energy_Data.xlsx", "compute", dbedt,
     "State sheet: tax-base gallons (gasoline, diesel, LPG, small boat, aviation fuel as jet) + utility fuel oil (residual) and diesel barrels; island sheets, imports, prices, kWh, counts skipped",
     IPCC_SRC + DENS + "; jet 800 resid 980 LPG 508 (mem)"),
    ("hawaii_EIA_SEDS.csv", "compute", seds,
     "sector rows in physical units (coal kst, gas MMcf, distillate, residual, gasoline, jet, kerosene, HGL, pet coke kbbl); totals, Btu duplicates, prices, non-energy products, avgas, still gas skipped",
     IPCC_SRC + EPA_NG + HHV + DENS + "; jet/kero 800 resid 980 HGL 508 coke 5 bbl/st (mem)"),
    ("truro_vehicles_factors.csv", "negative", None, "miles per year and per gallon: rates", ""),
    ("masssave_2022_Geographic_Report_Truro.xls", "nocompute", None,
     "electricity MWh only ('No gas' for therms); savings and incentives are not usage", ""),
    ("epa_co2ffc_2014_0.xlsx", "negative", None, "already MMTCO2 by state and sector, no activity data", ""),
]


def evaluate(entries, folder, out):
    results = []
    for name, kind, fn, note, src in entries:
        path = os.path.join(folder, name)
        if fn is None:
            results.append((name, kind, 0, "", note, src))
            print("%-66s %-9s" % (name, kind), file=out)
            continue
        ref = fn(path)
        total = ref.total()
        print("%-66s %-9s rows=%-6d tCO2=%.6g" % (name, kind, ref.rows, total), file=out)
        for (f, u), a in sorted(ref.act.items()):
            print("    %-22s %16.6g %-8s -> %14.6g tCO2" % (f, a, u, tco2(f, a, u)), file=out)
        working = note + ". " + ref.working()
        results.append((name, kind, ref.rows, "%.6g" % total, working, src))
    return results


def write_csv(path, results):
    with open(path, "w", newline="") as f:
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["file", "kind", "computable_rows", "min_share", "reference_tco2", "tolerance", "working", "source"])
        for name, kind, rows, total, working, src in results:
            share = "0.8" if kind == "compute" else ""
            tol = "0.05" if kind == "compute" else ""
            w.writerow([name, kind, rows, share, total, tol, working, src])


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--devset", help="folder with the development-set files")
    ap.add_argument("--write", action="store_true", help="rewrite expect.csv (and devset.csv)")
    args = ap.parse_args()
    here = os.path.dirname(os.path.abspath(__file__))
    res = evaluate(NEW, here, sys.stdout)
    if args.write:
        write_csv(os.path.join(here, "expect.csv"), res)
    if args.devset:
        print(file=sys.stdout)
        dev = evaluate(DEV, args.devset, sys.stdout)
        if args.write:
            write_csv(os.path.join(here, "devset.csv"), dev)


if __name__ == "__main__":
    main()
