// Input: paste, file, demo, shared link; the settings; running the
// analysis and showing its answer or its error.
import { $, SCHEMA, state, actions, setStatus, errorOf, showError } from "./state.js";
import { parseNum, count } from "./dom.js";
import { call, whenReady, restartEngine, cancelRead } from "./engine-client.js";
import { render, captureFocus, renderExclusions, refreshPrintHead } from "./cards.js";
import { openShared, isSharedFile, clearShared } from "./share.js";
import { fillOverTimeSettings, readOverTimeSettings } from "./card-time.js";

const data = $("data");
function resetForNewData() {
  state.exclude.clear();
  state.reasons.clear();
  state.dataVersion++;
  state.allSuspects = false;
  state.leaveOutRows = []; state.leaveOutText = ""; $("leave-out").value = "";
  state.cols = { value: "", group: "", order: "", subgroup: "" };
  clearShared();
}

export function readSettings() {
  const o = { confidence: Number($("confidence").value), quantile: $("quantile").value };
  if ($("decimal-mark").value) o.decimalMark = $("decimal-mark").value;
  const errs = [];
  let field = "";
  const bad = (id) => {
    $(id).setAttribute("aria-invalid", "true"); if (!field) field = id;
    const d = $(id).closest("details"); if (d) d.open = true; // the field to fix must be in view
  };
  for (const [id, key, label] of [["target", "target", "Target"], ["lsl", "lsl", "LSL"], ["usl", "usl", "USL"]]) {
    const v = parseNum($(id).value);
    $(id).removeAttribute("aria-invalid");
    if (v === null) continue;
    if (isNaN(v)) { errs.push(label + " \u201c" + $(id).value + "\u201d is not a number: type it like 5.0 or 5,0 (no unit)."); bad(id); continue; }
    o[key] = v;
  }
  if (o.lsl !== undefined && o.usl !== undefined && !(o.lsl < o.usl)) {
    errs.push("LSL (" + $("lsl").value.trim() + ") must be below USL (" + $("usl").value.trim() + ")."); bad("lsl"); bad("usl");
  }
  // the spec section's settings: coverage typed in percent, the Cpk goal,
  // and the within-process sigma where it fits the columns chosen
  for (const [id, key, label, ok, hint, scale] of [
    ["coverage", "coverage", "Coverage", (v) => v >= 50 && v < 100, "a percentage from 50 to below 100, e.g. 99", 100],
    ["cpk-goal", "cpkGoal", "Cpk goal", (v) => v > 0 && v <= 10, "a number above 0 and at most 10, e.g. 1.33", 1]]) {
    const v = parseNum($(id).value);
    $(id).removeAttribute("aria-invalid");
    if (v === null) continue;
    if (isNaN(v) || !ok(v)) { errs.push(label + " “" + $(id).value + "”: type " + hint + "."); bad(id); continue; }
    o[key] = scale === 100 ? Number((v / 100).toPrecision(12)) : v;
  }
  const ws = $("within-sigma");
  const fits = state.cols.subgroup ? "subgroups" : "individuals";
  for (const opt of ws.options) opt.disabled = !!opt.dataset.for && opt.dataset.for !== fits;
  ws.removeAttribute("aria-invalid");
  if (ws.value) {
    const opt = ws.options[ws.selectedIndex];
    if (opt.dataset.for && opt.dataset.for !== fits) {
      errs.push("Within-process sigma “" + opt.text + "” " + (fits === "subgroups" ? "works on individual readings, but a subgroup column is chosen: choose a subgroup estimator or clear the subgroup column." : "needs a subgroup column: choose one under Columns, or an estimator for individual readings."));
      bad("within-sigma");
    } else o.withinSigma = ws.value;
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
      bad("leave-out");
    }
  }
  readOverTimeSettings(o, errs, bad);
  const u = $("unit").value.trim();
  if (u) o.unit = u;
  if (state.exclude.size) o.exclude = Array.from(state.exclude).sort((a, b) => a - b);
  // the reasons typed for rows left out travel with the request: the
  // report echoes them (settings.excluded[].reason) and a link carries them
  const why = {};
  for (const r of o.exclude || []) {
    const t = ((state.reasons && state.reasons.get(r)) || "").trim();
    if (t) why[String(r)] = t;
  }
  if (Object.keys(why).length) o.excludeReasons = why;
  const box = $("settings-error");
  box.hidden = !errs.length;
  box.textContent = errs.join(" ");
  state.settingsError = errs.length ? { message: errs.join(" "), field } : null;
  if (!errs.length) $("action-error").hidden = true;
  return errs.length ? null : o;
}

