"""A notebook-style client of fluecell, standard library only (urllib, json, csv).

Usage: python3 notebook_client.py BASE_URL [TOKEN]

It does what a notebook user does: one value, a batch of rows through POST /v1/eval, a CSV
table through the CSV mode, and an error read from the answer. It prints one JSON document
with what it got, which the Go test server/python_test.go checks.
"""

import csv
import io
import json
import sys
import urllib.error
import urllib.parse
import urllib.request

BASE = sys.argv[1].rstrip("/")
TOKEN = sys.argv[2] if len(sys.argv) > 2 else ""


def request(method, path, body=None, content_type=None):
    req = urllib.request.Request(BASE + path, data=body, method=method)
    if content_type:
        req.add_header("Content-Type", content_type)
    if TOKEN:
        req.add_header("Authorization", "Bearer " + TOKEN)
    with urllib.request.urlopen(req, timeout=30) as resp:
        return resp.status, resp.headers.get("Content-Type", ""), resp.read().decode("utf-8")


def fn(name, **params):
    """One catalog function: GET /v1/fn/NAME?params -> float."""
    status, _, text = request("GET", "/v1/fn/" + name + "?" + urllib.parse.urlencode(params))
    return float(text)


def eval_rows(expr, rows):
    """POST /v1/eval with rows -> the parsed answer."""
    body = json.dumps({"expr": expr, "rows": rows}).encode("utf-8")
    _, _, text = request("POST", "/v1/eval", body, "application/json")
    return json.loads(text)


def eval_csv(expr, column, table):
    """POST /v1/eval?expr=...&as=COLUMN with a CSV table -> list of dicts with COLUMN added."""
    buf = io.StringIO()
    w = csv.DictWriter(buf, fieldnames=list(table[0].keys()))
    w.writeheader()
    w.writerows(table)
    query = urllib.parse.urlencode({"expr": expr, "as": column})
    _, ctype, text = request("POST", "/v1/eval?" + query, buf.getvalue().encode("utf-8"), "text/csv")
    return ctype, list(csv.DictReader(io.StringIO(text)))


out = {}

_, _, catalog = request("GET", "/v1/functions")
out["functions"] = [f["name"] for f in json.loads(catalog)["functions"]]

out["one"] = fn("fuel_co2", fuel="natural_gas", amount=1000, unit="GJ")
out["one_with_space"] = fn("to_unit", value=1, **{"from": "MMBtu HHV", "to": "GJ HHV"})

fuel_log = [
    {"site": "Northgate", "fuel": "natural_gas", "quantity": 1000, "unit": "GJ"},
    {"site": "Harbour", "fuel": "diesel", "quantity": 1000, "unit": "L"},
    {"site": "Ridge", "fuel": "coal", "quantity": 5, "unit": "ton"},
]
batch = eval_rows("fuel_co2(fuel, quantity, unit)", fuel_log)
out["batch"] = batch["results"]
out["batch_sources"] = [s["factor"] for s in batch["sources"]]

ctype, table = eval_csv("fuel_co2(fuel, quantity, unit)", "tCO2", fuel_log)
out["csv_content_type"] = ctype
out["csv"] = table

try:
    request("GET", "/v1/fn/fuel_co2?fuel=natural_gas&amount=1%2C5&unit=GJ&format=json")
    out["error"] = None
except urllib.error.HTTPError as e:
    out["error"] = {"status": e.code, "body": json.loads(e.read().decode("utf-8"))}

json.dump(out, sys.stdout)
