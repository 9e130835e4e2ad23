// fluecell's page: the shell (token, requests, messages) and the workbook desk.
// Every text that comes from a workbook or the server is put in the page with textContent or
// as a text node, never as HTML. The token lives in one variable of this closure: never in
// storage, a cookie or an address.
"use strict";

const fluecellPage = (() => {
  const $ = (id) => document.getElementById(id);

  // el builds an element; attrs: class, text (textContent) or any attribute; children are
  // nodes or strings (text nodes).
  function el(tag, attrs, ...children) {
    const e = document.createElement(tag);
    for (const [k, v] of Object.entries(attrs || {})) {
      if (v === undefined || v === null || v === false) continue;
      if (k === "class") e.className = v;
      else if (k === "text") e.textContent = v;
      else e.setAttribute(k, v === true ? "" : String(v));
    }
    for (const c of children) {
      if (c === null || c === undefined) continue;
      e.append(typeof c === "string" ? document.createTextNode(c) : c);
    }
    return e;
  }

  function status(msg, kind) {
    const s = $("status");
    s.textContent = msg || "";
    s.className = "status" + (kind ? " " + kind : "");
  }

  // --- token -------------------------------------------------------------------------
  let token = "";
  let tokenNeeded = false;
  let afterToken = [];

  function askToken(wrong) {
    tokenNeeded = true;
    $("token-box").hidden = false;
    $("token-title").textContent = wrong ? "The token was not accepted: enter it again" : "This server asks for a token";
    $("token-input").value = "";
    $("token-input").focus();
  }

  $("token-form").addEventListener("submit", (ev) => {
    ev.preventDefault();
    token = $("token-input").value.trim();
    $("token-input").value = "";
    if (!token) return;
    $("token-box").hidden = true;
    status("");
    const todo = afterToken;
    afterToken = [];
    todo.forEach((f) => f());
  });

  // request sends one request with the token header. It resolves to {status, xhr} (status 0:
  // the server could not be reached). opts: body, type (responseType), onUpload, onSent.
  function request(method, url, opts) {
    const o = opts || {};
    return new Promise((resolve) => {
      const x = new XMLHttpRequest();
      x.open(method, url);
      if (token) x.setRequestHeader("Authorization", "Bearer " + token);
      x.responseType = o.type || "text";
      if (o.onUpload) x.upload.addEventListener("progress", o.onUpload);
      if (o.onSent) x.upload.addEventListener("load", o.onSent);
      x.addEventListener("load", () => resolve({ status: x.status, xhr: x }));
      x.addEventListener("error", () => resolve({ status: 0, xhr: x }));
      x.addEventListener("abort", () => resolve({ status: 0, xhr: x }));
      x.send(o.body === undefined ? null : o.body);
    });
  }

  async function bodyText(res) {
    const r = res.xhr.response;
    if (r instanceof Blob) return r.text();
    return typeof r === "string" ? r : "";
  }

  // problem turns a failed answer into a sentence for the page; a 401 asks for the token and
  // queues retry (when given) for after it.
  async function problem(res, retry) {
    if (res.status === 0) {
      return "The server could not be reached, or it closed the connection (a workbook over its upload limit is refused this way). Check that fluecell serve is running and try a smaller file.";
    }
    let msg = "", param = "";
    try {
      const j = JSON.parse(await bodyText(res));
      msg = j.error || "";
      param = j.param || "";
    } catch (e) {
      msg = "";
    }
    if (!msg) msg = "the server answered " + res.status + " " + (res.xhr.statusText || "");
    switch (res.status) {
      case 401:
        if (retry) afterToken.push(retry);
        askToken(token !== "");
        return "The server needs its token: enter it above.";
      case 413:
        return "Too large for this server: " + msg;
      case 408:
        return "The upload was too slow: " + msg;
      case 429:
      case 503:
        return "The server is busy: " + msg + " Try again in a moment.";
    }
    return (param ? "Parameter " + param + ": " : "") + msg;
  }

  // save offers blob as a download named name.
  function save(blob, name) {
    const url = URL.createObjectURL(blob);
    const a = el("a", { href: url, download: name, class: "file" });
    document.body.append(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 60000);
  }

  // --- catalog ------------------------------------------------------------------------
  let catalogWaiters = [];
  let catalog = null;
  function onCatalog(f) {
    if (catalog) f(catalog);
    else catalogWaiters.push(f);
  }
  async function loadCatalog() {
    status("Loading the function catalog…", "busy");
    const res = await request("GET", "/v1/functions");
    if (res.status !== 200) {
      status(await problem(res, loadCatalog), "error");
      return;
    }
    status("");
    catalog = JSON.parse(res.xhr.response).functions;
    catalogWaiters.forEach((f) => f(catalog));
    catalogWaiters = [];
  }

  // --- tabs ---------------------------------------------------------------------------
  function showTab(which) {
    for (const name of ["workbook", "functions"]) {
      $("tab-" + name).setAttribute("aria-pressed", String(name === which));
      $(name + "-view").hidden = name !== which;
    }
  }
  $("tab-workbook").addEventListener("click", () => showTab("workbook"));
  $("tab-functions").addEventListener("click", () => showTab("functions"));

  const page = { $, el, status, request, problem, save, onCatalog, bodyText, tokenNeeded: () => tokenNeeded };
  document.addEventListener("DOMContentLoaded", loadCatalog);
  return page;
})();