// showActionError puts a settings error next to the buttons the user just
// pressed and moves focus to the field to fix (the Settings box may be far
// below the fold).
function showActionError(err) {
  const box = $("action-error");
  box.replaceChildren(document.createTextNode("Settings need a fix before the analysis: " + err.message + " "));
  box.hidden = false;
  setStatus("Not analysed: a setting needs a fix.", true);
  const f = err.field && $(err.field);
  if (f) { f.focus(); if (f.select) f.select(); }
}

export function buildRequest(options) {
  const req = { schema: SCHEMA, options: Object.assign({}, state.carried, options) };
  for (const k of ["value", "group", "order", "subgroup"]) if (state.cols[k]) req[k] = state.cols[k];
  if (!state.cols.group && state.cols.groups && state.cols.groups.length) req.groups = state.cols.groups; // side by side (card-groups.js)
  if (state.source === "text") req.text = state.text;
  return req;
}

// analyseNow runs the analysis of the current data with the settings.
// how: fromAction (a button the user pressed: a settings error is shown
// beside it and focus goes to the field), reveal (bring the verdict into
// view on narrow screens), focus (where focus was, kept across the
// re-render), notice (a sentence for the status line). A request equal to
// the last one sent is not sent again (typing then pressing Analyse runs
// once).
export async function analyseNow(t0, how) {
  how = how || {};
  const options = readSettings();
  if (!options) { if (how.fromAction && state.settingsError) showActionError(state.settingsError); return; }
  if (!state.source) return;
  const req = buildRequest(options);
  // every field of the request but the text (the data version stands for it)
  const key = JSON.stringify([state.dataVersion, state.source, Object.assign({}, req, { text: undefined })]);
  if (key === state.lastKey) {
    // the same request again: nothing new to show (a run in flight will
    // show it); bring the report into view if the user asked
    if (how.reveal && state.report && !state.busy) render({ reveal: true });
    return;
  }
  state.lastKey = key;
  const token = ++state.runToken;
  const start = t0 || performance.now();
  setBusy(true, "Analysing…");
  let m;
  try {
    state.sentAt = performance.timeOrigin + performance.now();
    m = await call({ type: "run", request: req, useTable: state.source === "file" });
  } catch (e) {
    if (token === state.runToken) { setBusy(false); setStatus(String(e.message || e), true); state.lastKey = ""; }
    return;
  }
  if (token !== state.runToken) return; // a newer run superseded this one
  const t1 = performance.now();
  const res = JSON.parse(m.json);
  setBusy(false);
  const err = errorOf(res);
  if (err) {
    showError(err);
    // the report goes; the column pickers stay, so that a refused column
    // choice can be changed back
    $("report").hidden = true; $("preview-box").hidden = true;
    document.body.classList.remove("has-report");
    state.lastKey = "";
    document.body.dataset.state = "error";
    return;
  }
  delete document.body.dataset.errorCode;
  state.report = res;
  state.svg = m.svg || {};
  state.when = new Date();
  $("action-error").hidden = true;
  const drawn = render({ focus: how.focus, reveal: how.reveal });
  const t2 = performance.now();
  state.analyses++;
  // totalMs: to the report drawn but for its large charts; paintMs: to the
  // frame that shows it; chartsMs: to the last chart drawn
  const timing = state.timing = { engineMs: t1 - start, workerMs: m.ms, renderMs: t2 - t1, totalMs: t2 - start };
  if (m.at) {
    state.timing.toWorkerMs = m.at[0] - state.sentAt;
    state.timing.fromWorkerMs = performance.timeOrigin + t1 - m.at[1];
    state.timing.beforeSendMs = state.sentAt - (performance.timeOrigin + start);
  }
  const rep = state.report;
  setStatus((how.notice ? how.notice + " " : "") + "Analysed " + count(rep.counts.used, "value") + (rep.counts.excluded ? " (" + rep.counts.excluded + " left out by you)" : "") +
    " in " + Math.round(t2 - start) + " ms. " + rep.input.summary);
  if (state.bigText && state.source === "text") describeBigText(rep);
  document.body.dataset.state = "report";
  // data-analysed (what the tests wait for) counts reports drawn whole
  const n = state.analyses;
  drawn.then((at) => {
    timing.paintMs = at.painted - start;
    timing.chartsMs = at.drawn - start;
    if (state.analyses === n) document.body.dataset.analysed = String(n);
  });
}

