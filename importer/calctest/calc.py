# Bridge between Go tests and a headless LibreOffice Calc (package calctest).
#
# Run with Debian's /usr/bin/python3 (python3-uno, python3-openpyxl). Two modes:
#
#   bridge --port N --user URL --soffice-pgid PID --connect-timeout S
#       Connects to soffice over UNO (retrying until S seconds have passed), checks that the
#       instance answering on the port is the one using profile URL, then speaks JSON lines:
#       one request on stdin -> one response on the protocol stream (the original stdout).
#       Anything else printed goes to stderr. When stdin closes without a "quit" request (the
#       Go test binary died), the soffice process group is killed before exiting.
#
#   openpyxl PATH
#       Prints one JSON document with every sheet of the workbook as openpyxl reads it.
#
# Responses: {"id": n, "ok": true, ...} or {"id": n, "ok": false, "error": "..."}.
# The first line of the bridge is {"id": 0, "ok": true, "ready": true} (or an error).

import json
import math
import os
import queue
import re
import signal
import sys
import threading
import time

# Keep the protocol stream private: stray prints from libraries must not corrupt it.
PROTO = os.fdopen(os.dup(1), "w", encoding="utf-8")
os.dup2(2, 1)
sys.stdout = sys.stderr

# com.sun.star.sheet.CellFlags.FORMULA
FORMULA_CELLS = 16

CELL_RE = re.compile(r"^\$?([A-Za-z]{1,3})\$?([1-9][0-9]{0,6})$")


class Fail(Exception):
    """A request error whose message goes back to the Go side as is."""


def send(obj):
    PROTO.write(json.dumps(obj, allow_nan=False) + "\n")
    PROTO.flush()


def finite(x):
    return x if isinstance(x, float) and math.isfinite(x) else 0.0


def split_ref(ref):
    """'Sheet1!B2', "'My sheet'!B2" or 'B2' -> (sheet name or None, 'B2')."""
    if "!" in ref:
        sheet, addr = ref.rsplit("!", 1)
        if len(sheet) >= 2 and sheet[0] == "'" and sheet[-1] == "'":
            sheet = sheet[1:-1].replace("''", "'")
        if sheet == "":
            raise Fail("cell %r: empty sheet name before '!' (want like Sheet1!B2 or B2)" % ref)
    else:
        sheet, addr = None, ref
    if not CELL_RE.match(addr):
        raise Fail("cell %r: %r is not a single cell address (want like B2 or Sheet1!B2)" % (ref, addr))
    return sheet, addr.replace("$", "").upper()