// The workbook desk: upload, the reading, the mapping edits, downloads.
(() => {
  const { $, el, status, request, problem, save, onCatalog } = fluecellPage;
  const st = { file: null, ins: null, prev: null, mapping: null, edited: false, busy: false };

  const fmt = (x, d) => (typeof x === "number" && isFinite(x) ? x.toLocaleString("en", { maximumFractionDigits: d === undefined ? 3 : d }) : "—");
  const clone = (v) => JSON.parse(JSON.stringify(v));
  const baseName = () => (st.file ? st.file.name.replace(/\.[^.]*$/, "") : "workbook");

  onCatalog((fns) => {
    const sel = $("opt-pack");
    const fc = fns.find((f) => f.name === "fuel_co2");
    const pack = fc && fc.params.find((p) => p.name === "pack");
    sel.replaceChildren(el("option", { value: "", text: "the server's default" + (pack ? " (" + pack.default + ")" : "") }));
    for (const p of (pack && pack.allowed) || []) sel.append(el("option", { value: p, text: p }));
    const gwpSel = $("opt-gwp");
    const gwp = fns.find((f) => f.name === "fuel_co2e");
    const set = gwp && gwp.params.find((p) => p.name === "gwp_set");
    gwpSel.replaceChildren(el("option", { value: "", text: "the default" + (set ? " (" + set.default + ")" : "") }));
    for (const s of (set && set.allowed) || []) gwpSel.append(el("option", { value: s, text: s.toUpperCase() }));
    loadGrids();
  });

  async function loadGrids() {
    const res = await request("GET", "/v1/grids");
    if (res.status !== 200) return;
    const list = $("grid-list");
    for (const g of JSON.parse(res.xhr.response).grids || []) list.append(el("option", { value: g.id, text: g.name }));
  }

  // --- input ----------------------------------------------------------------------------
  // A workbook dropped anywhere on the page is taken (the browser would otherwise leave the
  // page to open the file); the box lights up while one is dragged over it.
  const drop = $("drop");
  document.addEventListener("dragover", (ev) => ev.preventDefault());
  drop.addEventListener("dragover", () => drop.classList.add("over"));
  drop.addEventListener("dragleave", () => drop.classList.remove("over"));
  document.addEventListener("drop", (ev) => {
    ev.preventDefault();
    drop.classList.remove("over");
    if (st.busy) return;
    if (ev.dataTransfer && ev.dataTransfer.files.length) take(ev.dataTransfer.files[0]);
  });
  $("file-input").addEventListener("change", () => {
    if ($("file-input").files.length) take($("file-input").files[0]);
  });

  function take(file) {
    if (!/\.(xlsx|xlsm|xls|csv)$/i.test(file.name)) {
      status(file.name + " is not a workbook this page reads: choose an .xlsx, .xlsm, .xls or .csv file.", "error");
      return;
    }
    st.file = file;
    st.ins = st.prev = st.mapping = null;
    st.edited = false;
    $("opt-rules").value = "";
    $("opt-sheet").replaceChildren(el("option", { value: "", text: "every sheet" }));
    read();
  }

  // query is the options of the form as a query string (pack, grid, GWP set, sheet, rules).
  function query(extra) {
    const parts = [];
    const add = (k, v) => parts.push(k + "=" + encodeURIComponent(v));
    if ($("opt-pack").value) add("pack", $("opt-pack").value);
    if ($("opt-grid").value.trim()) add("grid", $("opt-grid").value.trim());
    if ($("opt-gwp").value) add("gwp_set", $("opt-gwp").value);
    if ($("opt-sheet").value) add("sheet", $("opt-sheet").value);
    for (const r of $("opt-rules").value.split("\n")) if (r.trim()) add("rule", r.trim());
    for (const [k, v] of Object.entries(extra || {})) add(k, v);
    return parts.length ? "?" + parts.join("&") : "";
  }

  // mappingToSend is the edited mapping without the names still lacking a fuel id (a mapping
  // file may not hold an empty id), with the GWP set chosen in the form (none: the default).
  function mappingToSend() {
    const m = clone(st.mapping);
    for (const [k, v] of Object.entries(m.names || {})) if (!v) delete m.names[k];
    if ($("opt-gwp").value) m.gwp_set = $("opt-gwp").value;
    else delete m.gwp_set;
    return m;
  }

  function form() {
    const fd = new FormData();
    if (st.edited && st.mapping) fd.append("mapping", new Blob([JSON.stringify(mappingToSend())], { type: "application/json" }), "mapping.json");
    fd.append("file", st.file, st.file.name);
    return fd;
  }

  function progress(on, pct, text) {
    $("progress-row").hidden = !on;
    const p = $("progress");
    if (pct === null) p.removeAttribute("value");
    else if (typeof pct === "number") p.value = pct;
    $("progress-text").textContent = text || "";
  }

  function busy(on) {
    st.busy = on;
    for (const id of ["rerun", "dl-workbook", "dl-report", "file-input"]) $(id).disabled = on;
  }

  // send posts the workbook to route; the upload's progress shows, then the server's work.
  async function send(route, extra, type) {
    busy(true);
    progress(true, 0, "Uploading " + st.file.name + "…");
    const res = await request("POST", route + query(extra), {
      body: form(), type,
      onUpload: (ev) => { if (ev.lengthComputable) progress(true, Math.round((100 * ev.loaded) / ev.total), "Uploading: " + Math.round(ev.loaded / 1024) + " of " + Math.round(ev.total / 1024) + " KiB"); },
      onSent: () => progress(true, null, "Uploaded; the server is reading the workbook…"),
    });
    progress(false);
    busy(false);
    return res;
  }

  async function read() {
    status("Reading " + st.file.name + "…", "busy");
    const res = await send("/v1/inspect", null, "text");
    if (res.status !== 200) {
      status(st.file.name + ": " + (await problem(res, read)), "error");
      return;
    }
    const ins = JSON.parse(res.xhr.response);
    st.prev = st.ins;
    st.ins = ins;
    if (!st.edited || !st.mapping) st.mapping = clone(ins.mapping_file);
    render();
    status("Read " + st.file.name + ": " + ins.report.computed + " of " + ins.report.rows + " rows computed.");
  }

  $("rerun").addEventListener("click", () => { if (st.file && !st.busy) read(); });
  $("reset-mapping").addEventListener("click", () => {
    if (!st.ins) return;
    st.edited = false;
    st.mapping = null;
    read();
  });

  async function download(route, extra, name) {
    status("Preparing " + name + "…", "busy");
    const res = await send(route, extra, "blob");
    if (res.status !== 200) {
      status(name + ": " + (await problem(res)), "error");
      return;
    }
    save(res.xhr.response, name);
    status("Downloaded " + name + ".");
  }
  $("dl-workbook").addEventListener("click", () => {
    const ext = /\.xlsm$/i.test(st.file.name) ? ".xlsm" : /\.csv$/i.test(st.file.name) ? ".csv" : ".xlsx";
    download("/v1/annotate", null, baseName() + ".carbon" + ext);
  });
  $("dl-report").addEventListener("click", () => download("/v1/annotate", { report: "json" }, baseName() + ".report.json"));
  $("dl-mapping").addEventListener("click", () => {
    save(new Blob([JSON.stringify(mappingToSend(), null, 2) + "\n"], { type: "application/json" }), baseName() + ".mapping.json");
    status("Downloaded " + baseName() + ".mapping.json.");
  });

  // --- rendering ------------------------------------------------------------------------
  // table fills the table id; each cell is labelled with its column's heading, which narrow
  // screens show beside it (a table of class stack is then a list of cards).
  function table(id, head, rows) {
    const t = $(id);
    for (const tr of rows) Array.from(tr.children).forEach((c, i) => c.setAttribute("data-label", head[i] || ""));
    t.replaceChildren(el("thead", {}, el("tr", {}, ...head.map((h) => el("th", { scope: "col", text: h })))), el("tbody", {}, ...rows));
  }
  const td = (text, cls) => el("td", { class: cls, text: text === undefined ? "" : String(text) });

  function render() {
    const ins = st.ins, rep = ins.report;
    $("result").hidden = false;
    $("sum-file").textContent = ins.path + " · " + ins.format + " · " + rep.tables.length + " table(s) · " + rep.computed + " of " + rep.rows + " rows computed" + (rep.mapping ? " · read with a mapping" : "") + (rep.gwp_set ? " · GWP set " + rep.gwp_set.toUpperCase() : "");
    table("kinds", ["Kind", "Scope", "tCO2e", "tCO2 (fossil)", "Biogenic CO2, t (memo)", "Completeness", "First rows left out"],
      rep.totals_by_kind.map((k) => el("tr", {},
        td(k.kind), td(k.scope), td(fmt(k.tCO2e), "num"), td(fmt(k.tCO2), "num"), td(fmt(k.tCO2_biogenic), "num"),
        td(k.computed + " of " + k.rows + " rows computed" + (k.incomplete ? ": incomplete" : ""), k.incomplete ? "status-incomplete" : "status-ok"),
        td((k.left_out || []).join(", "), "long"))));
    const bp = rep.build_plan;
    $("sum-interval").textContent = bp && bp.tCO2e_low !== undefined ? "Build plans: " + fmt(bp.tCO2e) + " tCO2e, range " + fmt(bp.tCO2e_low) + " to " + fmt(bp.tCO2e_high) + " tCO2e" + (bp.range_note ? " (" + bp.range_note + ")" : "") : "";
    $("cautions").replaceChildren(...(ins.caution || []).map((c) => el("li", { text: c })), el("li", { text: "Rules used: " + (rep.rules.join("; ") || "none") }));
    const sheetSel = $("opt-sheet"), keep = sheetSel.value;
    sheetSel.replaceChildren(el("option", { value: "", text: "every sheet" }), ...rep.sheets.map((s) => el("option", { value: s.name, text: s.name })));
    sheetSel.value = keep;
    renderNames();
    table("sheets", ["Sheet", "Status", "Tables", "Rows", "Computed", "Why"],
      rep.sheets.map((s) => el("tr", {}, td(s.name), td(s.status, "status-" + s.status.split(" ")[0]), td(s.tables, "num"), td(s.rows, "num"), td(s.computed, "num"), td(s.reason, "long"))));
    renderTables();
    const shown = rep.warnings.slice(0, 500);
    table("findings", ["Sheet", "Cell", "Severity", "Code", "Finding"],
      shown.map((w) => el("tr", { class: "sev-" + w.severity }, td(w.sheet), td(w.cell, "mono"), td(w.severity), td(w.code), td(w.message, "long"))));
    $("findings-more").textContent = rep.warnings.length > shown.length ? (rep.warnings.length - shown.length) + " more findings are in the report (JSON)." : rep.warnings.length + " finding(s).";
    renderChanges();
  }

  function renderNames() {
    const all = st.ins.names || [];
    // the unknown names first: they are the ones to map; at most 300 rows on the page
    const names = all.filter((n) => n.read === "unknown").concat(all.filter((n) => n.read !== "unknown")).slice(0, 300);
    $("names-box").hidden = all.length === 0;
    $("names-more").textContent = all.length > names.length ? (all.length - names.length) + " more names are in the mapping file (JSON)." : "";
    table("names", ["Text in the workbook", "Read as", "Fuel id", "First cell", "Rows"], names.map((n) => {
      const input = el("input", { type: "text", value: st.mapping.names[n.text] !== undefined ? st.mapping.names[n.text] : n.fuel || "", "aria-label": "Fuel id for " + n.text, autocomplete: "off", spellcheck: "false" });
      input.addEventListener("change", () => { st.mapping.names[n.text] = input.value.trim(); st.edited = true; });
      return el("tr", { class: n.read === "unknown" ? "sev-error" : "" }, td(n.text, "cell-text"), td(n.read), el("td", { class: "wide-input" }, input), td(n.cell, "mono"), td(n.rows, "num"));
    }));
  }

  function mappedTable(t) {
    return st.mapping.tables.find((m) => m.sheet === t.sheet && m.header_row === t.header_row);
  }
  function mappedColumn(mt, letter, header) {
    let c = mt.columns.find((x) => x.column === letter);
    if (!c) {
      c = { column: letter, header: header || "", role: "none" };
      mt.columns.push(c);
    }
    return c;
  }

  function renderTables() {
    const ins = st.ins, box = $("tables");
    box.replaceChildren();
    const bySheetCell = new Map();
    for (const w of ins.report.warnings) {
      const k = w.sheet + "!" + w.cell;
      if (!bySheetCell.has(k)) bySheetCell.set(k, []);
      bySheetCell.get(k).push(w);
    }
    const rank = { error: 3, warning: 2, info: 1 };
    ins.report.tables.forEach((t, i) => {
      const pv = ins.preview[i] || { columns: [], rows: [], more_rows: 0 };
      const mt = mappedTable(t);
      const sec = el("section", { class: "panel", "aria-label": "Table " + (i + 1) + " on " + t.sheet });
      sec.append(el("h2", { text: "Table " + (i + 1) + ": " + t.sheet + " " + t.range }),
        el("p", { class: "meta", text: t.kind + " · " + t.status + (t.reason ? ": " + t.reason : "") + (t.fuel ? " · fuel " + t.fuel : "") + (t.unit ? " · unit " + t.unit : "") }));
      const colInfo = new Map(t.columns.map((c) => [c.cell.replace(/\d+$/, ""), c]));
      const head = el("tr", {}, el("th", { scope: "col", text: "Row" }));
      for (const letter of pv.columns) {
        const ci = colInfo.get(letter) || { header: "", role: "", why: "" };
        const th = el("th", { scope: "col", class: "colhead" }, el("span", { class: "cell-text", text: letter + ": " + (ci.header || "(no header)") }));
        if (mt) {
          const mc = mt.columns.find((x) => x.column === letter);
          const role = el("select", { "aria-label": "Role of column " + letter });
          for (const r of ins.roles) role.append(el("option", { value: r, text: r }));
          role.value = (mc && mc.role) || "none";
          const unit = el("input", { type: "text", placeholder: "unit", value: (mc && mc.unit) || "", "aria-label": "Unit of column " + letter, autocomplete: "off", spellcheck: "false" });
          const basis = el("select", { "aria-label": "Basis of column " + letter }, el("option", { value: "", text: "basis: as read" }), el("option", { value: "NCV", text: "NCV (net)" }), el("option", { value: "HHV", text: "HHV (gross)" }));
          basis.value = (mc && mc.basis) || "";
          const edit = () => {
            const c = mappedColumn(mt, letter, ci.header);
            c.role = role.value;
            c.unit = unit.value.trim() || undefined;
            c.basis = basis.value || undefined;
            st.edited = true;
            th.classList.add("changed");
          };
          role.addEventListener("change", edit);
          unit.addEventListener("change", edit);
          basis.addEventListener("change", edit);
          th.append(role, unit, basis);
        }
        th.append(el("span", { class: "why", text: ci.why || "" }));
        head.append(th);
      }
      const body = pv.rows.map((r) => el("tr", {}, el("th", { scope: "row", class: "rownum", text: String(r.row) }),
        ...r.cells.map((text, j) => {
          const ws = bySheetCell.get(t.sheet + "!" + pv.columns[j] + r.row) || [];
          const ci = colInfo.get(pv.columns[j]);
          const cell = el("td", { class: "cell-text" }, r.row > t.header_row && ci && ci.role === "date" ? dateText(text) : text);
          if (ws.length) {
            const worst = ws.reduce((a, b) => (rank[b.severity] > rank[a.severity] ? b : a));
            cell.className += " sev-" + worst.severity;
            cell.setAttribute("title", ws.map((w) => w.severity + " " + w.code + ": " + w.message).join("\n"));
            cell.setAttribute("data-finding", worst.code);
          }
          return cell;
        })));
      sec.append(el("div", { class: "scroll" }, el("table", { class: "data preview" }, el("thead", {}, head), el("tbody", {}, ...body))));
      if (pv.more_rows > 0) sec.append(el("p", { class: "meta", text: pv.more_rows + " more row(s) of the table are not shown; their findings are in the list of findings." }));
      box.append(sec);
    });
  }

  // dateText shows a date column's day number (days since 1899-12-30, as spreadsheets store
  // dates) as the date, with the number as read.
  function dateText(text) {
    const n = Number(text);
    if (!/^\d+(\.\d+)?$/.test(text) || n < 1 || n > 2958465) return text;
    const d = new Date(Date.UTC(1899, 11, 30) + Math.floor(n) * 86400000);
    return d.toISOString().slice(0, 10) + " (" + text + ")";
  }

  // renderChanges compares the reading with the one before it (same workbook).
  function renderChanges() {
    const a = st.prev, b = st.ins;
    $("changes-box").hidden = !a;
    if (!a) return;
    const out = [];
    const line = (what, x, y) => { if (x !== y) out.push(what + ": " + x + " → " + y); };
    line("GWP set", a.report.gwp_set, b.report.gwp_set);
    line("rows computed", a.report.computed + " of " + a.report.rows, b.report.computed + " of " + b.report.rows);
    const kinds = new Map();
    for (const k of a.report.totals_by_kind) kinds.set(k.kind, [k, null]);
    for (const k of b.report.totals_by_kind) kinds.set(k.kind, [(kinds.get(k.kind) || [null])[0], k]);
    for (const [kind, [x, y]] of kinds) {
      line(kind + " tCO2e", x ? fmt(x.tCO2e) : "none", y ? fmt(y.tCO2e) : "none");
      line(kind + " completeness", x ? x.computed + " of " + x.rows : "none", y ? y.computed + " of " + y.rows : "none");
    }
    const count = (r, s) => r.warnings.filter((w) => w.severity === s).length;
    for (const s of ["error", "warning", "info"]) line("findings of severity " + s, count(a.report, s), count(b.report, s));
    const roles = (r) => new Map(r.tables.flatMap((t) => t.columns.map((c) => [t.sheet + "!" + c.cell + " (" + c.header + ")", c.role || "none"])));
    const ra = roles(a.report), rb = roles(b.report);
    for (const [k, v] of rb) if (ra.has(k)) line("role of " + k, ra.get(k), v);
    const names = (i) => new Map((i.names || []).map((n) => [n.text, n.read + (n.fuel ? " " + n.fuel : "")]));
    const na = names(a), nb = names(b);
    for (const [k, v] of nb) if (na.has(k)) line("reading of " + JSON.stringify(k), na.get(k), v);
    if (!out.length) out.push("Nothing changed in the totals, the findings or the reading.");
    $("changes").replaceChildren(...out.map((s) => el("li", { text: s })));
  }
})();