// clearReport takes the last report off the screen (after an error, so
// that no old figures stand under a new file's name).
function clearReport() {
  state.report = null; state.svg = {};
  $("report").hidden = true; $("preview-box").hidden = true; $("columns").hidden = true;
  $("cards").replaceChildren();
  document.body.classList.remove("has-report");
  renderExclusions();
}

function setBusy(on, msg) {
  state.busy = on ? 1 : 0;
  $("analyse").disabled = false;
  if (on && msg) setStatus(msg);
}

// A large paste is kept out of the text box: laying out tens of thousands
// of lines in a textarea takes the page longer than the whole analysis.
const BIG_PASTE = 20000; // characters
function currentText() { return data.value.trim() === "" && state.bigText ? state.bigText : data.value; }
function holdBigText(text) {
  state.bigText = text;
  data.value = "";
  data.placeholder = "Pasted " + lineCount(text).toLocaleString() + " lines (" + sizeText(text.length) + "); kept out of this box so the page stays quick. Press \u201cEdit the pasted text\u201d to change them, or paste again to replace them.";
  $("edit-big").hidden = false;
}
// lineCount counts lines as an editor shows them: a last line break does
// not start another line.
function lineCount(text) {
  const n = (text.match(/\r\n|\n|\r/g) || []).length;
  return text === "" ? 0 : n + (/(\r\n|\n|\r)$/.test(text) ? 0 : 1);
}
// describeBigText says, once analysed, what the held text holds.
function describeBigText(rep) {
  const rd = rep.input.reader || {};
  data.placeholder = "Pasted " + lineCount(state.bigText).toLocaleString() + " lines (" + sizeText(state.bigText.length) + "): " +
    count(rep.counts.used, "value") + " used" + (rd.headerRow ? ", header in row " + rd.headerRow : "") +
    ". Kept out of this box so the page stays quick. Press \u201cEdit the pasted text\u201d to change them, or paste again to replace them.";
}
function dropBigText() {
  state.bigText = "";
  $("edit-big").hidden = true;
  data.placeholder = "5.12\n5.08\n5.10\n\u2026";
}

function analyseText(t0, how) {
  how = Object.assign({}, how);
  const text = currentText();
  if (!text.trim()) { setStatus("Nothing to analyse: paste values into the box, open a file or try the demo.", true); return; }
  if (state.source !== "text" || text !== state.text) {
    if (state.source === "file") call({ type: "forget" });
    const edited = state.source === "text" && state.text !== "";
    const keep = edited ? remapExclusions(state.text, text) : null;
    const sameHeader = edited && firstLine(state.text) === firstLine(text);
    const cols = state.cols;
    resetForNewData();
    if (keep) {
      for (const [from, to] of keep.rows) {
        state.exclude.add(to);
        if (keep.reasons.has(from)) state.reasons.set(to, keep.reasons.get(from));
      }
      state.leaveOutRows = keep.typed; state.leaveOutText = keep.typed.join(", "); $("leave-out").value = state.leaveOutText;
      if (sameHeader) state.cols = cols;
      how.notice = keep.notice;
    }
    state.source = "text"; state.file = null; state.text = text; state.hasTable = false;
    state.sourceName = "";
  }
  return analyseNow(t0, how);
}

