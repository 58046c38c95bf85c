// Input: paste, file, demo, shared link; the settings; running the
// analysis and showing its answer or its error.
import { $, SCHEMA, state, actions, setStatus, errorOf, showError } from "./state.js";
import { parseNum } from "./dom.js";
import { call, whenReady, restartEngine, cancelRead } from "./engine-client.js";
import { render } from "./cards.js";
import { readShareLink } from "./share.js";
import { fillOverTimeSettings, readOverTimeSettings, restoreOverTimeSettings } from "./card-overtime.js";

const data = $("data");
function resetForNewData() {
  state.exclude.clear();
  state.allSuspects = false;
  state.leaveOutRows = []; state.leaveOutText = ""; $("leave-out").value = "";
  state.cols = { value: "", group: "", order: "", subgroup: "" };
}

export function readSettings() {
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
  readOverTimeSettings(o, errs);
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

export async function analyseNow(t0) {
  const options = readSettings();
  if (!options || !state.source) return;
  const token = ++state.runToken;
  const start = t0 || performance.now();
  setBusy(true, "Analysing…");
  let m;
  try {
    state.sentAt = performance.timeOrigin + performance.now();
    m = await call({ type: "run", request: buildRequest(options), useTable: state.source === "file" });
  } catch (e) {
    if (token === state.runToken) { setBusy(false); setStatus(String(e.message || e), true); }
    return;
  }
  if (token !== state.runToken) return; // a newer run superseded this one
  const t1 = performance.now();
  const res = JSON.parse(m.json);
  setBusy(false);
  const err = errorOf(res);
  if (err) {
    showError(err);
    $("report").hidden = true;
    $("preview-box").hidden = true;
    document.body.dataset.state = "error";
    return;
  }
  delete document.body.dataset.errorCode;
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
function currentText() { return data.value.trim() === "" && state.bigText ? state.bigText : data.value; }
function holdBigText(text) {
  state.bigText = text;
  data.value = "";
  const lines = (text.match(/\n/g) || []).length + 1;
  data.placeholder = "Pasted " + lines.toLocaleString() + " lines (" + sizeText(text.length) + "); kept out of this box so the page stays quick. Press \u201cEdit the pasted text\u201d to change them, or paste again to replace them.";
  $("edit-big").hidden = false;
}
function dropBigText() {
  state.bigText = "";
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
    state.sourceName = "";
  }
  return analyseNow(t0);
}

async function analyseFile(file) {
  if (!file) return;
  resetForNewData();
  state.source = "file"; state.file = file; state.text = ""; state.hasTable = false; state.sourceName = file.name;
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
  const err = errorOf(JSON.parse(m.json));
  if (err && err.code === "cancelled") {
    box.hidden = true;
    state.source = null; state.file = null;
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
  if (state.exclude.has(row)) state.exclude.delete(row); else state.exclude.add(row);
  // keep the typed list in step with the switches
  state.leaveOutRows = (state.leaveOutRows || []).filter((r) => state.exclude.has(r));
  state.leaveOutText = state.leaveOutRows.join(", ");
  $("leave-out").value = state.leaveOutText;
  analyseNow();
}

// ---------- shared link ----------
export async function restoreFromHash() {
  if (!location.hash.startsWith("#d=")) return false;
  let p;
  try { p = await readShareLink(location.hash); } catch (e) {
    setStatus("This link's data could not be read (" + e.message + "). The link may be cut short: ask for the file instead.", true);
    return false;
  }
  const o = p.options || {};
  state.sourceName = p.name || "";
  if (p.text.length > BIG_PASTE) holdBigText(p.text); else { dropBigText(); data.value = p.text; }
  $("unit").value = o.unit || "";
  for (const k of ["target", "lsl", "usl"]) $(k).value = o[k] !== undefined && o[k] !== null ? String(o[k]) : "";
  if (o.confidence) $("confidence").value = String(o.confidence);
  if (o.quantile) $("quantile").value = o.quantile;
  $("decimal-mark").value = o.decimalMark || "";
  restoreOverTimeSettings(o);
  state.source = "text"; state.text = p.text; state.file = null;
  state.exclude = new Set(o.exclude || []);
  state.leaveOutRows = []; state.leaveOutText = ""; $("leave-out").value = "";
  state.cols = Object.assign({ value: "", group: "", order: "", subgroup: "" }, p.cols || {});
  await whenReady();
  await analyseNow();
  setStatus("Opened from a shared link" + (p.name ? " (" + p.name + ")" : "") + ". " + $("status").textContent);
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
  if (state.bigText && whole) dropBigText();
  setTimeout(() => analyseText(t0), 0); // after the pasted text is in the box
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
  analyseText();
  state.sourceName = "demo";
});
$("clear").addEventListener("click", () => {
  if (state.source === "file") call({ type: "forget" });
  data.value = ""; dropBigText();
  resetForNewData();
  state.source = null; state.text = ""; state.file = null; state.report = null; state.sourceName = "";
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
fillOverTimeSettings(() => { clearTimeout(settingsTimer); settingsTimer = setTimeout(() => { if (state.source) analyseNow(); }, 400); });
$("precision").addEventListener("change", (ev) => { state.full = ev.target.checked; if (state.report) render(); });


actions.analyse = analyseNow;
actions.toggleExclude = toggleExclude;
