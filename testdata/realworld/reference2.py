#!/usr/bin/env python3
"""Reference CO2 totals for the second development set, computed without fluecell.

Same method and conventions as reference.py (which this script imports for the
factor tables and the conversion chain): IPCC 2006 Vol 2 Ch 1 Table 1.2 (NCV)
and Table 1.4 (CO2 EF); Btu-family units (kBtu, therm) are gross (HHV),
NCV = 0.90 x GCV for natural gas and 0.95 x GCV for oil; GJ with no stated
basis is taken as NCV; US gallon 3.785411784 L; gasoline 747.5 and diesel
832.5 kg/m3 (EN 228 / EN 590 midpoints, from memory).

    python3 reference2.py --devset2 DIR            # the files of the second development set
    python3 reference2.py --devset2 DIR --write    # rewrite DIR/devset2.csv
    python3 reference2.py --corpus                 # the committed copies in testdata/realworld
                                                   #   (prints the expect.csv rows)

Only the standard library and openpyxl are used.
"""

import argparse
import csv
import os
import sys

HERE = os.path.dirname(os.path.abspath(__file__))
for cand in (HERE, "/work/main/testdata/realworld"):
    if os.path.exists(os.path.join(cand, "reference.py")):
        sys.path.insert(0, cand)
        break
import reference as R  # noqa: E402  (factor tables, Ref, tco2, open_book, write_csv)

# Units used by these files, added to reference.py's table.
R.UNITS.setdefault("kBtu", ("btu", 1e3))
R.UNITS.setdefault("GJ", ("j", 1e9))      # GJ with no stated basis: NCV (convention)

IPCC_SRC = R.IPCC_SRC
HHV = R.HHV
DENS = R.DENS


def num(v):
    return R.num(v)


def read_csv(path):
    with open(path, newline="", encoding="utf-8-sig") as f:
        return list(csv.reader(f))


# ---------------------------------------------------------------- fleet

URBANA_CLASS = {
    "Unleaded": "motor_gasoline", "Unleaded Premium": "motor_gasoline",
    "Unleaded Mid-Grade": "motor_gasoline", "Diesel": "gas_diesel_oil",
}


def urbana(path):
    """Fuel-card export: Units in GA per transaction; fuel from 'Product Class'.

    Unleaded / Unleaded Premium / Mid-Grade (incl. 'Unleaded Ethanol (10% blend)')
    as motor gasoline, Diesel (incl. 'B2 Diesel Blend 2% Biodiesel') as gas/diesel
    oil; E-85 (mostly ethanol) and the EA rows (car wash, merchandise, discounts)
    are skipped.
    """
    r = R.Ref()
    rows = read_csv(path)
    h = rows[0]
    ic, iu, iq = h.index("Product Class"), h.index("Unit of Measure"), h.index("Units")
    for row in rows[1:]:
        fuel = URBANA_CLASS.get(row[ic])
        q = num(row[iq])
        if fuel and row[iu] == "GA" and q is not None:
            r.rows += 1
            r.add(fuel, q, "gal")
    return r


def gsa_ffr_4_3(path):
    """GSA Federal Fleet Report FY2015 Table 4-3: last column, gasoline gallons per agency."""
    r = R.Ref()
    rows = read_csv(path)
    h = rows[0]
    i = h.index("Worldwide Gasoline Use (Gallons)")
    for row in rows[1:]:
        q = num(row[i]) if i < len(row) else None
        if q is not None:
            r.rows += 1
            r.add("motor_gasoline", q, "gal")
    return r


# ---------------------------------------------------------------- benchmarking

def sf_ebepo(path):
    """SF Existing Buildings report: 'YYYY Natural Gas Use (kBtu)' for 2018-2021.

    One row per building, four year columns; a row counts once if any year has
    gas. District steam (purchased), electricity, site energy totals and the
    reported GHG columns are not fuel burned on site by the row.
    """
    r = R.Ref()
    rows = read_csv(path)
    h = rows[0]
    gas = [i for i, x in enumerate(h) if "Natural Gas Use (kBtu)" in x]
    for row in rows[1:]:
        vals = [num(row[i]) for i in gas if i < len(row)]
        vals = [v for v in vals if v is not None]
        if vals:
            r.rows += 1
            r.add("natural_gas", sum(vals), "kBtu")
    return r


def calgary(path):
    """Calgary corporate buildings 2019-2023 (long by 'Year Ending'): Natural Gas Use (GJ).

    Numbers appear both plain and with thousands commas ('6,308.20', '18,537').
    GJ taken as NCV (no basis stated; Canadian utility GJ are usually gross,
    which would make the result about 10 % lower). District hot water skipped.
    """
    r = R.Ref()
    rows = read_csv(path)
    h = rows[0]
    i = h.index("Natural Gas Use (GJ)")
    for row in rows[1:]:
        q = num(row[i])
        if q is not None:
            r.rows += 1
            r.add("natural_gas", q, "GJ")
    return r


def seattle(path):
    """Seattle 2016 benchmarking: NaturalGas(therms) (the kBtu column repeats it).

    Values carry thousands commas ('12,764.53'); SteamUse (purchased) and
    electricity skipped; zero-gas rows count (computed as 0).
    """
    r = R.Ref()
    rows = read_csv(path)
    h = rows[0]
    i = h.index("NaturalGas(therms)")
    for row in rows[1:]:
        if i >= len(row):
            continue
        q = num(row[i])
        if q is not None:
            r.rows += 1
            r.add("natural_gas", q, "therm")
    return r