function linesOf(t) { return t.split(/\r\n|\n|\r/); }
function firstLine(t) { return linesOf(t)[0]; }
// remapExclusions keeps each left-out row that still holds the same text
// after the pasted text was edited: at the same row, or, when its line is
// unique in both texts, at the row it moved to. The others are put back and
// named in the notice.
function remapExclusions(oldText, newText) {
  const a = linesOf(oldText), b = linesOf(newText);
  const index = (ls) => { const m = new Map(); ls.forEach((l, i) => { const e = m.get(l); if (e) e.n++; else m.set(l, { i, n: 1 }); }); return m; };
  const ia = index(a), ib = index(b);
  const rows = new Map(), reasons = new Map(), dropped = [], moved = [];
  for (const row of Array.from(state.exclude).sort((x, y) => x - y)) {
    const line = a[row - 1];
    if (state.reasons.has(row)) reasons.set(row, state.reasons.get(row));
    if (line !== undefined && b[row - 1] === line) { rows.set(row, row); continue; }
    const ea = line !== undefined && ia.get(line), eb = line !== undefined && ib.get(line);
    if (line !== undefined && line.trim() && ea && ea.n === 1 && eb && eb.n === 1) { rows.set(row, eb.i + 1); moved.push("row " + row + " is now row " + (eb.i + 1)); continue; }
    dropped.push("row " + row + (line !== undefined && line.trim() ? " (" + line.trim() + ")" : ""));
  }
  const typed = (state.leaveOutRows || []).filter((r) => rows.has(r)).map((r) => rows.get(r));
  let notice = "";
  if (moved.length) notice += "Left-out readings kept after the edit: " + moved.join(", ") + ". ";
  if (dropped.length) notice += "Put back after the edit, as the row no longer holds the same text: " + dropped.join(", ") + ".";
  return { rows, reasons, typed, notice: notice.trim() };
}

async function analyseFile(file) {
  if (!file) return;
  if (isSharedFile(file)) {
    if (state.source === "file") call({ type: "forget" });
    resetForNewData();
    state.report = null; $("report").hidden = true;
    await openShared(file, "file", "file");
    return;
  }
  resetForNewData();
  state.source = "file"; state.file = file; state.text = ""; state.hasTable = false; state.sourceName = file.name;
  clearReport();
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
    if (state.file !== file) return;
    box.hidden = true;
    setStatus(String(e.message || e), true);
    return;
  }
  // a file opened since supersedes this one: its answer ("cancelled") is
  // not shown, and the newer file's state is left alone
  if (state.file !== file) return;
  const err = errorOf(JSON.parse(m.json));
  if (err && err.code === "cancelled") {
    box.hidden = true;
    state.source = null; state.file = null;
    clearReport();
    setStatus("Reading cancelled. Nothing was analysed.");
    document.body.dataset.state = "cancelled";
    return;
  }
  if (err) {
    box.hidden = true;
    state.source = null;
    showError(err);
    document.body.dataset.state = "error";
    return;
  }
  state.hasTable = true;
  $("progress-label").textContent = "Analysing " + file.name + "…";
  data.value = "";
  dropBigText();
  data.placeholder = "Showing " + file.name + " (read from the file; paste here to analyse other data instead)";
  const readMs = performance.now() - t0;
  await analyseNow(t0, { reveal: true });
  box.hidden = true;
  if (state.timing) state.timing.readMs = readMs;
}

function sizeText(b) {
  if (b < 1024) return b + " bytes";
  if (b < 1048576) return (b / 1024).toFixed(0) + " kB";
  return (b / 1048576).toFixed(1) + " MB";
}

