// The report: the cards, the charts with their tips, the preview of the
// data as the reader split it, the column pickers and the exclusions. Only
// what the engine reports is shown; nothing is computed here.
import { $, state, actions } from "./state.js";
import { fmt, fmtP, pct, unit, comma, el, num, withUnit, helpLinks, table, intervalText, missing, quoteIsMedian, settingsLines, sourceText } from "./dom.js";
import { download, fileBase, downloadProblems } from "./export.js";
import { overTimeCard } from "./card-overtime.js";

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
function pointsOf(fig) { return Array.from(fig.querySelectorAll("[data-row]")); }
function showTip(pt, fig, x, y) {
  document.querySelectorAll(".pt.hl").forEach((p) => p.classList.remove("hl"));
  pt.classList.add("hl");
  const row = Number(pt.getAttribute("data-row"));
  const title = pt.querySelector("title");
  tip.replaceChildren(
    el("span", { text: title ? title.textContent : "row " + row }),
    el("button", { type: "button", class: "small", text: state.exclude.has(row) ? "Put back" : "Leave out",
      onclick: () => { actions.toggleExclude(row); hideTip(); } }));
  tip.hidden = false;
  const r = fig.getBoundingClientRect();
  if (x === undefined) { const b = pt.getBoundingClientRect(); x = b.left + b.width / 2; y = b.top; }
  const left = Math.min(Math.max(8, x - 20), window.innerWidth - 260);
  tip.style.left = (left + window.scrollX) + "px";
  tip.style.top = (Math.max(y, r.top) + window.scrollY - 56) + "px";
  state.tip.row = row; state.tip.fig = fig;
}
export function hideTip() {
  tip.hidden = true; state.tip.row = null;
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
    if (state.tip.fig !== fig) state.tip.index = -1;
    const fwd = ev.key === "ArrowRight" || ev.key === "ArrowDown";
    state.tip.index = (state.tip.index + (fwd ? 1 : -1) + pts.length) % pts.length;
    showTip(pts[state.tip.index], fig);
  } else if (ev.key === "Enter" && state.tip.row !== null && state.tip.fig === fig) {
    ev.preventDefault();
    actions.toggleExclude(state.tip.row);
  }
});


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

// Column pickers.
export function fillColumns() {
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
    el("span", { text: "Row " + r.row + ": " + r.text + (unit() ? " " + unit() : "") + " " }),
    el("button", { type: "button", class: "small", text: "Put back", "aria-label": "Put back row " + r.row, onclick: () => actions.toggleExclude(r.row) })));
  // rows asked for that the engine did not find (e.g. after a column change)
  for (const row of state.exclude) if (!known.has(row)) items.push(el("li", null,
    el("span", { text: "Row " + row + " (no value in this column) " }),
    el("button", { type: "button", class: "small", text: "Forget", onclick: () => actions.toggleExclude(row) })));
  ul.replaceChildren(...items);
  $("exclusions").hidden = !items.length;
}


// ---------- report ----------

function card(id, title, ...kids) {
  return el("article", { class: "card" + (id.endsWith(" placeholder") ? " placeholder" : ""), id: "card-" + id.split(" ")[0], "aria-labelledby": "card-" + id.split(" ")[0] + "-h" },
    el("h3", { id: "card-" + id.split(" ")[0] + "-h", text: title }), ...kids);
}
function quote(label, v, extra, field) {
  return el("p", { class: "quote" }, el("span", { class: "quote-label", text: label + " " }), ...withUnit(Object.assign(num(v, extra, field), { className: "num big" })));
}

export function render() {
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
              onclick: () => actions.toggleExclude(r.row) })]];
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
      el("button", { type: "button", class: "small", text: "Put back", "aria-label": "Put back row " + r.row, onclick: () => actions.toggleExclude(r.row) }))))));
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

function timeCard(rep) { return overTimeCard(rep, card, chartFigure); }

function groupsCard(rep) {
  return card("groups placeholder", "Groups",
    el("p", { class: "needs", text: state.cols.group
      ? "Comparing the groups of the chosen column is not computed in this version of Lotlens."
      : "To compare lines, shifts or suppliers, choose a group column under Columns (data with more than one column)." }),
    helpLinks([["reading-your-report", "reading your report"]]));
}

export function printHead(rep) {
  const excl = rep.settings.excluded || [];
  return [
    el("h2", { class: "print-title", text: "Lotlens report: " + (rep.input.column || "value") + (unit() ? " (" + unit() + ")" : "") }),
    el("p", { text: "Made " + state.when.toLocaleString() + " from " + sourceText() + "; " + rep.counts.used + " values used." }),
    el("p", null, "Data fingerprint (SHA-256 of the input as read): ", el("code", { text: rep.input.fingerprint })),
    el("p", { text: "Settings: " + settingsLines(rep).join("; ") + "." }),
    el("p", { text: excl.length ? "Left out by the user: " + excl.map((r) => "row " + r.row + " (" + r.text + ")").join(", ") + "." : "No reading left out by the user." }),
  ];
}