class Bridge:
    def __init__(self, ctx):
        from com.sun.star.beans import PropertyValue

        self.ctx = ctx
        self.smgr = ctx.ServiceManager
        self.desktop = self.smgr.createInstanceWithContext("com.sun.star.frame.Desktop", ctx)
        self.PropertyValue = PropertyValue

    def prop(self, name, value):
        p = self.PropertyValue()
        p.Name = name
        p.Value = value
        return p

    def open(self, path):
        import uno

        if not isinstance(path, str) or not os.path.isabs(path):
            raise Fail("path %r: want an absolute file path" % (path,))
        if not os.path.isfile(path):
            raise Fail("path %s: no such file" % path)
        url = uno.systemPathToFileUrl(path)
        # UpdateDocMode 3 = FULL_UPDATE: external links (WEBSERVICE) are refreshed on load.
        # ReadOnly: the input is never modified and no lock file is written next to it.
        args = (
            self.prop("Hidden", True),
            self.prop("UpdateDocMode", 3),
            self.prop("ReadOnly", True),
        )
        try:
            doc = self.desktop.loadComponentFromURL(url, "_blank", 0, args)
        except Exception as e:
            raise Fail("path %s: Calc could not open it: %s" % (path, getattr(e, "Message", e)))
        if doc is None:
            raise Fail("path %s: Calc could not open it (not a spreadsheet Calc can read?)" % path)
        if not hasattr(doc, "Sheets"):
            doc.close(True)
            raise Fail("path %s: opened, but it is not a spreadsheet" % path)
        return doc

    def cells(self, req):
        refs = req.get("cells") or []
        parsed = [(ref,) + split_ref(ref) for ref in refs]
        doc = self.open(req.get("path"))
        try:
            doc.calculateAll()
            sheets = doc.Sheets
            out = {}
            for ref, sheet, addr in parsed:
                if sheet is None:
                    sh = sheets.getByIndex(0)
                elif sheets.hasByName(sheet):
                    sh = sheets.getByName(sheet)
                else:
                    raise Fail(
                        "cell %r: no sheet %r in %s (sheets: %s)"
                        % (ref, sheet, req.get("path"), ", ".join(sheets.ElementNames))
                    )
                try:
                    cell = sh.getCellRangeByName(addr)
                except Exception:
                    raise Fail("cell %r: %s is outside the sheet" % (ref, addr))
                out[ref] = cell.getString()
            return {"cells": out}
        finally:
            doc.close(True)

    def dump(self, req):
        import csv
        import tempfile
        import uno

        doc = self.open(req.get("path"))
        try:
            doc.calculateAll()
            result = []
            with tempfile.TemporaryDirectory(prefix="fluecell-dump-") as tmp:
                for i in range(doc.Sheets.Count):
                    sh = doc.Sheets.getByIndex(i)
                    cur = sh.createCursor()
                    cur.gotoEndOfUsedArea(False)
                    end = cur.RangeAddress
                    rng = sh.getCellRangeByPosition(0, 0, end.EndColumn, end.EndRow)
                    # Bulk reads: every UNO call is a round trip to soffice, and reading cell by
                    # cell took 1-2 ms a cell (5000 cells: 5-8 s; this way: 0.1 s). Values and
                    # formula texts come as arrays, displayed text from a CSV export "as
                    # shown", formula cells from one query.
                    data = rng.getDataArray()
                    formulas = rng.getFormulaArray()
                    is_formula = set()
                    for a in rng.queryContentCells(FORMULA_CELLS).RangeAddresses:
                        for r in range(a.StartRow, a.EndRow + 1):
                            for c in range(a.StartColumn, a.EndColumn + 1):
                                is_formula.add((r, c))
                    # LibreOffice names the file after the sheet (s-Name.csv); one dir per sheet.
                    sub = os.path.join(tmp, str(i))
                    os.mkdir(sub)
                    # Tokens: ',' '"' UTF-8, from line 1, standard formats, system language,
                    # quoted text as text, detect numbers, save cell contents as shown,
                    # no formulas, keep spaces, sheet number i+1.
                    opts = "44,34,76,1,,0,true,true,true,false,false,%d" % (i + 1)
                    doc.storeToURL(uno.systemPathToFileUrl(os.path.join(sub, "s.csv")), (
                        self.prop("FilterName", "Text - txt - csv (StarCalc)"),
                        self.prop("FilterOptions", opts),
                    ))
                    written = os.listdir(sub)
                    if len(written) != 1:
                        raise Fail("sheet %r: CSV export wrote %r, want one file" % (sh.Name, written))
                    with open(os.path.join(sub, written[0]), newline="", encoding="utf-8") as fh:
                        texts = list(csv.reader(fh))
                    rows = []
                    for r in range(end.EndRow + 1):
                        row = []
                        for c in range(end.EndColumn + 1):
                            v, f = data[r][c], formulas[r][c]
                            t = texts[r][c] if r < len(texts) and c < len(texts[r]) else ""
                            item = {"Text": t, "Formula": "", "Value": 0.0, "IsNumber": False}
                            if (r, c) in is_formula:
                                item["Formula"] = f
                            if isinstance(v, float):
                                item["IsNumber"] = True
                                item["Value"] = finite(v)
                            row.append(item)
                        rows.append(row)
                    result.append({"Name": sh.Name, "Rows": rows})
            return {"sheets": result}
        finally:
            doc.close(True)

    def quit(self):
        try:
            self.desktop.terminate()
        except Exception:
            pass  # soffice drops the connection while terminating


def connect(port, want_user, deadline):
    import uno

    local = uno.getComponentContext()
    resolver = local.ServiceManager.createInstanceWithContext("com.sun.star.bridge.UnoUrlResolver", local)
    url = "uno:socket,host=127.0.0.1,port=%d;urp;StarOffice.ComponentContext" % port
    last = None
    while time.monotonic() < deadline:
        try:
            ctx = resolver.resolve(url)
            subst = ctx.ServiceManager.createInstanceWithContext("com.sun.star.util.PathSubstitution", ctx)
            user = subst.getSubstituteVariableValue("$(user)")
            if user.rstrip("/") != want_user.rstrip("/"):
                # Another soffice owns the port (ours could not bind it).
                raise Fail("port-taken: port %d is answered by the soffice with profile %s" % (port, user))
            Bridge(ctx).desktop  # make sure the desktop is up
            return ctx
        except Fail:
            raise
        except Exception as e:
            last = e
            time.sleep(0.1)
    raise Fail("soffice did not accept a UNO connection on port %d: %s" % (port, getattr(last, "Message", last)))


