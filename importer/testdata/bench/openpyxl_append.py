"""openpyxl doing fluecell's in-place job, for the README's comparison.

Run with Debian's python3-openpyxl (membench_test.go runs it under
/usr/bin/time -v):

    /usr/bin/python3 importer/testdata/bench/openpyxl_append.py IN.xlsx OUT.xlsx

It loads the benchmark fuel log (sheet "Fuel log": title in row 1, header
in row 3, data from row 4, quantity in column E) in openpyxl's normal mode,
appends three computed columns beside the table (K, L, M) with a header
each, and saves the whole workbook to OUT. The three numbers are plain
products quantity x a fixed number per row: they stand in for the carbon
computation (factor lookup, unit conversion, checks), which they do not
perform, so openpyxl's figure is a lower bound for the same job.

openpyxl's read-only mode (load_workbook(read_only=True)) cannot change a
cell and its write-only mode (Workbook(write_only=True)) writes a new
workbook from nothing; neither edits a workbook in place, so the normal
mode, which holds every cell of the workbook as a Python object, is the
only one that does this job.
"""

import sys

import openpyxl

# Stand-in multipliers (not emission factors): one per appended column.
MULTIPLIERS = (0.0025, 0.0026, 0.0027)
HEADERS = ("calc 1", "calc 2", "calc 3")
HEADER_ROW = 3
QUANTITY_COL = 5  # E
FIRST_OUT_COL = 11  # K


def main(src, dst):
    wb = openpyxl.load_workbook(src)
    ws = wb["Fuel log"]
    for i, name in enumerate(HEADERS):
        ws.cell(row=HEADER_ROW, column=FIRST_OUT_COL + i, value=name)
    done = 0
    for r in range(HEADER_ROW + 1, ws.max_row + 1):
        q = ws.cell(row=r, column=QUANTITY_COL).value
        if not isinstance(q, (int, float)):
            continue
        for i, m in enumerate(MULTIPLIERS):
            ws.cell(row=r, column=FIRST_OUT_COL + i, value=q * m)
        done += 1
    wb.save(dst)
    print(done)


if __name__ == "__main__":
    main(sys.argv[1], sys.argv[2])
