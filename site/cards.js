// The report: renders the registered cards (one module per card, card-*.js,
// in the order imported below), the print header, the preview of the data
// as the reader split it, the column pickers and the list of exclusions;
// keeps keyboard focus where the user was across a re-render. Only what the
// engine reports is shown; nothing is computed here.
import { $, state, actions } from "./state.js";
import { unit, el, settingsLines, sourceText, reasonText, excludedLine, whenText, count } from "./dom.js";
import { cardList, drawLater, chartsDrawn } from "./card-kit.js";
import { hideTip, showTip, pointsOf } from "./chart-tips.js";
// The cards, in report order: one line each.
import "./card-verdict.js";
import "./card-data.js";
import "./card-centre.js";
import "./card-spread.js";
import "./card-suspects.js";
import "./card-shape.js";
import "./card-spec.js";
import "./card-time.js";
import "./card-groups.js";
import "./card-notes.js";

// Preview: the first records exactly as the engine's reader split them
// (report.input.reader.head), the header row and rows with a cell not used
// marked. The page never splits or decodes the data itself.
const SEPARATORS = { tab: "tabs", comma: "commas", semicolon: "semicolons", pipe: "pipes", spaces: "spaces", none: "one value a line", cells: "cells" };
export function renderPreview() {
  const box = $("preview-box"), t = $("preview");
  const rd = state.report && state.report.input.reader;
  const head = (rd && rd.head) || [];
  if (!head.length) { box.hidden = true; return; }
  const problems = new Map();
  for (const p of state.report.input.problems || []) if (!problems.has(p.row)) problems.set(p.row, p);
  const tb = el("tbody");
  for (const r of head) {
    const p = problems.get(r.row);
    const tr = el("tr", { class: [p ? "problem" : "", r.row === rd.headerRow ? "header-row" : ""].join(" ").trim(), "data-row": String(r.row) });
    tr.append(el("th", { scope: "row", text: String(r.row) }));
    for (const c of r.cells) tr.append(el("td", { text: c }));
    if (p) tr.append(el("td", { class: "why-cell", text: "\u26a0 " + (p.column ? p.column + ": " : "") + p.reason + " (" + p.action + ")" }));
    tb.append(tr);
  }
  t.replaceChildren(el("caption", { class: "visually-hidden", text: "First rows of the data as read; the header row and rows with a cell not used are marked" }), tb);
  const np = (state.report.input.problems || []).length;
  const how = [SEPARATORS[rd.separator] || rd.separator, rd.encoding];
  if (rd.headerRow) how.push("header in row " + rd.headerRow);
  $("preview-note").textContent = "(" + (state.sourceName ? state.sourceName + ", " : "") + "first " + head.length + " rows; read as " + how.join(", ") +
    (np ? "; " + np + (np === 1 ? " cell" : " cells") + " not used, listed in the report" : "") + ")";
  box.hidden = false;
}

// Column pickers. Values: number columns only (a column of times or dates
// is offered as the order or time column instead); order or time: time
// columns first, then numbers; groups and subgroups: any column.
function colLabel(c, withCount) {
  return c.name + (c.unit ? " (" + c.unit + ")" : "") + (c.kind === "time" ? " \u2013 times" : "") +
    (withCount ? " \u2013 " + c.numbers + " numbers" : "");
}
export function fillColumns() {
  const cols = (state.report && state.report.input.columns) || [];
  const fs = $("columns");
  if (cols.length < 2) { fs.hidden = true; return; }
  fs.hidden = false;
  const cur = { value: state.report.input.column, group: state.cols.group, order: state.cols.order, subgroup: state.cols.subgroup };
  const times = cols.filter((c) => c.kind === "time");
  const pick = {
    value: cols.filter((c) => c.kind === "number" || c.name === cur.value),
    order: times.concat(cols.filter((c) => c.kind === "number")),
    group: cols, subgroup: cols,
  };
  for (const k of ["value", "group", "order", "subgroup"]) {
    const s = $("col-" + k);
    const opts = k === "value" ? [] : [el("option", { value: "", text: "(none)" })];
    for (const c of pick[k]) opts.push(el("option", { value: c.name, text: colLabel(c, k === "value") }));
    s.replaceChildren(...opts);
    s.value = cur[k] || "";
  }
  const hint = $("col-hint");
  const t = times.find((c) => c.name !== cur.value);
  if (t && !state.cols.order) {
    hint.textContent = "Column \u201c" + t.name + "\u201d holds times: choose it under \u201cOrder or time\u201d to follow the values over time.";
    hint.hidden = false;
  } else hint.hidden = true;
}
for (const k of ["value", "group", "order", "subgroup"]) {
  $("col-" + k).addEventListener("change", (ev) => {
    state.cols[k] = ev.target.value;
    if (k === "value") { state.exclude.clear(); state.reasons.clear(); state.cols.value = ev.target.value; }
    actions.analyse();
  });
}

