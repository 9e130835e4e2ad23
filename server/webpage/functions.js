// fluecell's page: the functions explorer, built from GET /v1/functions (the catalog the
// server declares). A form per function computes as you type and gives the cell formulas and
// a Python snippet for the same call.
"use strict";

(() => {
  const { $, el, status, request, problem, onCatalog, tokenNeeded } = fluecellPage;
  let fns = [];
  let current = null;
  let timer = 0;
  let seq = 0;

  onCatalog((list) => {
    fns = list;
    renderList();
  });

  $("fn-filter").addEventListener("input", renderList);

  function renderList() {
    const f = $("fn-filter").value.trim().toLowerCase();
    const ul = $("fn-list");
    ul.replaceChildren();
    for (const fn of fns) {
      if (f && !fn.name.toLowerCase().includes(f) && !fn.doc.toLowerCase().includes(f)) continue;
      const b = el("button", { type: "button", text: fn.name, "aria-current": current && current.name === fn.name ? "true" : "false", "data-fn": fn.name });
      b.addEventListener("click", () => open(fn));
      ul.append(el("li", {}, b));
    }
  }

  // exampleValues are the argument values of a function's example URL.
  function exampleValues(fn) {
    const out = {};
    const q = (fn.example_url || "").split("?")[1] || "";
    for (const part of q.split("&")) {
      if (!part) continue;
      const [k, v] = part.split("=");
      try {
        out[decodeURIComponent(k)] = decodeURIComponent((v || "").replace(/\+/g, " "));
      } catch (e) {
        out[k] = v;
      }
    }
    return out;
  }

  function open(fn) {
    current = fn;
    // mark the current function without rebuilding the list, so the focus stays where it is
    for (const b of $("fn-list").querySelectorAll("button")) b.setAttribute("aria-current", String(b.dataset.fn === fn.name));
    const ex = exampleValues(fn);
    const box = $("fn-main");
    const formEl = el("form", { id: "fn-form", class: "fields", novalidate: true });
    formEl.addEventListener("submit", (ev) => { ev.preventDefault(); compute(); });
    for (const p of fn.params) {
      const id = "fn-p-" + p.name;
      const hint = p.doc + (p.unit ? " (" + p.unit + ")" : "") + (p.optional ? "; optional" + (p.default !== undefined ? ", default " + p.default : "") : "");
      let input;
      if (p.allowed && p.allowed.length) {
        input = el("select", { id, name: p.name, "aria-describedby": id + "-hint" });
        if (p.optional) input.append(el("option", { value: "", text: "default" + (p.default !== undefined ? " (" + p.default + ")" : "") }));
        for (const v of p.allowed) input.append(el("option", { value: v, text: v }));
        input.value = ex[p.name] || "";
      } else {
        input = el("input", { id, name: p.name, type: "text", inputmode: p.type === "number" ? "decimal" : undefined,
          autocomplete: "off", spellcheck: "false", "aria-describedby": id + "-hint", value: ex[p.name] || "" });
      }
      input.addEventListener("input", schedule);
      input.addEventListener("change", schedule);
      formEl.append(el("div", { class: "field" }, el("label", { for: id, text: p.name + (p.optional ? " (optional)" : "") }), input, el("p", { class: "hint", id: id + "-hint", text: hint })));
    }
    box.replaceChildren(
      el("h2", { text: fn.name }),
      el("p", { text: fn.doc }),
      el("p", { class: "meta", text: "Result in " + (fn.result_unit || "no unit") + " · sources: " + (fn.sources || []).join("; ") }),
      formEl,
      el("div", { id: "fn-result", class: "fn-result", role: "status", "aria-live": "polite" }),
      el("div", { id: "fn-detail" }),
      snippet("fn-calc", "Cell formula (LibreOffice Calc, Excel)"),
      snippet("fn-import", "Cell formula (sheet programs with IMPORTDATA)"),
      snippet("fn-python", "Python (standard library)"),
      el("p", { class: "hint", id: "fn-token-hint" }));
    compute();
  }

  function snippet(id, label) {
    const ta = el("textarea", { id, readonly: true, rows: id === "fn-python" ? 8 : 3, spellcheck: "false" });
    const b = el("button", { type: "button", text: "Copy", "aria-label": "Copy: " + label });
    b.addEventListener("click", async () => {
      try {
        await navigator.clipboard.writeText(ta.value);
        status("Copied: " + label + ".");
      } catch (e) {
        ta.focus();
        ta.select();
        status("Selected: press Ctrl+C (or ⌘C) to copy.");
      }
    });
    return el("div", { class: "snippet" }, el("label", { for: id, text: label }), ta, el("div", {}, b));
  }

  function schedule() {
    clearTimeout(timer);
    timer = setTimeout(compute, 300);
  }

  // callQuery is the query of the current form, values percent-encoded (a space as %20,
  // which every sheet program passes through unchanged).
  function callQuery() {
    const parts = [];
    for (const p of current.params) {
      const v = $("fn-p-" + p.name).value.trim();
      if (v !== "") parts.push(encodeURIComponent(p.name) + "=" + encodeURIComponent(v));
    }
    return parts.join("&");
  }

  async function compute() {
    if (!current) return;
    const fn = current;
    const q = callQuery();
    const path = "/v1/fn/" + encodeURIComponent(fn.name) + (q ? "?" + q : "");
    writeSnippets(fn, path);
    const mine = ++seq;
    const res = await request("GET", path + (q ? "&" : "?") + "format=json");
    if (mine !== seq) return; // a later keystroke's answer wins
    const out = $("fn-result"), detail = $("fn-detail");
    if (!out) return;
    if (res.status !== 200) {
      out.className = "fn-result error";
      out.textContent = await problem(res, compute);
      detail.replaceChildren();
      return;
    }
    const a = JSON.parse(res.xhr.response);
    out.className = "fn-result";
    out.textContent = String(a.value) + (a.unit ? " " + a.unit : "");
    const parts = [];
    if (a.low !== undefined && a.high !== undefined) parts.push(el("p", { class: "meta", text: "Range " + a.low + " to " + a.high + (a.unit ? " " + a.unit : "") }));
    if (a.sources && a.sources.length) {
      parts.push(el("h3", { text: "Sources" }), el("ul", {}, ...a.sources.map((s) => el("li", {
        text: (s.factor || s.id || "") + ": " + s.value + (s.unit && s.unit !== "1" ? " " + s.unit : "") + (s.basis ? " " + s.basis : "") + (s.low !== undefined ? " (" + s.low + " to " + s.high + ")" : "") + " · " + (s.source || "") + (s.from_memory ? " · from memory, not read in the source" : ""),
      }))));
    }
    if (a.notes && a.notes.length) parts.push(el("h3", { text: "Notes" }), el("ul", {}, ...a.notes.map((n) => el("li", { text: n }))));
    detail.replaceChildren(...parts);
  }

  function writeSnippets(fn, path) {
    const url = location.origin + path;
    const tok = tokenNeeded() ? (path.includes("?") ? "&" : "?") + "token=YOUR_TOKEN" : "";
    const quoted = (url + tok).replace(/"/g, '""');
    const numeric = fn.result_unit !== undefined;
    $("fn-calc").value = numeric ? '=VALUE(WEBSERVICE("' + quoted + '"))' : '=WEBSERVICE("' + quoted + '")';
    $("fn-import").value = '=IMPORTDATA("' + quoted + '")';
    const py = [
      "import json, os, urllib.request",
      "",
      "url = " + JSON.stringify(url + (path.includes("?") ? "&" : "?") + "format=json"),
    ];
    if (tokenNeeded()) {
      py.push('req = urllib.request.Request(url, headers={"Authorization": "Bearer " + os.environ["FLUECELL_TOKEN"]})');
    } else {
      py.push("req = urllib.request.Request(url)");
    }
    py.push("with urllib.request.urlopen(req) as r:", "    answer = json.load(r)", 'print(answer["value"], answer["unit"])');
    $("fn-python").value = py.join("\n");
    $("fn-token-hint").textContent = tokenNeeded()
      ? "A cell cannot send a header: in the cell formulas replace YOUR_TOKEN with the server's token (the page never writes it into an address). The Python snippet reads it from the environment variable FLUECELL_TOKEN."
      : "";
  }
})();