def philadelphia(path):
    """Sheet '2011-13 Data': Natural Gas Use (therms) + Fuel Oil #2 Use (kBtu).

    The kBtu gas column repeats the therms; the Pivot and Summary sheets repeat
    the data with totals and % changes (skipped).
    """
    r = R.Ref()
    ws = R.open_book(path)["2011-13 Data"]
    it = ws.iter_rows(values_only=True)
    h = list(next(it))
    ig, io = h.index("Natural Gas Use (therms)"), h.index("Fuel Oil #2 Use (kBtu)")
    for row in it:
        if row[0] is None:
            continue
        g, o = num(row[ig]), num(row[io])
        if g is None and o is None:
            continue
        r.rows += 1
        if g is not None:
            r.add("natural_gas", g, "therm")
        if o is not None:
            r.add("gas_diesel_oil", o, "kBtu")
    return r


SRC_GAS = IPCC_SRC + HHV
SRC_FLEET = IPCC_SRC + DENS

DEV2 = [
    ("urbana_fuel_card_export_2017.csv", "compute", urbana,
     "fuel-card transactions: Units in GA; Product Class Unleaded/Premium/Mid-Grade as motor gasoline "
     "(E10 blends included; fossil CO2 ~10% lower for those rows), Diesel incl. B2 as gas/diesel oil; "
     "E-85 (7 rows) and EA rows (wash, merchandise, discounts) skipped; odometer, cost, tank capacity not fuel",
     SRC_FLEET),
    ("gsa_ffr_fy2015_table4_3_agency_vmt_gasoline.csv", "compute", gsa_ffr_4_3,
     "'Worldwide Gasoline Use (Gallons)' per agency; the six VMT columns are miles",
     SRC_FLEET),
    ("sf_existing_buildings_energy_performance_report.csv", "compute", sf_ebepo,
     "'YYYY Natural Gas Use (kBtu)' 2018-2021 (4 year columns per building row); steam (purchased), "
     "electricity, site energy totals, EUIs and reported GHG skipped",
     SRC_GAS),
    ("calgary_corporate_building_energy_benchmarking_2019-2023.csv", "compute", calgary,
     "'Natural Gas Use (GJ)' per building-year, numbers partly with thousands commas; GJ as NCV "
     "(no basis stated; if gross, 10% lower); district hot water, electricity, reported GHG skipped",
     IPCC_SRC),
    ("seattle_2016_building_energy_benchmarking.csv", "compute", seattle,
     "'NaturalGas(therms)' per building (the NaturalGas(kBtu) column repeats it); thousands commas; "
     "SteamUse (purchased), electricity, TotalGHGEmissions skipped",
     SRC_GAS),
    ("philadelphia_municipal_building_energy_2011-13.xlsx", "compute", philadelphia,
     "sheet '2011-13 Data': Natural Gas Use (therms) + Fuel Oil #2 Use (kBtu) per building-year; "
     "kBtu gas duplicate, steam, electricity and the Pivot/Summary sheets (totals, % change) skipped",
     SRC_GAS),
    ("bu_campus_building_energy_2006.csv", "nocompute", None,
     "columns 'E', 'G', 'O' are explained only in the repository's README (kWh, therms, gallons of "
     "fuel oil): fuel and unit must be asked, not guessed", ""),
    ("desnz_dukes_5_11_2025_power_stations.xlsx", "nocompute", None,
     "power station list: installed capacity (MW) by primary/secondary fuel, 20+ yearly sheets: no fuel quantity", ""),
    ("desnz_subnational_electricity_consumption_2005-2021.xlsx", "nocompute", None,
     "electricity sales (GWh, meters, kWh per meter) by local authority: no fuel burned", ""),
    ("we3lab_wwtp_energy_tariffs.xlsx", "negative", None,
     "100 utility tariff sheets: $/kWh, $/therm, $/kW charges, no consumption", ""),
]

# Committed copies (testdata/realworld): same functions, trimmed files.
CORPUS = [
    ("gsa_ffr_fy2015_table4_3_agency_vmt_gasoline.csv", "compute", gsa_ffr_4_3, DEV2[1][3], SRC_FLEET),
    ("calgary_corporate_building_energy_benchmarking_2019-2023.csv", "compute", calgary, DEV2[3][3], IPCC_SRC),
    ("sf_existing_buildings_energy_performance_report_first600.csv", "compute", sf_ebepo,
     DEV2[2][3] + "; first 600 of 2,559 building rows", SRC_GAS),
    ("desnz_dukes_5_11_2025_power_stations_trimmed.xlsx", "nocompute", None,
     "power station list: installed capacity (MW) by primary/secondary fuel; 7 of 27 sheets kept "
     "(cover, contents, notes, summary, full list, DUKES 2021, DUKES 2012): no fuel quantity", ""),
    ("we3lab_wwtp_energy_tariffs_first12.xlsx", "negative", None,
     "12 of 100 utility tariff sheets: $/kWh, $/therm, $/kW charges, no consumption", ""),
]


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--devset2", help="folder with the second development set")
    ap.add_argument("--corpus", action="store_true", help="the committed copies next to this script")
    ap.add_argument("--write", action="store_true", help="rewrite DIR/devset2.csv")
    args = ap.parse_args()
    if args.devset2:
        res = R.evaluate(DEV2, args.devset2, sys.stdout)
        if args.write:
            R.write_csv(os.path.join(args.devset2, "devset2.csv"), res)
    if args.corpus:
        res = R.evaluate(CORPUS, HERE, sys.stdout)
        w = csv.writer(sys.stdout, lineterminator="\n")
        for name, kind, rows, total, working, src in res:
            w.writerow([name, kind, rows, "0.8" if kind == "compute" else "", total,
                        "0.05" if kind == "compute" else "", working, src])


if __name__ == "__main__":
    main()