def run_bridge(argv):
    opts = dict(zip(argv[0::2], argv[1::2]))
    port = int(opts["--port"])
    pgid = int(opts["--soffice-pgid"])
    deadline = time.monotonic() + float(opts["--connect-timeout"])

    requests = queue.Queue()
    state = {"quit": False}

    def reader():
        # Runs apart from the UNO worker so a hung soffice cannot stop us noticing that the Go
        # side went away.
        for line in sys.stdin:
            requests.put(line)
        if not state["quit"]:
            try:
                os.killpg(pgid, signal.SIGKILL)
            except OSError:
                pass
            os._exit(3)
        requests.put(None)

    threading.Thread(target=reader, daemon=True).start()
    try:
        return serve(port, opts["--user"], deadline, requests, state)
    finally:
        if not state["quit"]:
            # Leaving without being told to (start-up failed, or a crash): leave no soffice.
            try:
                os.killpg(pgid, signal.SIGKILL)
            except OSError:
                pass


def serve(port, want_user, deadline, requests, state):
    try:
        bridge = Bridge(connect(port, want_user, deadline))
    except Fail as e:
        send({"id": 0, "ok": False, "error": str(e)})
        return 2
    send({"id": 0, "ok": True, "ready": True})

    while True:
        line = requests.get()
        if line is None:
            return 0
        try:
            req = json.loads(line)
        except ValueError as e:
            send({"id": -1, "ok": False, "error": "bad request line: %s" % e})
            continue
        rid = req.get("id", -1)
        op = req.get("op")
        try:
            if op == "cells":
                resp = bridge.cells(req)
            elif op == "dump":
                resp = bridge.dump(req)
            elif op == "quit":
                state["quit"] = True
                bridge.quit()
                send({"id": rid, "ok": True})
                return 0
            else:
                raise Fail("unknown op %r" % (op,))
        except Fail as e:
            send({"id": rid, "ok": False, "error": str(e)})
            continue
        except Exception as e:
            send({"id": rid, "ok": False, "error": "%s: %s" % (type(e).__name__, getattr(e, "Message", e))})
            continue
        resp.update({"id": rid, "ok": True})
        send(resp)


def openpyxl_item(formula_cell, value_cell):
    item = {"Text": "", "Formula": "", "Value": 0.0, "IsNumber": False}
    if formula_cell is not None and formula_cell.data_type == "f":
        f = formula_cell.value
        item["Formula"] = f if isinstance(f, str) else getattr(f, "text", str(f))
    v = value_cell.value if value_cell is not None else None
    if v is not None:
        item["Text"] = str(v)
        if isinstance(v, (int, float)) and not isinstance(v, bool):
            item["IsNumber"] = True
            item["Value"] = finite(float(v))
    return item


def run_openpyxl(path):
    import openpyxl

    # Two reads: formulas as written, and the values cached in the file.
    wb_f = openpyxl.load_workbook(path, data_only=False)
    wb_v = openpyxl.load_workbook(path, data_only=True)
    sheets = []
    for ws_f in wb_f.worksheets:
        ws_v = wb_v[ws_f.title]
        rows = []
        for r in range(1, ws_f.max_row + 1):
            row = []
            for c in range(1, ws_f.max_column + 1):
                row.append(openpyxl_item(ws_f.cell(r, c), ws_v.cell(r, c)))
            rows.append(row)
        sheets.append({"Name": ws_f.title, "Rows": rows})
    send({"ok": True, "sheets": sheets})
    return 0


def main():
    if len(sys.argv) >= 2 and sys.argv[1] == "bridge":
        return run_bridge(sys.argv[2:])
    if len(sys.argv) == 3 and sys.argv[1] == "openpyxl":
        try:
            return run_openpyxl(sys.argv[2])
        except Exception as e:
            send({"ok": False, "error": "%s: %s" % (type(e).__name__, e)})
            return 2
    sys.stderr.write("usage: calc.py bridge --port N ... | calc.py openpyxl PATH\n")
    return 64


if __name__ == "__main__":
    sys.exit(main())