// ---------- exclusions ----------
export function renderExclusions() {
  const rep = state.report;
  const list = (rep && rep.settings.excluded) || [];
  const ul = $("exclusion-list");
  const known = new Set(list.map((r) => r.row));
  const items = list.map((r) => el("li", null,
    el("span", { text: "Row " + r.row + ": " + r.text + (unit() ? " " + unit() : "") + (reasonText(r.row) ? " \u2013 " + reasonText(r.row) : "") + " " }),
    el("button", { type: "button", class: "small", text: "Put back", "data-put-back": String(r.row), "aria-label": "Put back row " + r.row, onclick: () => actions.toggleExclude(r.row) })));
  // rows asked for that the engine did not find (e.g. after a column change)
  for (const row of state.exclude) if (!known.has(row)) items.push(el("li", null,
    el("span", { text: "Row " + row + " (no value in this column) " }),
    el("button", { type: "button", class: "small", text: "Forget", "data-put-back": String(row), onclick: () => actions.toggleExclude(row) })));
  ul.replaceChildren(...items);
  $("exclusions").hidden = !items.length;
}

// ---------- focus across a re-render ----------
// captureFocus notes where keyboard focus is, in terms that survive the
// cards being drawn again: a chart (and its selected point's row), a
// reading's switch or Put back button (by row), or an element with an id.
export function captureFocus() {
  const a = document.activeElement;
  if (!a || a === document.body) return null;
  const tipBox = $("tip");
  if (tipBox.contains(a) && state.tip.fig) return { chart: state.tip.fig.dataset.chart, row: state.tip.row };
  if (a.classList.contains("chart-fig")) return { chart: a.dataset.chart, row: state.tip.fig === a ? state.tip.row : null };
  const rowAttr = a.getAttribute("data-row") || a.getAttribute("data-put-back");
  if (rowAttr) { const c = a.closest(".card"); return { row: Number(rowAttr), card: c ? c.id : "", panel: !c }; }
  if (a.id) return { id: a.id };
  return null;
}
function restoreFocus(f) {
  if (!f) return;
  const go = (e) => { if (e) e.focus({ preventScroll: false }); return !!e; };
  if (f.chart) {
    const fig = document.querySelector('.chart-fig[data-chart="' + f.chart + '"]');
    if (!fig) return;
    fig.focus();
    if (f.row !== null && f.row !== undefined) {
      const pt = pointsOf(fig).find((p) => Number(p.getAttribute("data-row")) === f.row);
      if (pt) showTip(pt, fig);
    }
    return;
  }
  if (f.row !== undefined) {
    const scope = (f.card && $(f.card)) || (f.panel ? $("exclusions") : document);
    if (go(scope.querySelector('button.toggle[data-row="' + f.row + '"]')) ||
        go(scope.querySelector('[data-put-back="' + f.row + '"]')) ||
        go(document.querySelector('button.toggle[data-row="' + f.row + '"], [data-put-back="' + f.row + '"]'))) return;
    // the row's control is gone: the nearest thing in the same place
    const c = scope.querySelector("[data-put-back], button.toggle");
    if (go(c)) return;
    if (f.card && $(f.card)) { $(f.card).setAttribute("tabindex", "-1"); $(f.card).focus(); }
    else if (f.panel) $("leave-out").focus();
    return;
  }
  if (f.id && $(f.id) && document.activeElement !== $(f.id)) $(f.id).focus();
}

