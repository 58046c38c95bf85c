// Lotlens page: input, settings, the report cards, sharing, printing.
// The engine runs in a Web Worker (engine.js); this file never computes a
// statistic, it only shows what the engine reports.
//
// Automation (for the help page help/automation.md):
//   On the page, once it has loaded:
//     const report = await lotlens.analyse({ text: "5.12\n5.08\n5.10\n" , options: { confidence: 0.95 } });
//   analyse(request) takes a request object (schema "lotlens.request/1": text or
//   cells, optional value/group/order/subgroup column names, options) and
//   resolves to the report object (schema "lotlens.report/1"), the same JSON
//   that stats.Analyze gives in Go. It rejects with an Error whose message is
//   the engine's explanation when no report can be made. It runs in the same
//   Web Worker as the page, never touches the page's own data or settings, and
//   sends nothing anywhere. lotlens.ready() resolves once the engine has loaded.
"use strict";
(() => {
  const $ = (id) => document.getElementById(id);
  const SCHEMA = "lotlens.request/1";
  const status = $("status");

  // ---------- engine ----------
  let engine = null, engineReady = false, seq = 0;
  const pending = new Map(); // id -> {resolve, reject, onProgress}
  let readyWaiters = [];

  function startEngine() {
    engineReady = false;
    engine = new Worker("engine.js");
    engine.onmessage = (ev) => {
      const m = ev.data;
      if (m.type === "ready") {
        engineReady = true;
        if (!document.body.dataset.readyMs) document.body.dataset.readyMs = String(Math.round(performance.now()));
        document.body.dataset.ready = "1";
        readyWaiters.forEach((f) => f());
        readyWaiters = [];
        return;
      }
      if (m.type === "error") { setStatus(m.error, true); return; }
      const p = pending.get(m.id);
      if (!p) return;
      if (m.type === "progress") { if (p.onProgress) p.onProgress(m.read, m.total); return; }
      pending.delete(m.id);
      p.resolve(m);
    };
    engine.onerror = (e) => setStatus("The engine stopped: " + (e.message || e) + ". Reload the page.", true);
  }
  function whenReady() {
    return engineReady ? Promise.resolve() : new Promise((r) => readyWaiters.push(r));
  }
  function call(msg, onProgress) {
    return whenReady().then(() => new Promise((resolve, reject) => {
      const id = ++seq;
      pending.set(id, { resolve, reject, onProgress });
      engine.postMessage(Object.assign({ id }, msg));
    }));
  }
  // A cancel that the worker cannot hear (it is busy computing) ends it.
  function restartEngine(reason) {
    engine.terminate();
    for (const [, p] of pending) p.reject(new Error(reason));
    pending.clear();
    state.hasTable = false;
    startEngine();
  }

  // ---------- state ----------
  const state = {
    source: null,   // "text" | "file"
    text: "",       // the pasted text last analysed
    file: null,     // the File last read (kept for the share link)
    hasTable: false,
    exclude: new Set(),
    cols: { value: "", group: "", order: "", subgroup: "" },
    report: null,
    svg: {},
    full: false,
    when: null,
    busy: 0,
    analyses: 0,
    timing: null,
  };

  function setStatus(msg, isError) {
    status.textContent = msg;
    status.classList.toggle("error", !!isError);
  }

  // ---------- number formatting ----------
  function comma() { return !!(state.report && state.report.input && state.report.input.decimalComma); }
  function decimals() { return (state.report && state.report.counts && state.report.counts.decimals) || 0; }
  // fmt writes v to the data's decimals plus extra, or to full precision.
  function fmt(v, extra) {
    if (v === null || v === undefined || !isFinite(v)) return "–";
    let s;
    if (state.full) s = String(v);
    else {
      const d = Math.max(0, Math.min(12, decimals() + (extra || 0)));
      s = v.toFixed(d);
      if (/^-0(\.0*)?$/.test(s)) s = s.slice(1);
    }
    return comma() ? s.replace(".", ",") : s;
  }
  function fmtP(p) {
    if (p === null || p === undefined || !isFinite(p)) return "–";
    if (state.full) return String(p);
    if (p < 0.0001) return "<\u00a00.0001".replace(".", comma() ? "," : ".");
    const s = p.toFixed(p < 0.01 ? 4 : 3);
    return comma() ? s.replace(".", ",") : s;
  }
  function pct(level) { return (Math.round(level * 1000) / 10) + " %"; }
  // parseNum reads a setting typed with a decimal point or comma.
  function parseNum(s) {
    s = s.trim().replace(/\s/g, "");
    if (s === "") return null;
    if (/^[-+]?\d*[.,]?\d+([eE][-+]?\d+)?$/.test(s)) return Number(s.replace(",", "."));
    return NaN;
  }
  function unit() { return (state.report && state.report.input.unit) || ""; }

  // ---------- DOM helpers ----------
  function el(tag, attrs, ...kids) {
    const e = document.createElement(tag);
    if (attrs) for (const k in attrs) {
      if (k === "class") { if (attrs[k]) e.className = attrs[k]; }
      else if (k === "text") e.textContent = attrs[k];
      else if (k.startsWith("on")) e.addEventListener(k.slice(2), attrs[k]);
      else if (attrs[k] !== undefined && attrs[k] !== null && attrs[k] !== false) e.setAttribute(k, attrs[k]);
    }
    for (const k of kids) if (k !== null && k !== undefined && k !== false) e.append(k);
    return e;
  }
  // num is a number element: the shown text plus the exact value for scripts and tests.
  function num(v, extra, field) {
    return el("span", { class: "num", "data-value": String(v), "data-field": field, text: fmt(v, extra) });
  }
  function withUnit(node) {
    const u = unit();
    return u ? [node, el("span", { class: "unit", text: " " + u })] : [node];
  }
  function helpLinks(slugs) {
    const p = el("p", { class: "help" }, "Help: ");
    slugs.forEach(([slug, label], i) => {
      if (i) p.append(" · ");
      p.append(el("a", { href: "help/" + slug + ".html", target: "_blank", rel: "noopener", text: label }));
    });
    return p;
  }
  function table(head, rows, cls) {
    const t = el("table", { class: cls || "figs" });
    if (head) t.append(el("thead", null, el("tr", null, ...head.map((h) => el("th", { scope: "col", text: h })))));
    const tb = el("tbody");
    for (const r of rows) {
      const tr = el("tr");
      r.forEach((c, i) => {
        const cell = el(i === 0 && head ? "th" : "td", i === 0 && head ? { scope: "row" } : null);
        if (Array.isArray(c)) cell.append(...c); else if (c instanceof Node) cell.append(c); else cell.textContent = c;
        tr.append(cell);
      });
      tb.append(tr);
    }
    t.append(tb);
    return el("div", { class: "tablewrap" }, t); // narrow screens scroll the table, not the page
  }
  function intervalText(ci, extra) {
    if (!ci) return null;
    const p = el("p", { class: "interval" },
      pct(ci.level) + " confidence interval: ", num(ci.lo, extra, "lo"), " to ", num(ci.hi, extra, "hi"));
    if (unit()) p.append(" " + unit());
    if (ci.method) p.append(el("span", { class: "method", text: " (" + ci.method + ")" }));
    return p;
  }
  function notesFor(field) {
    return ((state.report && state.report.notes) || []).filter((n) => n.field === field || n.field.startsWith(field + "."));
  }
  function missing(field, what) {
    const ns = notesFor(field);
    const box = el("div", { class: "missing" });
    box.append(el("p", { text: ns.length ? what + " could not be computed for this data:" : what + ": not in this report. The engine gave no figures for this section." }));
    if (ns.length) box.append(el("ul", null, ...ns.map((n) => el("li", { text: n.text }))));
    return box;
  }

  // ---------- charts ----------
  // The engine's SVG text is parsed by the HTML parser of an inert
  // <template> (no script runs, nothing loads; the text in it is escaped by
  // the Go chart package): several times faster than DOMParser's XML parser
  // plus importNode, which took most of the page's rendering time.
  function chartFigure(key, caption) {
    const src = state.svg && state.svg[key];
    if (!src) return el("p", { class: "missing", text: "No chart: the report has no data for it." });
    const tpl = document.createElement("template");
    tpl.innerHTML = src;
    const svg = tpl.content.firstElementChild;
    if (!svg || svg.nodeName !== "svg" || tpl.content.childElementCount !== 1) return el("p", { class: "missing", text: "The chart could not be drawn." });
    const fig = el("figure", { class: "chart-fig", "data-chart": key, tabindex: "0",
      "aria-describedby": "kbd-" + key });
    fig.append(svg);
    const save = el("button", { type: "button", class: "small", text: "Save SVG", onclick: () => download(fileBase() + "-" + key + ".svg", src, "image/svg+xml") });
    fig.append(el("figcaption", null, el("span", { text: caption + " " }),
      el("span", { id: "kbd-" + key, class: "kbd-hint", text: "Tap or hover a point for its row; with the keyboard, arrow keys step through the points and Enter leaves one out or puts it back." }),
      save));
    return fig;
  }

  // Tap, hover and keyboard on points.
  const tip = $("tip");
  let tipRow = null, tipFig = null, tipIndex = -1;
  function pointsOf(fig) { return Array.from(fig.querySelectorAll("[data-row]")); }
  function showTip(pt, fig, x, y) {
    document.querySelectorAll(".pt.hl").forEach((p) => p.classList.remove("hl"));
    pt.classList.add("hl");
    const row = Number(pt.getAttribute("data-row"));
    const title = pt.querySelector("title");
    tip.replaceChildren(
      el("span", { text: title ? title.textContent : "row " + row }),
      el("button", { type: "button", class: "small", text: state.exclude.has(row) ? "Put back" : "Leave out",
        onclick: () => { toggleExclude(row); hideTip(); } }));
    tip.hidden = false;
    const r = fig.getBoundingClientRect();
    if (x === undefined) { const b = pt.getBoundingClientRect(); x = b.left + b.width / 2; y = b.top; }
    const left = Math.min(Math.max(8, x - 20), window.innerWidth - 260);
    tip.style.left = (left + window.scrollX) + "px";
    tip.style.top = (Math.max(y, r.top) + window.scrollY - 56) + "px";
    tipRow = row; tipFig = fig;
  }
  function hideTip() {
    tip.hidden = true; tipRow = null;
    document.querySelectorAll(".pt.hl").forEach((p) => p.classList.remove("hl"));
  }
  document.addEventListener("pointerover", (ev) => {
    if (ev.pointerType !== "mouse") return;
    const pt = ev.target.closest && ev.target.closest(".chart-fig [data-row]");
    if (pt) showTip(pt, pt.closest(".chart-fig"), ev.clientX, ev.clientY);
  });
  document.addEventListener("click", (ev) => {
    const pt = ev.target.closest && ev.target.closest(".chart-fig [data-row]");
    if (pt) { showTip(pt, pt.closest(".chart-fig"), ev.clientX, ev.clientY); return; }
    if (!tip.contains(ev.target)) hideTip();
  });
  document.addEventListener("keydown", (ev) => {
    if (ev.key === "Escape") { hideTip(); return; }
    const fig = ev.target.closest && ev.target.closest(".chart-fig");
    if (!fig || ev.target !== fig) return;
    const pts = pointsOf(fig);
    if (!pts.length) return;
    if (ev.key === "ArrowRight" || ev.key === "ArrowDown" || ev.key === "ArrowLeft" || ev.key === "ArrowUp") {
      ev.preventDefault();
      if (tipFig !== fig) tipIndex = -1;
      const fwd = ev.key === "ArrowRight" || ev.key === "ArrowDown";
      tipIndex = (tipIndex + (fwd ? 1 : -1) + pts.length) % pts.length;
      showTip(pts[tipIndex], fig);
    } else if (ev.key === "Enter" && tipRow !== null && tipFig === fig) {
      ev.preventDefault();
      toggleExclude(tipRow);
    }
  });

  // ---------- input ----------
  const data = $("data");
  function resetForNewData() {
    state.exclude.clear();
    state.allSuspects = false;
    state.leaveOutRows = []; state.leaveOutText = ""; $("leave-out").value = "";
    state.cols = { value: "", group: "", order: "", subgroup: "" };
  }

  function readSettings() {
    const o = { confidence: Number($("confidence").value), quantile: $("quantile").value };
    if ($("decimal-mark").value) o.decimalMark = $("decimal-mark").value;
    const errs = [];
    for (const [id, key, label] of [["target", "target", "Target"], ["lsl", "lsl", "LSL"], ["usl", "usl", "USL"]]) {
      const v = parseNum($(id).value);
      $(id).removeAttribute("aria-invalid");
      if (v === null) continue;
      if (isNaN(v)) { errs.push(label + " \u201c" + $(id).value + "\u201d is not a number: type it like 5.0 or 5,0."); $(id).setAttribute("aria-invalid", "true"); continue; }
      o[key] = v;
    }
    if (o.lsl !== undefined && o.usl !== undefined && !(o.lsl < o.usl)) {
      errs.push("LSL must be below USL."); $("lsl").setAttribute("aria-invalid", "true"); $("usl").setAttribute("aria-invalid", "true");
    }
    const lo = $("leave-out").value.trim();
    $("leave-out").removeAttribute("aria-invalid");
    if (lo !== (state.leaveOutText || "")) {
      const rows = lo === "" ? [] : lo.split(/[\s,;]+/).filter(Boolean);
      if (rows.every((r) => /^\d+$/.test(r))) {
        for (const r of state.leaveOutRows || []) state.exclude.delete(r);
        state.leaveOutRows = rows.map(Number);
        for (const r of state.leaveOutRows) state.exclude.add(r);
        state.leaveOutText = lo;
      } else {
        errs.push("Leave out rows: type row numbers separated by commas, e.g. 12, 40.");
        $("leave-out").setAttribute("aria-invalid", "true");
      }
    }
    const u = $("unit").value.trim();
    if (u) o.unit = u;
    if (state.exclude.size) o.exclude = Array.from(state.exclude).sort((a, b) => a - b);
    const box = $("settings-error");
    box.hidden = !errs.length;
    box.textContent = errs.join(" ");
    return errs.length ? null : o;
  }

  function buildRequest(options) {
    const req = { schema: SCHEMA, options };
    for (const k of ["value", "group", "order", "subgroup"]) if (state.cols[k]) req[k] = state.cols[k];
    if (state.source === "text") req.text = state.text;
    return req;
  }

  let runToken = 0;
  async function analyseNow(t0) {
    const options = readSettings();
    if (!options || !state.source) return;
    const token = ++runToken;
    const start = t0 || performance.now();
    setBusy(true, "Analysing…");
    let m;
    try {
      state.sentAt = performance.timeOrigin + performance.now();
      m = await call({ type: "run", request: buildRequest(options), useTable: state.source === "file" });
    } catch (e) {
      if (token === runToken) { setBusy(false); setStatus(String(e.message || e), true); }
      return;
    }
    if (token !== runToken) return; // a newer run superseded this one
    const t1 = performance.now();
    const res = JSON.parse(m.json);
    setBusy(false);
    if (res.error) {
      setStatus(res.error, true);
      $("report").hidden = true;
      document.body.dataset.state = "error";
      return;
    }
    state.report = res;
    state.svg = m.svg || {};
    state.when = new Date();
    render();
    const t2 = performance.now();
    state.analyses++;
    state.timing = { engineMs: t1 - start, workerMs: m.ms, renderMs: t2 - t1, totalMs: t2 - start };
    if (m.at) {
      state.timing.toWorkerMs = m.at[0] - state.sentAt;
      state.timing.fromWorkerMs = performance.timeOrigin + t1 - m.at[1];
      state.timing.beforeSendMs = state.sentAt - (performance.timeOrigin + start);
    }
    const rep = state.report;
    setStatus("Analysed " + rep.counts.used + " values" + (rep.counts.excluded ? " (" + rep.counts.excluded + " left out by you)" : "") +
      " in " + Math.round(t2 - start) + " ms. " + rep.input.summary);
    document.body.dataset.state = "report";
    document.body.dataset.analysed = String(state.analyses);
  }

  function setBusy(on, msg) {
    state.busy = on ? 1 : 0;
    $("analyse").disabled = false;
    if (on && msg) setStatus(msg);
  }

  // A large paste is kept out of the text box: laying out tens of thousands
  // of lines in a textarea takes the page longer than the whole analysis.
  const BIG_PASTE = 20000; // characters
  let bigText = "";
  function currentText() { return data.value.trim() === "" && bigText ? bigText : data.value; }
  function holdBigText(text) {
    bigText = text;
    data.value = "";
    const lines = (text.match(/\n/g) || []).length + 1;
    data.placeholder = "Pasted " + lines.toLocaleString() + " lines (" + sizeText(text.length) + "); kept out of this box so the page stays quick. Press \u201cEdit the pasted text\u201d to change them, or paste again to replace them.";
    $("edit-big").hidden = false;
  }
  function dropBigText() {
    bigText = "";
    $("edit-big").hidden = true;
    data.placeholder = "5.12\n5.08\n5.10\n\u2026";
  }

  function analyseText(t0) {
    const text = currentText();
    if (!text.trim()) { setStatus("Nothing to analyse: paste values into the box, open a file or try the demo.", true); return; }
    if (state.source !== "text" || text !== state.text) {
      if (state.source === "file") call({ type: "forget" });
      resetForNewData();
      state.source = "text"; state.file = null; state.text = text; state.hasTable = false;
    }
    showPreview(text, "");
    return analyseNow(t0);
  }

  async function analyseFile(file) {
    if (!file) return;
    resetForNewData();
    state.source = "file"; state.file = file; state.text = ""; state.hasTable = false;
    const t0 = performance.now();
    const box = $("reading"), bar = $("progress");
    $("progress-label").textContent = "Reading " + file.name + " (" + sizeText(file.size) + ")…";
    bar.value = 0; bar.max = Math.max(1, file.size);
    box.hidden = false;
    document.body.dataset.state = "reading";
    setStatus("Reading " + file.name + "…");
    let m;
    try {
      m = await call({ type: "file", file }, (read, total) => {
        bar.value = read;
        bar.setAttribute("aria-valuetext", Math.round(100 * read / Math.max(1, total)) + " %");
      });
    } catch (e) {
      box.hidden = true;
      setStatus(String(e.message || e), true);
      return;
    }
    if (m.type === "cancelled") {
      box.hidden = true;
      state.source = null; state.file = null;
      setStatus("Reading cancelled. Nothing was analysed.");
      document.body.dataset.state = "cancelled";
      return;
    }
    const info = JSON.parse(m.json);
    if (info.error) {
      box.hidden = true;
      state.source = null;
      setStatus(info.error, true);
      document.body.dataset.state = "error";
      return;
    }
    state.hasTable = true;
    $("progress-label").textContent = "Analysing " + file.name + "…";
    data.value = "";
    dropBigText();
    data.placeholder = "Showing " + file.name + " (read from the file; paste here to analyse other data instead)";
    showPreview(m.preview || "", file.name);
    const readMs = performance.now() - t0;
    await analyseNow(t0);
    box.hidden = true;
    if (state.timing) state.timing.readMs = readMs;
  }

  function sizeText(b) {
    if (b < 1024) return b + " bytes";
    if (b < 1048576) return (b / 1024).toFixed(0) + " kB";
    return (b / 1048576).toFixed(1) + " MB";
  }

  $("cancel").addEventListener("click", () => {
    if (!engine) return;
    engine.postMessage({ type: "cancel" });
    // If the worker is inside a long computation it cannot hear the cancel:
    // end it after a moment and start a fresh one.
    const before = state.analyses;
    setTimeout(() => {
      if (!$("reading").hidden && state.analyses === before) {
        restartEngine("Cancelled.");
        $("reading").hidden = true;
        setStatus("Cancelled. Nothing was analysed.");
        document.body.dataset.state = "cancelled";
      }
    }, 600);
  });

  // Preview: the first lines as cells, with problem rows marked.
  let previewLines = [], previewName = "";
  function showPreview(text, name) {
    const lines = text.split(/\r\n|\n|\r/, 41);
    if (lines.length > 40) lines.length = 40;
    else if (lines.length && lines[lines.length - 1] === "") lines.pop(); // the final line break
    previewLines = lines; previewName = name;
    renderPreview();
  }
  function renderPreview() {
    const box = $("preview-box"), t = $("preview");
    if (!previewLines.length) { box.hidden = true; return; }
    const problems = new Map();
    if (state.report && state.report.input.problems) {
      for (const p of state.report.input.problems) if (!problems.has(p.row)) problems.set(p.row, p);
    }
    const sep = previewLines.some((l) => l.includes("\t")) ? "\t" : previewLines.some((l) => l.includes(";")) ? ";" : previewLines.filter((l) => l.includes(",")).length > previewLines.length / 2 && previewLines.some((l) => /,\s*\S/.test(l) && !/^\s*-?\d+,\d+\s*$/.test(l)) ? "," : null;
    const tb = el("tbody");
    previewLines.forEach((line, i) => {
      const row = i + 1;
      const p = problems.get(row);
      const tr = el("tr", { class: p ? "problem" : null });
      tr.append(el("th", { scope: "row", text: String(row) }));
      const cells = sep ? line.split(sep) : [line];
      for (const c of cells) tr.append(el("td", { text: c }));
      if (p) tr.append(el("td", { class: "why-cell", text: "\u26a0 " + (p.column ? p.column + ": " : "") + p.reason + " (" + p.action + ")" }));
      tb.append(tr);
    });
    t.replaceChildren(el("caption", { class: "visually-hidden", text: "First rows of the data; rows with a cell not used are marked" }), tb);
    const np = state.report && state.report.input.problems ? state.report.input.problems.length : 0;
    $("preview-note").textContent = "(" + (previewName ? previewName + ", " : "") + "first " + previewLines.length + " rows" + (np ? "; " + np + (np === 1 ? " cell" : " cells") + " not used, listed in the report" : "") + ")";
    box.hidden = false;
  }

  // Column pickers.
  function fillColumns() {
    const cols = (state.report && state.report.input.columns) || [];
    const fs = $("columns");
    if (cols.length < 2) { fs.hidden = true; return; }
    fs.hidden = false;
    const cur = { value: state.report.input.column, group: state.cols.group, order: state.cols.order, subgroup: state.cols.subgroup };
    for (const k of ["value", "group", "order", "subgroup"]) {
      const s = $("col-" + k);
      const opts = k === "value" ? [] : [el("option", { value: "", text: "(none)" })];
      for (const c of cols) {
        const label = c.name + (c.unit ? " (" + c.unit + ")" : "") + (k === "value" ? " \u2013 " + c.numbers + " numbers" : "");
        opts.push(el("option", { value: c.name, text: label }));
      }
      s.replaceChildren(...opts);
      s.value = cur[k] || "";
    }
  }
  for (const k of ["value", "group", "order", "subgroup"]) {
    $("col-" + k).addEventListener("change", (ev) => {
      state.cols[k] = ev.target.value;
      if (k === "value") { state.exclude.clear(); state.cols.value = ev.target.value; }
      analyseNow();
    });
  }

  // ---------- exclusions ----------
  function toggleExclude(row) {
    if (state.exclude.has(row)) state.exclude.delete(row); else state.exclude.add(row);
    // keep the typed list in step with the switches
    state.leaveOutRows = (state.leaveOutRows || []).filter((r) => state.exclude.has(r));
    state.leaveOutText = state.leaveOutRows.join(", ");
    $("leave-out").value = state.leaveOutText;
    analyseNow();
  }
  function renderExclusions() {
    const rep = state.report;
    const list = (rep && rep.settings.excluded) || [];
    const ul = $("exclusion-list");
    const known = new Set(list.map((r) => r.row));
    const items = list.map((r) => el("li", null,
      el("span", { text: "Row " + r.row + ": " + r.text + (unit() ? " " + unit() : "") + " " }),
      el("button", { type: "button", class: "small", text: "Put back", "aria-label": "Put back row " + r.row, onclick: () => toggleExclude(r.row) })));
    // rows asked for that the engine did not find (e.g. after a column change)
    for (const row of state.exclude) if (!known.has(row)) items.push(el("li", null,
      el("span", { text: "Row " + row + " (no value in this column) " }),
      el("button", { type: "button", class: "small", text: "Forget", onclick: () => toggleExclude(row) })));
    ul.replaceChildren(...items);
    $("exclusions").hidden = !items.length;
  }

  // ---------- report ----------
  function quoteIsMedian() { return state.report.verdict && state.report.verdict.quote === "median-iqr"; }

  function card(id, title, ...kids) {
    return el("article", { class: "card" + (id.endsWith(" placeholder") ? " placeholder" : ""), id: "card-" + id.split(" ")[0], "aria-labelledby": "card-" + id.split(" ")[0] + "-h" },
      el("h3", { id: "card-" + id.split(" ")[0] + "-h", text: title }), ...kids);
  }
  function quote(label, v, extra, field) {
    return el("p", { class: "quote" }, el("span", { class: "quote-label", text: label + " " }), ...withUnit(Object.assign(num(v, extra, field), { className: "num big" })));
  }

  function render() {
    const rep = state.report;
    hideTip();
    const cards = [verdictCard(rep), dataCard(rep), centreCard(rep), spreadCard(rep), suspectsCard(rep), shapeCard(rep), specCard(rep), timeCard(rep), groupsCard(rep)];
    if (rep.notes && rep.notes.length) cards.push(card("notes", "Notes", el("ul", null, ...rep.notes.map((n) => el("li", null, el("code", { text: n.field }), " " + n.text)))));
    $("cards").replaceChildren(...cards);
    $("print-head").replaceChildren(...printHead(rep));
    fillColumns();
    renderExclusions();
    renderPreview();
    $("report").hidden = false;
    $("share-box").hidden = true;
  }

  function verdictCard(rep) {
    const v = rep.verdict || {};
    const med = quoteIsMedian();
    const kids = [];
    if (med && rep.centre && rep.spread) {
      kids.push(el("p", { class: "lead" }, "Quote the median, ", ...withUnit(num(rep.centre.median, 1, "verdict-median")), ", and the interquartile range, ", ...withUnit(num(rep.spread.iqr, 1, "verdict-iqr")), "."));
    } else if (rep.centre && rep.spread) {
      kids.push(el("p", { class: "lead" }, "Quote the mean, ", ...withUnit(num(rep.centre.mean, 2, "verdict-mean")), ", and the standard deviation, ", ...withUnit(num(rep.spread.sd, 2, "verdict-sd")), "."));
    } else {
      kids.push(el("p", { class: "lead", text: "No centre or spread could be computed: see the notes below." }));
    }
    kids.push(el("p", { class: "basis", text: rep.counts.used + " values used" +
      (rep.counts.excluded ? ", " + rep.counts.excluded + " left out by you" : "") +
      (rep.counts.rejected ? ", " + rep.counts.rejected + " cells not numbers" : "") +
      (rep.counts.missing ? ", " + rep.counts.missing + " empty" : "") + "." }));
    if (v.reasons && v.reasons.length) kids.push(el("ul", { class: "reasons" }, ...v.reasons.map((r) => el("li", { "data-code": r.code, text: r.text }))));
    if (v.warnings && v.warnings.length) kids.push(el("ul", { class: "warnings", "aria-label": "Warnings" }, ...v.warnings.map((r) => el("li", { "data-code": r.code }, el("strong", { text: "Warning: " }), r.text))));
    kids.push(el("p", { class: "caution" }, el("strong", { text: "Caution: " }),
      v.caution || "For safety-critical parts, legal net quantity or medical products, follow your local regulations, codes and licensed practice; this report supports, and does not replace, that judgement."));
    kids.push(helpLinks([["verdict", "how the verdict is reached"], ["reading-your-report", "reading your report"], ["cautions", "cautions"]]));
    return card("verdict", "Verdict", ...kids);
  }

  function dataCard(rep) {
    const c = rep.counts;
    const rows = [["Values used", el("span", { class: "num", "data-field": "used", "data-value": String(c.used), text: String(c.used) })], ["Empty cells", String(c.missing)], ["Cells not numbers", String(c.rejected)],
      ["Left out by you", String(c.excluded)], ["Distinct values", String(c.distinct)]];
    if (c.resolution) rows.push(["Resolution (smallest step as typed)", [num(c.resolution, 0, "resolution")].concat(unit() ? [" " + unit()] : [])]);
    rows.push(["Fingerprint (SHA-256 of the input as read)", el("code", { class: "fp", text: rep.input.fingerprint })]);
    const kids = [
      el("p", { class: "quote" }, el("span", { class: "quote-label", text: "Column " }), el("strong", { class: "colname", text: rep.input.column || "value" }), rep.input.unit ? " (" + rep.input.unit + ")" : ""),
      el("p", { text: rep.input.summary }),
      table(null, rows, "figs kv"),
    ];
    const probs = rep.input.problems || [];
    if (probs.length) {
      const shown = probs.slice(0, 300);
      kids.push(el("details", { class: "problems", open: probs.length <= 20 ? "" : null },
        el("summary", { text: probs.length + (probs.length === 1 ? " cell" : " cells") + " not used, by row" }),
        table(["Row", "Column", "As typed", "Why", "What was done"], shown.map((p) => [String(p.row), p.column || "", p.text || "", p.reason, p.action]), "figs problems-t"),
        probs.length > shown.length ? el("p", { text: "First " + shown.length + " shown; all " + probs.length + " are in the CSV below and in the report JSON." }) : null,
        el("button", { type: "button", class: "small", text: "Download the unused cells (CSV)", onclick: () => downloadProblems() })));
    }
    kids.push(helpLinks([["data-formats", "data formats"], ["resolution", "resolution"], ["privacy", "privacy"]]));
    return card("data", "What was read", ...kids);
  }

  function centreCard(rep) {
    const c = rep.centre;
    if (!c) return card("centre", "Centre", missing("centre", "The centre"), helpLinks([["mean", "mean"], ["median", "median"]]));
    const med = quoteIsMedian();
    const kids = med
      ? [quote("Median", c.median, 1, "median"), intervalText(c.medianCI, 1),
         el("p", { class: "why", text: "The median is quoted because the data are skewed or hold far-out readings: half the parts lie on each side of it, and a few extreme values cannot pull it." })]
      : [quote("Mean", c.mean, 2, "mean"), intervalText(c.meanCI, 2),
         el("p", { class: "why", text: "The mean is quoted because the data look roughly symmetric and free of far-out readings: it uses every value, so it is the most precise centre here." })];
    const rows = [["Mean", num(c.mean, 2, "mean-all")], ["Median", num(c.median, 1, "median-all")], ["Trimmed mean (10 % each end)", num(c.trimmed10, 2, "trimmed10")]];
    if (c.meanCI) rows.push(["Mean, " + pct(c.meanCI.level) + " interval", [num(c.meanCI.lo, 2), " to ", num(c.meanCI.hi, 2)]]);
    if (c.medianCI) rows.push(["Median, " + pct(c.medianCI.level) + " interval", [num(c.medianCI.lo, 1), " to ", num(c.medianCI.hi, 1)]]);
    if (c.modes && c.modes.length) rows.push(["Most repeated value", c.modes.slice(0, 5).map((m) => m.text + " (" + m.count + "\u00d7)").join(", ")]);
    else if (c.modeNote) rows.push(["Most repeated value", c.modeNote]);
    if (c.modalClass && (c.modalClass[0] || c.modalClass[1])) rows.push(["Fullest histogram bin", [num(c.modalClass[0], 1), " to ", num(c.modalClass[1], 1)]]);
    kids.push(chartFigure("histogram", "Histogram with the fitted normal curve; target and specification limits as labelled lines when given."));
    kids.push(el("details", null, el("summary", { text: "All centre figures" }), table(["Figure", "Value"], rows)));
    kids.push(helpLinks([["mean", "mean"], ["median", "median"], ["trimmed-mean", "trimmed mean"], ["mode", "mode"], ["confidence-intervals", "confidence intervals"], ["histogram", "histogram"]]));
    return card("centre", "Centre", ...kids);
  }

  function spreadCard(rep) {
    const s = rep.spread;
    if (!s) return card("spread", "Spread", missing("spread", "The spread"), helpLinks([["standard-deviation", "standard deviation"], ["range-iqr", "range and IQR"]]));
    const med = quoteIsMedian();
    const kids = med
      ? [quote("Interquartile range", s.iqr, 1, "iqr"),
         el("p", { class: "why", text: "The interquartile range is quoted with the median: it spans the middle half of the parts and ignores the extremes that distort the standard deviation." })]
      : [quote("Standard deviation", s.sd, 2, "sd"), intervalText(s.sdCI, 2),
         el("p", { class: "why", text: "The standard deviation is quoted with the mean: for roughly normal data it is the most efficient measure of spread, and capability indices build on it." })];
    const rows = [["Standard deviation (n \u2212 1)", num(s.sd, 2, "sd-all")], ["Variance", num(s.variance, 3, "variance")], ["Range", num(s.range, 0, "range")],
      ["Interquartile range", num(s.iqr, 1, "iqr-all")], ["MAD (scaled, \u00d71.4826)", num(s.mad, 2, "mad")], ["Standard error of the mean", num(s.sem, 2, "sem")]];
    if (s.sdCI) rows.push(["SD, " + pct(s.sdCI.level) + " interval", [num(s.sdCI.lo, 2), " to ", num(s.sdCI.hi, 2)]]);
    if (s.cv !== undefined && s.cv !== null) rows.push(["Coefficient of variation", el("span", { class: "num", "data-value": String(s.cv), text: (state.full ? String(s.cv * 100) : (s.cv * 100).toFixed(2)).replace(".", comma() ? "," : ".") + " %" })]);
    if (s.popSD !== undefined && s.popSD !== null) rows.push(["SD with divisor n", num(s.popSD, 2, "popSD")]);
    kids.push(el("details", null, el("summary", { text: "All spread figures" }), table(["Figure", "Value"], rows)));
    const q = rep.quantiles;
    if (q) {
      const qrows = [["Minimum", num(q.min, 0)], ["Q1", num(q.q1, 1)], ["Median", num(q.median, 1)], ["Q3", num(q.q3, 1)], ["Maximum", num(q.max, 0)]];
      for (const p of q.percentiles || []) qrows.push([p.p + "th percentile", num(p.value, 1)]);
      const d = el("details", null, el("summary", { text: "Quantiles (" + q.method + ")" }), table(["Quantile", "Value"], qrows));
      if (q.all && q.all.length) d.append(el("p", { text: "Quartiles under every definition:" }),
        table(["Definition", "Q1", "Median", "Q3"], q.all.map((a) => [a.method, num(a.q1, 1), num(a.median, 1), num(a.q3, 1)])));
      if (q.sensitive) d.append(el("p", { class: "warn-text" }, el("strong", { text: "Note: " }), q.note || "Another quartile definition would flag different readings."));
      kids.push(d);
    } else kids.push(missing("quantiles", "Quantiles"));
    kids.push(helpLinks([["standard-deviation", "standard deviation"], ["range-iqr", "range and IQR"], ["mad", "MAD"], ["cv", "CV"], ["sem", "standard error"], ["quantiles", "quantiles"]]));
    return card("spread", "Spread", ...kids);
  }

  function suspectsCard(rep) {
    const links = helpLinks([["tukey-fences", "Tukey's fences"], ["adjusted-boxplot", "adjusted box plot"], ["modified-z", "modified z-score"], ["gesd", "generalized ESD"], ["box-plot", "box plot"]]);
    const s = rep.suspects;
    const excl = (rep.settings.excluded || []);
    const kids = [];
    if (!s) {
      kids.push(missing("suspects", "The suspect-reading rules"));
    } else {
      const n = s.readings.length;
      kids.push(el("p", { class: "quote" }, el("span", { class: "quote-label", text: "Flagged readings " }), el("span", { class: "num big", "data-field": "suspects", "data-value": String(n), text: String(n) })));
      kids.push(el("p", { class: "why", text: "Each reading is checked by several standard rules; one flagged by more than one rule deserves a look at the part or the gauge. Nothing is removed unless you choose to leave it out, and every exclusion is listed in the report." }));
      if (n) {
        const shown = state.allSuspects || n <= 50 ? s.readings : s.readings.slice(0, 50);
        kids.push(table(["Row", "As typed", "Rules that flag it", "In the analysis"], shown.map((r) => {
          const out = state.exclude.has(r.row);
          return [String(r.row), r.text + (unit() ? " " + unit() : ""),
            el("ul", { class: "flags" }, ...(r.flags || []).map((f) => el("li", { "data-rule": f.rule, text: f.text || f.rule }))),
            [el("span", { class: out ? "state out" : "state in", text: out ? "left out" : "used" }),
              el("button", { type: "button", class: "toggle", "aria-pressed": out ? "true" : "false", "data-row": String(r.row),
                "aria-label": (out ? "Put back row " : "Leave out row ") + r.row, text: out ? "Put back" : "Leave out",
                onclick: () => toggleExclude(r.row) })]];
        }), "figs suspects-t"));
        if (shown.length < n) kids.push(el("button", { type: "button", class: "small", text: "Show all " + n + " flagged readings",
          onclick: () => { state.allSuspects = true; render(); } }));
      } else kids.push(el("p", { text: "No reading is flagged by any of the rules." }));
      if (s.rules && s.rules.length) kids.push(el("details", null, el("summary", { text: "The rules as applied" }),
        table(["Rule", "Lower limit", "Upper limit", "Flags", "Note"], s.rules.map((r) => [r.name || r.code,
          r.lo !== undefined && r.lo !== null ? num(r.lo, 1) : "\u2013", r.hi !== undefined && r.hi !== null ? num(r.hi, 1) : "\u2013", String(r.count), r.note || ""]))));
    }
    if (excl.length) kids.push(el("div", { class: "excluded" }, el("h4", { text: "Left out by you" }),
      el("ul", null, ...excl.map((r) => el("li", null, "Row " + r.row + ": " + r.text + " ",
        el("button", { type: "button", class: "small", text: "Put back", "aria-label": "Put back row " + r.row, onclick: () => toggleExclude(r.row) }))))));
    kids.push(chartFigure("box", "Box plot: box from Q1 to Q3 with the median; whiskers to the last values inside the inner fences; flagged readings labelled by row."));
    kids.push(links);
    return card("suspects", "Suspect readings", ...kids);
  }

  function testRows(tests) {
    return tests.filter(Boolean).map((t) => [t.name, num(t.statistic, 3), t.df !== undefined && t.df !== null ? num(t.df, 0) : "\u2013", fmtP(t.p), t.method || ""]);
  }
  function shapeCard(rep) {
    const sh = rep.shape;
    const links = helpLinks([["skewness-kurtosis", "skewness and kurtosis"], ["dagostino", "D'Agostino-Pearson"], ["shapiro-wilk", "Shapiro-Wilk"], ["anderson-darling", "Anderson-Darling"], ["probability-plot", "probability plot"]]);
    if (!sh) return card("shape", "Shape", missing("shape", "The shape statistics"), chartFigure("probplot", "Normal probability plot."), links);
    const kids = [];
    const main = sh.shapiroWilk || sh.large || sh.andersonDarling || sh.omnibus;
    if (main) {
      kids.push(el("p", { class: "quote" }, el("span", { class: "quote-label", text: main.name + " p-value " }), el("span", { class: "num big", "data-field": "normality-p", "data-value": String(main.p), text: fmtP(main.p) })));
      kids.push(el("p", { class: "why", text: main.p < 0.05
        ? "A small p-value says the data are unlikely to come from a normal distribution; figures that assume normality (the mean's interval, capability) need care."
        : "No clear departure from a normal distribution is detected; with few values a test finds only large departures, so look at the plot too." }));
    }
    const rows = [];
    if (sh.skewness) rows.push(["Skewness (G1)", [num(sh.skewness.value, 3), " \u00b1 ", num(sh.skewness.se, 3)], sh.skewness.test ? fmtP(sh.skewness.test.p) : "\u2013"]);
    if (sh.kurtosis) rows.push(["Excess kurtosis (G2)", [num(sh.kurtosis.value, 3), " \u00b1 ", num(sh.kurtosis.se, 3)], sh.kurtosis.test ? fmtP(sh.kurtosis.test.p) : "\u2013"]);
    if (rows.length) kids.push(table(["Figure", "Value \u00b1 SE", "p"], rows));
    const tests = testRows([sh.shapiroWilk, sh.andersonDarling, sh.omnibus, sh.large]);
    if (tests.length) kids.push(table(["Test", "Statistic", "df", "p", "Method"], tests));
    kids.push(chartFigure("probplot", "Normal probability plot: points near the straight line suggest a normal shape; the dashed band shows the usual scatter."));
    kids.push(links);
    return card("shape", "Shape", ...kids);
  }

  function specCard(rep) {
    const st = rep.settings;
    const kids = [];
    const links = helpLinks([["t-test", "t test"], ["wilcoxon", "Wilcoxon signed-rank"], ["cautions", "cautions"]]);
    if (rep.target) {
      const t = rep.target;
      kids.push(el("p", { class: "quote" }, el("span", { class: "quote-label", text: "Target " }), ...withUnit(num(t.value, 0, "target"))));
      if (t.statement) kids.push(el("p", { class: "lead-small", text: t.statement }));
      const tests = testRows([t.t, t.wilcoxon]);
      if (tests.length) kids.push(table(["Test", "Statistic", "df", "p", "Method"], tests));
      kids.push(el("p", { class: "why", text: "The t test compares the mean with the target; the Wilcoxon signed-rank test compares the centre without assuming a normal shape." }));
    } else if (st.target !== undefined && st.target !== null) {
      kids.push(missing("target", "The comparison with the target"));
    } else {
      kids.push(el("p", { class: "needs", text: "To compare the centre with a nominal value, give a Target in Settings." }));
    }
    if (st.lsl === undefined && st.usl === undefined || st.lsl === null && st.usl === null) {
      kids.push(el("p", { class: "needs", text: "To see the fraction out of specification and the capability indices, give the lower and upper specification limits (LSL, USL) in Settings." }));
    } else {
      kids.push(el("p", { class: "needs" }, "Limits: ",
        st.lsl !== undefined && st.lsl !== null ? el("span", null, "LSL ", num(st.lsl, 0, "lsl")) : "no LSL", ", ",
        st.usl !== undefined && st.usl !== null ? el("span", null, "USL ", num(st.usl, 0, "usl")) : "no USL",
        ". They are drawn on the histogram and the run chart. The fraction out of specification and the capability indices are not computed in this version of Lotlens."));
    }
    kids.push(links);
    const empty = !rep.target && (st.target === undefined || st.target === null) && (st.lsl === undefined || st.lsl === null) && (st.usl === undefined || st.usl === null);
    return card(empty ? "spec placeholder" : "spec", "Against the spec", ...kids);
  }

  function timeCard(rep) {
    const kids = [chartFigure("run", "Run chart: values in data order with the median; flagged readings marked.")];
    kids.push(el("p", { class: "why", text: "Values in the order they were recorded show drifts, steps and cycles that the histogram hides. Long runs on one side of the median suggest the process moved." }));
    kids.push(el("p", { class: "needs", text: state.cols.order
      ? "Stability checks over the chosen order column (control limits, run rules) are not computed in this version; the run chart uses data order."
      : "For control limits and run rules over time, choose an order or time column under Columns (the chart above uses the order of the rows)." }));
    kids.push(helpLinks([["run-chart", "run chart"]]));
    return card("time", "Over time", ...kids);
  }

  function groupsCard(rep) {
    return card("groups placeholder", "Groups",
      el("p", { class: "needs", text: state.cols.group
        ? "Comparing the groups of the chosen column is not computed in this version of Lotlens."
        : "To compare lines, shifts or suppliers, choose a group column under Columns (data with more than one column)." }),
      helpLinks([["reading-your-report", "reading your report"]]));
  }

  function settingsLines(rep) {
    const st = rep.settings, out = [];
    out.push("Confidence level: " + pct(st.confidence || 0.95));
    out.push("Quartile definition: " + (st.quantile || ""));
    if (unit()) out.push("Unit: " + unit());
    if (st.target !== undefined && st.target !== null) out.push("Target: " + fmt(st.target, 0));
    if (st.lsl !== undefined && st.lsl !== null) out.push("LSL: " + fmt(st.lsl, 0));
    if (st.usl !== undefined && st.usl !== null) out.push("USL: " + fmt(st.usl, 0));
    return out;
  }
  function sourceText() { return state.source === "file" && state.file ? "file " + state.file.name : "pasted text"; }
  function printHead(rep) {
    const excl = rep.settings.excluded || [];
    return [
      el("h2", { class: "print-title", text: "Lotlens report: " + (rep.input.column || "value") + (unit() ? " (" + unit() + ")" : "") }),
      el("p", { text: "Made " + state.when.toLocaleString() + " from " + sourceText() + "; " + rep.counts.used + " values used." }),
      el("p", null, "Data fingerprint (SHA-256 of the input as read): ", el("code", { text: rep.input.fingerprint })),
      el("p", { text: "Settings: " + settingsLines(rep).join("; ") + "." }),
      el("p", { text: excl.length ? "Left out by the user: " + excl.map((r) => "row " + r.row + " (" + r.text + ")").join(", ") + "." : "No reading left out by the user." }),
    ];
  }

  // ---------- outputs ----------
  function fileBase() {
    const name = (state.report && state.report.input.column || "data").replace(/[^A-Za-z0-9._-]+/g, "-").replace(/^-+|-+$/g, "").slice(0, 40) || "data";
    return "lotlens-" + name;
  }
  function download(name, content, type) {
    const url = URL.createObjectURL(new Blob([content], { type }));
    const a = el("a", { href: url, download: name });
    document.body.append(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 10000);
    setStatus("Saved " + name + ".");
  }
  function csvCell(v) {
    let s = String(v === undefined || v === null ? "" : v);
    if (/^[=+@\t\r]/.test(s)) s = "'" + s; // keep spreadsheets from running it as a formula
    return '"' + s.replace(/"/g, '""') + '"';
  }
  function suspectsCSV() {
    const rep = state.report;
    const lines = [["row", "column", "as_typed", "value", "rules", "left_out"].join(",")];
    const rs = (rep.suspects && rep.suspects.readings) || [];
    for (const r of rs) lines.push([r.row, r.column || rep.input.column, r.text, r.value, (r.flags || []).map((f) => f.rule).join(" "), state.exclude.has(r.row) ? "yes" : "no"].map(csvCell).join(","));
    for (const r of rep.settings.excluded || []) if (!rs.some((s) => s.row === r.row)) lines.push([r.row, r.column || rep.input.column, r.text, r.value, "", "yes"].map(csvCell).join(","));
    return lines.join("\r\n") + "\r\n";
  }
  function downloadProblems() {
    const ps = state.report.input.problems || [];
    const lines = ["row,column,as_typed,kind,reason,action"].concat(ps.map((p) => [p.row, p.column, p.text, p.kind, p.reason, p.action].map(csvCell).join(",")));
    download(fileBase() + "-unused-cells.csv", lines.join("\r\n") + "\r\n", "text/csv");
  }

  function summaryText() {
    const rep = state.report, L = [];
    const u = unit() ? " " + unit() : "";
    L.push("Lotlens report: " + (rep.input.column || "value") + (u ? " (" + unit() + ")" : ""));
    L.push("Made " + state.when.toLocaleString() + " from " + sourceText());
    L.push("Data fingerprint (SHA-256): " + rep.input.fingerprint);
    L.push(rep.input.summary);
    L.push("");
    if (rep.centre && rep.spread) {
      if (quoteIsMedian()) L.push("Quote: median " + fmt(rep.centre.median, 1) + u + ", IQR " + fmt(rep.spread.iqr, 1) + u);
      else L.push("Quote: mean " + fmt(rep.centre.mean, 2) + u + ", SD " + fmt(rep.spread.sd, 2) + u);
    }
    for (const r of (rep.verdict && rep.verdict.reasons) || []) L.push("- " + r.text);
    for (const r of (rep.verdict && rep.verdict.warnings) || []) L.push("! " + r.text);
    L.push("n = " + rep.counts.used + (rep.counts.excluded ? " (" + rep.counts.excluded + " left out by the user)" : ""));
    if (rep.centre) {
      L.push("Mean " + fmt(rep.centre.mean, 2) + u + (rep.centre.meanCI ? " (" + pct(rep.centre.meanCI.level) + " CI " + fmt(rep.centre.meanCI.lo, 2) + " to " + fmt(rep.centre.meanCI.hi, 2) + ")" : ""));
      L.push("Median " + fmt(rep.centre.median, 1) + u + (rep.centre.medianCI ? " (" + pct(rep.centre.medianCI.level) + " CI " + fmt(rep.centre.medianCI.lo, 1) + " to " + fmt(rep.centre.medianCI.hi, 1) + ")" : ""));
    }
    if (rep.spread) {
      L.push("SD " + fmt(rep.spread.sd, 2) + u + (rep.spread.sdCI ? " (" + pct(rep.spread.sdCI.level) + " CI " + fmt(rep.spread.sdCI.lo, 2) + " to " + fmt(rep.spread.sdCI.hi, 2) + ")" : ""));
      L.push("IQR " + fmt(rep.spread.iqr, 1) + u + ", range " + fmt(rep.spread.range, 0) + u);
    }
    if (rep.suspects) {
      const rs = rep.suspects.readings;
      L.push("Flagged readings: " + (rs.length ? rs.map((r) => "row " + r.row + " (" + r.text + ")").join(", ") : "none"));
    }
    if (rep.shape && (rep.shape.shapiroWilk || rep.shape.large)) { const t = rep.shape.shapiroWilk || rep.shape.large; L.push(t.name + ": p = " + fmtP(t.p)); }
    if (rep.target && rep.target.statement) L.push(rep.target.statement);
    L.push("Settings: " + settingsLines(rep).join("; "));
    const ex = rep.settings.excluded || [];
    L.push(ex.length ? "Left out by the user: " + ex.map((r) => "row " + r.row + " (" + r.text + ")").join(", ") : "No reading left out by the user.");
    if (rep.verdict && rep.verdict.caution) L.push("Caution: " + rep.verdict.caution);
    return L.join("\n") + "\n";
  }

  async function copyText(text) {
    try {
      await navigator.clipboard.writeText(text);
      return true;
    } catch (e) {
      const ta = el("textarea", { class: "offscreen", readonly: "" });
      ta.value = text;
      document.body.append(ta);
      ta.select();
      let ok = false;
      try { ok = document.execCommand("copy"); } catch (e2) { ok = false; }
      ta.remove();
      return ok;
    }
  }

  // ---------- share link ----------
  function b64url(bytes) {
    let s = "";
    for (let i = 0; i < bytes.length; i += 0x8000) s += String.fromCharCode.apply(null, bytes.subarray(i, i + 0x8000));
    return btoa(s).replace(/\+/g, "-").replace(/\//g, "_").replace(/=+$/, "");
  }
  function unb64url(s) {
    const bin = atob(s.replace(/-/g, "+").replace(/_/g, "/"));
    const out = new Uint8Array(bin.length);
    for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
    return out;
  }
  async function pipe(bytes, stream) {
    return new Uint8Array(await new Response(new Blob([bytes]).stream().pipeThrough(stream)).arrayBuffer());
  }
  async function makeShareLink() {
    const text = state.source === "file" ? await state.file.text() : state.text;
    const options = readSettings() || {};
    const payload = { v: 1, text, name: state.source === "file" ? state.file.name : "", cols: state.cols, options };
    const z = await pipe(new TextEncoder().encode(JSON.stringify(payload)), new CompressionStream("deflate-raw"));
    return location.origin + location.pathname + "#d=" + b64url(z);
  }
  async function readShareLink(hash) {
    const z = unb64url(hash.slice(3));
    const json = new TextDecoder().decode(await pipe(z, new DecompressionStream("deflate-raw")));
    const p = JSON.parse(json);
    if (!p || p.v !== 1 || typeof p.text !== "string") throw new Error("unknown link format");
    return p;
  }
  async function restoreFromHash() {
    if (!location.hash.startsWith("#d=")) return false;
    let p;
    try { p = await readShareLink(location.hash); } catch (e) {
      setStatus("This link's data could not be read (" + e.message + "). The link may be cut short: ask for the file instead.", true);
      return false;
    }
    const o = p.options || {};
    if (p.text.length > BIG_PASTE) holdBigText(p.text); else { dropBigText(); data.value = p.text; }
    $("unit").value = o.unit || "";
    for (const k of ["target", "lsl", "usl"]) $(k).value = o[k] !== undefined && o[k] !== null ? String(o[k]) : "";
    if (o.confidence) $("confidence").value = String(o.confidence);
    if (o.quantile) $("quantile").value = o.quantile;
    $("decimal-mark").value = o.decimalMark || "";
    state.source = "text"; state.text = p.text; state.file = null;
    state.exclude = new Set(o.exclude || []);
    state.leaveOutRows = []; state.leaveOutText = ""; $("leave-out").value = "";
    state.cols = Object.assign({ value: "", group: "", order: "", subgroup: "" }, p.cols || {});
    await whenReady();
    showPreview(p.text, p.name || "");
    await analyseNow();
    setStatus("Opened from a shared link" + (p.name ? " (" + p.name + ")" : "") + ". " + status.textContent);
    return true;
  }

  // ---------- wiring ----------
  $("analyse").addEventListener("click", () => analyseText());
  data.addEventListener("paste", (ev) => {
    const t0 = performance.now();
    const cd = ev.clipboardData && ev.clipboardData.getData("text/plain");
    const whole = data.value.trim() === "" || (data.selectionStart === 0 && data.selectionEnd === data.value.length);
    if (cd && cd.length > BIG_PASTE && whole) {
      ev.preventDefault();
      holdBigText(cd);
      analyseText(t0);
      return;
    }
    if (bigText && whole) dropBigText();
    setTimeout(() => analyseText(t0), 0); // after the pasted text is in the box
  });
  $("edit-big").addEventListener("click", () => {
    const t = bigText;
    dropBigText();
    data.value = t;
    data.focus();
  });
  let typing = null;
  data.addEventListener("input", (ev) => {
    if (ev.inputType === "insertFromPaste") return;
    if (bigText && data.value.trim() !== "") dropBigText();
    clearTimeout(typing);
    typing = setTimeout(() => { if (data.value.trim()) analyseText(); }, 700);
  });
  $("open").addEventListener("click", () => $("file").click());
  $("file").addEventListener("change", (ev) => {
    const f = ev.target.files && ev.target.files[0];
    ev.target.value = "";
    if (f) analyseFile(f);
  });
  $("demo").addEventListener("click", async () => {
    setStatus("Loading the demo data…");
    try {
      dropBigText();
      data.value = await (await fetch("demo/capsule-fill.tsv")).text();
    } catch (e) { setStatus("The demo data could not be loaded: " + e, true); return; }
    showPreview(data.value, "demo");
    analyseText();
  });
  $("clear").addEventListener("click", () => {
    if (state.source === "file") call({ type: "forget" });
    data.value = ""; dropBigText();
    resetForNewData();
    state.source = null; state.text = ""; state.file = null; state.report = null;
    $("report").hidden = true; $("preview-box").hidden = true; $("columns").hidden = true; $("exclusions").hidden = true;
    if (location.hash) history.replaceState(null, "", location.pathname);
    setStatus("Cleared.");
    data.focus();
  });

  // Drop a file (or text) anywhere on the input panel.
  const drop = $("input");
  drop.addEventListener("dragover", (ev) => { ev.preventDefault(); drop.classList.add("dragging"); });
  drop.addEventListener("dragleave", (ev) => { if (!drop.contains(ev.relatedTarget)) drop.classList.remove("dragging"); });
  drop.addEventListener("drop", (ev) => {
    ev.preventDefault();
    drop.classList.remove("dragging");
    const dt = ev.dataTransfer;
    if (dt && dt.files && dt.files.length) { analyseFile(dt.files[0]); return; }
    const t = dt && dt.getData("text/plain");
    if (t) { data.value = t; analyseText(); }
  });
  // A file dropped elsewhere must not make the browser navigate away.
  window.addEventListener("dragover", (ev) => ev.preventDefault());
  window.addEventListener("drop", (ev) => ev.preventDefault());

  // Settings: re-run the analysis only (a file is never read again).
  let settingsTimer = null;
  for (const id of ["unit", "target", "lsl", "usl", "leave-out"]) $(id).addEventListener("input", () => {
    clearTimeout(settingsTimer);
    settingsTimer = setTimeout(() => { if (state.source) analyseNow(); }, 400);
  });
  for (const id of ["confidence", "quantile", "decimal-mark"]) $(id).addEventListener("change", () => { if (state.source) analyseNow(); });
  $("precision").addEventListener("change", (ev) => { state.full = ev.target.checked; if (state.report) render(); });

  $("copy").addEventListener("click", async () => {
    setStatus(await copyText(summaryText()) ? "Summary copied as text." : "The browser did not allow copying; use Download JSON instead.", false);
  });
  $("dl-json").addEventListener("click", () => download(fileBase() + "-report.json", JSON.stringify(state.report, null, 2) + "\n", "application/json"));
  $("dl-csv").addEventListener("click", () => download(fileBase() + "-suspect-readings.csv", suspectsCSV(), "text/csv"));
  $("print").addEventListener("click", () => window.print());
  $("share").addEventListener("click", async () => {
    let url;
    try { url = await makeShareLink(); } catch (e) { setStatus("The link could not be made: " + e, true); return; }
    const box = $("share-box"), input = $("share-url"), note = $("share-note");
    input.value = url;
    box.hidden = false;
    let msg = "The link holds " + url.length.toLocaleString() + " characters. Anyone with it sees the data.";
    if (url.length > 100000) {
      msg = "This link is very long (" + url.length.toLocaleString() + " characters): some mail and chat programs cut such links short. Send the file itself instead, with this report's fingerprint so the receiver can check it.";
      note.classList.add("warn-text");
    } else note.classList.remove("warn-text");
    const copied = await copyText(url);
    note.textContent = (copied ? "Copied. " : "") + msg;
    history.replaceState(null, "", url);
    input.select();
  });

  // ---------- scripts ----------
  window.lotlens = Object.freeze({
    version: "1",
    ready: whenReady,
    analyse(request) {
      const req = Object.assign({ schema: SCHEMA }, request || {});
      return call({ type: "analyse", request: req }).then((m) => {
        const rep = JSON.parse(m.json);
        if (rep.error) throw new Error(rep.error);
        return rep;
      });
    },
    // timing of the page's last analysis (ms), for the speed checks
    timing: () => state.timing && Object.assign({}, state.timing),
  });

  // ---------- start ----------
  startEngine();
  whenReady().then(async () => {
    if (!(await restoreFromHash())) setStatus("Ready. Paste values, open a file or try the demo.");
  });
  window.addEventListener("hashchange", () => { if (location.hash.startsWith("#d=")) restoreFromHash(); });
  if ("serviceWorker" in navigator && location.protocol !== "file:") {
    navigator.serviceWorker.register("sw.js").then(() => { document.body.dataset.sw = "registered"; })
      .catch(() => { /* offline use needs it; the page works without */ });
  }
})();
