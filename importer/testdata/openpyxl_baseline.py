"""The openpyxl counterpart of the excelize baseline in bench_test.go.

Run with Debian's python3-openpyxl:

    /usr/bin/python3 importer/testdata/openpyxl_baseline.py IN.xlsx OUT.xlsx

It does the same job as baselineExcelize: read every row of the sheet
"Fuel log", compute one number per data row (quantity x a fixed factor),
write it into a new sheet "Computed" at the same row, and save the whole
workbook (the original sheets included) to OUT. TestPerfTargets times it.
"""

import sys

import openpyxl


def main(src, dst):
    wb = openpyxl.load_workbook(src)
    ws = wb["Fuel log"]
    out = wb.create_sheet("Computed")
    for r, row in enumerate(ws.iter_rows(values_only=True), start=1):
        if r < 4 or len(row) < 5 or not isinstance(row[4], (int, float)):
            continue
        out.cell(row=r, column=1, value=row[4] * 0.00265)
    wb.save(dst)


if __name__ == "__main__":
    main(sys.argv[1], sys.argv[2])