// reveal brings the verdict into view and focuses it when the report sits
// below the input panel (narrower than the two-column layout of style.css:
// portrait tablets, phones), where it would start far below the fold. It
// waits for the next frame, whose layout the page needs anyway, so the
// rendering does not pay for a layout of its own.
const SIDE_BY_SIDE = matchMedia("(min-width: 1000px)");
function reveal() {
  if (SIDE_BY_SIDE.matches) return; // the report is beside the panel, in view
  requestAnimationFrame(() => {
    const v = $("card-verdict");
    if (!v) return;
    v.scrollIntoView({ block: "start" });
    v.focus({ preventScroll: true });
  });
}

// ---------- report ----------
// render draws the report. opts.focus: where focus was (captureFocus) before
// the analysis; opts.reveal: the user asked for this analysis (Analyse,
// paste, file, demo, link), so the verdict is brought into view. It returns
// a promise that resolves once the large charts, drawn just after the rest,
// are drawn too (chartsDrawn, card-kit.js).
export function render(opts) {
  opts = opts || {};
  const rep = state.report;
  hideTip();
  const cards = [];
  drawLater(true);
  try {
    for (const c of cardList()) {
      const e = c.build(rep);
      if (e) cards.push(e);
    }
  } finally {
    drawLater(false);
  }
  $("cards").replaceChildren(...cards);
  const v = $("card-verdict");
  if (v) v.setAttribute("tabindex", "-1");
  $("print-head").replaceChildren(...printHead(rep));
  fillColumns();
  renderExclusions();
  renderPreview();
  $("report").hidden = false;
  document.body.classList.add("has-report");
  $("share-box").hidden = true;
  if (opts.focus) restoreFocus(opts.focus);
  else if (opts.reveal) reveal();
  return chartsDrawn();
}
actions.render = () => render({ focus: captureFocus() });

export function printHead(rep) {
  const excl = rep.settings.excluded || [];
  return [
    el("h2", { class: "print-title", text: "Lotlens report: " + (rep.input.column || "value") + (unit() ? " (" + unit() + ")" : "") }),
    el("p", { text: "Made " + whenText() + " from " + sourceText() + "; " + count(rep.counts.used, "value") + " used." }),
    el("p", null, "Data fingerprint (SHA-256 of the input as read): ", el("code", { text: rep.input.fingerprint })),
    el("p", { text: "Settings: " + settingsLines(rep).join("; ") + "." }),
    el("p", { class: "print-excluded", text: excl.length ? "Left out by the user: " + excl.map(excludedLine).join(", ") + "." : "No reading left out by the user." }),
    el("p", { class: "print-sign", text: "Made and readings left out by (name, signature): ____________________    Checked by: ____________________" }),
  ];
}

// On paper every figure a card holds is printed: the sections folded away
// on screen (<details>) print open. style.css opens them through
// ::details-content where the browser has it; for the others, beforeprint
// opens each closed section and afterprint closes it again.
const openedForPrint = [];
window.addEventListener("beforeprint", () => {
  for (const d of document.querySelectorAll("#report details:not([open])")) { d.open = true; openedForPrint.push(d); }
});
window.addEventListener("afterprint", () => {
  for (const d of openedForPrint.splice(0)) d.open = false;
});
// warmRender draws every card of a report of invented data off screen (the
// engine's warm-up report) and throws them away, so that the first real
// report does not pay for compiling the page's rendering code. It works in
// idle moments, card by card, while the moment lasts: a paste that comes
// meanwhile waits for one card at most, not for all of them (about 50 ms
// here). Only while the page shows no report and nothing runs (it stops for
// good then); the state is put back.
export function warmRender(json, svg) {
  const cards = cardList();
  let report = null, i = 0;
  const idle = "requestIdleCallback" in window;
  const later = () => { if (idle) requestIdleCallback(step, { timeout: 2000 }); else setTimeout(step, 50); };
  const step = (deadline) => {
    do {
      if (state.report || state.busy || i >= cards.length) return;
      const keep = { report: state.report, svg: state.svg, full: state.full, allSuspects: state.allSuspects };
      try {
        if (!report) report = JSON.parse(json);
        state.report = report; state.svg = svg;
        cards[i].build(report);
      } catch (e) { /* warm-up only */ } finally {
        Object.assign(state, keep);
      }
      i++;
    } while (deadline && !deadline.didTimeout && deadline.timeRemaining() > 5);
    later();
  };
  later();
}
export function refreshPrintHead() { if (state.report) $("print-head").replaceChildren(...printHead(state.report)); }