$("cancel").addEventListener("click", () => {
  cancelRead();
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


function toggleExclude(row) {
  const focus = captureFocus();
  if (state.exclude.has(row)) { state.exclude.delete(row); state.reasons.delete(row); } else state.exclude.add(row);
  // keep the typed list in step with the switches
  state.leaveOutRows = (state.leaveOutRows || []).filter((r) => state.exclude.has(r));
  state.leaveOutText = state.leaveOutRows.join(", ");
  $("leave-out").value = state.leaveOutText;
  analyseNow(undefined, { focus });
}
function reasonChanged(row) {
  // the report shown echoes the reason as the engine will on the next run
  // (settings.excluded[].reason), so its JSON, a link and the print agree
  const why = ((state.reasons && state.reasons.get(row)) || "").trim();
  for (const r of (state.report && state.report.settings && state.report.settings.excluded) || []) {
    if (r.row !== row) continue;
    if (why) r.reason = why; else delete r.reason;
  }
  refreshPrintHead();
  renderExclusions();
}

// ---------- wiring ----------
$("analyse").addEventListener("click", () => { clearTimeout(typing); analyseText(undefined, { fromAction: true, reveal: true }); });
data.addEventListener("paste", (ev) => {
  const t0 = performance.now();
  const cd = ev.clipboardData && ev.clipboardData.getData("text/plain");
  const whole = data.value.trim() === "" || (data.selectionStart === 0 && data.selectionEnd === data.value.length);
  if (cd && cd.length > BIG_PASTE && whole) {
    ev.preventDefault();
    holdBigText(cd);
    analyseText(t0, { reveal: true });
    return;
  }
  if (state.bigText && whole) dropBigText();
  clearTimeout(typing);
  setTimeout(() => analyseText(t0, { reveal: true }), 0); // after the pasted text is in the box
});
$("edit-big").addEventListener("click", () => {
  const t = state.bigText;
  dropBigText();
  data.value = t;
  data.focus();
});
let typing = null;
data.addEventListener("input", (ev) => {
  if (ev.inputType === "insertFromPaste") return;
  if (state.bigText && data.value.trim() !== "") dropBigText();
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
  analyseText(undefined, { fromAction: true, reveal: true });
  state.sourceName = "demo";
});
$("clear").addEventListener("click", () => {
  if (state.source === "file") call({ type: "forget" });
  data.value = ""; dropBigText();
  resetForNewData();
  state.source = null; state.text = ""; state.file = null; state.sourceName = ""; state.lastKey = "";
  clearReport(); $("action-error").hidden = true; $("exclusions").hidden = true;
  if (location.hash || location.search) history.replaceState(null, "", location.pathname);
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
  if (t) { dropBigText(); data.value = t; analyseText(undefined, { reveal: true }); }
});
// A file dropped elsewhere must not make the browser navigate away.
window.addEventListener("dragover", (ev) => ev.preventDefault());
window.addEventListener("drop", (ev) => ev.preventDefault());

// Settings: re-run the analysis only (a file is never read again).
let settingsTimer = null;
for (const id of ["unit", "target", "lsl", "usl", "coverage", "cpk-goal", "leave-out"]) $(id).addEventListener("input", () => {
  clearTimeout(settingsTimer);
  settingsTimer = setTimeout(() => { if (state.source) analyseNow(); }, 400);
});
for (const id of ["confidence", "quantile", "decimal-mark", "within-sigma"]) $(id).addEventListener("change", () => { if (state.source) analyseNow(); });
fillOverTimeSettings(() => { clearTimeout(settingsTimer); settingsTimer = setTimeout(() => { if (state.source) analyseNow(); }, 400); });
$("precision").addEventListener("change", (ev) => { state.full = ev.target.checked; if (state.report) render(); });


actions.analyse = analyseNow;
actions.toggleExclude = toggleExclude;
actions.reasonChanged = reasonChanged;
