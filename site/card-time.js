// The "Over time" card: the stability verdict, the control chart, every
// signal with its rows, the EWMA, CUSUM, drift and change-point figures,
// and the section's settings (baseline rows, check switches, EWMA and CUSUM
// parameters). Only what the engine reports is shown; nothing is computed.
import { $ } from "./state.js";
import { el, num, fmt, fmtP, helpLinks, table, parseNum, methodName } from "./dom.js";
import { addCard, card, chartFigure } from "./card-kit.js";

const CHECKS = [
  ["beyond-limits", "Beyond a limit", true], ["two-of-three-beyond-2sigma", "Two of three far out", true],
  ["four-of-five-beyond-1sigma", "Four of five out on one side", true], ["run-same-side", "Long run on one side", true],
  ["trend", "Steady climb or fall", true], ["alternating", "Saw-tooth", false],
  ["hugging-centre", "Crowding the centre", false], ["avoiding-centre", "Avoiding the centre", false],
  ["ewma", "EWMA", true], ["cusum", "CUSUM", true],
];
const LINKS = [["control-charts", "control charts"], ["control-constants", "constants"], ["signal-checks", "signal checks"],
  ["ewma", "EWMA"], ["cusum", "CUSUM"], ["drift-tests", "drift tests"], ["change-point", "change point"], ["run-chart", "run chart"]];

function timeCard(rep) {
  const s = rep.stability;
  if (!s) return card("time", "Over time", chartFigure("run", "Run chart: values in data order with the median."), helpLinks(LINKS));
  const kids = [
    el("p", { class: "lead " + (s.stable ? "stable" : "not-stable"), "data-field": "stability-verdict", "data-stable": String(s.stable) },
      el("strong", { text: s.stable ? "\u2714 " : "\u26a0 " }), s.verdict + "."),
    el("p", { class: "basis", text: s.order.text }),
  ];
  if (s.order.source === "rows") {
    // advice names the Columns choice only where it is on screen
    kids.push(el("p", { class: "needs", text: (rep.input.columns || []).length > 1
      ? "To follow a time or sequence column instead of the rows, choose it as the order under Columns."
      : "To follow the time of each reading, paste or drop the values with a second column giving its time or order, with a header row." }));
  }
  const reasons = (s.reasons || []).filter((r) => r.code !== "no-signal");
  if (reasons.length) kids.push(el("ul", { class: "reasons" }, ...reasons.map((r) => el("li", { "data-code": r.code, text: r.text }))));
  if (s.warnings && s.warnings.length) kids.push(el("ul", { class: "warnings", "aria-label": "Warnings" },
    ...s.warnings.map((r) => el("li", { "data-code": r.code }, el("strong", { text: "Warning: " }), r.text))));
  const ch = s.chart;
  if (ch) {
    kids.push(chartFigure("control", chartCaption(ch)));
    kids.push(el("p", { class: "why", text: ch.kindRule + " The limits use the within-process sigma" +
      (ch.sigmaShared ? ", the same one the spec section uses." : " of the baseline readings.") }));
    const l = ch.limits[0];
    const rows = [["Centre line", num(ch.centre, 2, "ctl-centre")], ["Lower and upper limit", [num(l.lower, 2, "ctl-lcl"), " to ", num(l.upper, 2, "ctl-ucl")]],
      ["Within-process sigma", [num(ch.sigma, 2, "ctl-sigma"), " (" + methodName(ch.sigmaMethod) + ", " + Math.round(ch.sigmaDF) + " degrees of freedom)"]],
      ["Spread chart centre and upper limit", [num(l.spreadCentre, 2), " and ", num(l.spreadUpper, 2)]], ["Points on the chart", String(ch.count)]];
    if (ch.limits.length > 1) rows.push(["Limits", "per subgroup (sizes differ); the first are shown"]);
    kids.push(el("details", null, el("summary", { text: "Limits and sigma" }), table(["Figure", "Value"], rows)));
  }
  if (s.baseline) kids.push(el("p", { class: "needs", text: "Baseline: rows " + s.baseline.rows + " (" + s.baseline.text + "); later points are judged against these limits." }));
  if (s.leftOut && s.leftOut.length) kids.push(el("p", { class: "needs", text: "Left out by you, shown as open circles and not judged: " +
    s.leftOut.map((r) => "row " + r.row + " (" + r.text + ")").join(", ") + "." }));
  // every signal with its rows
  if (s.signals && s.signals.length) {
    kids.push(el("details", { open: s.signals.length <= 5 ? "" : null, class: "signals" },
      el("summary", { text: s.signalsCut
        ? s.signals.length + " of " + (s.checks || []).reduce((t, c) => t + c.count, 0) + " signals listed, check by check (the checks below give every count; the verdict names the earliest)"
        : s.signals.length + (s.signals.length === 1 ? " signal" : " signals") }),
      table(["Check", "Chart", "Where", "Rows or subgroups"], s.signals.map((g) => [
        g.text.split(": ")[0], g.chart, g.text.split(": ").slice(1).join(": ") || g.text,
        el("span", { "data-code": g.code, text: (g.rows || g.subgroups || []).join(", ") + (g.points > (g.rows || g.subgroups || []).length ? " \u2026" : "") })]), "figs signals-t")));
  } else if (ch) kids.push(el("p", { text: "No signal from any of the checks switched on." }));
  // EWMA, CUSUM, drift, change point
  const more = [];
  if (s.ewma) more.push(["EWMA (\u03bb " + s.ewma.lambda + ", L " + s.ewma.l + ")", s.ewma.beyond + " beyond the limits",
    "run length in control " + arl(s.ewma.arl0) + ", after a 1\u03c3 shift " + arl(s.ewma.arl1)]);
  if (s.cusum) more.push(["CUSUM (k " + s.cusum.k + ", h " + s.cusum.h + ")", s.cusum.beyond + " beyond the decision interval",
    "run length in control " + arl(s.cusum.arl0) + ", after a 1\u03c3 shift " + arl(s.cusum.arl1)]);
  const d = s.drift;
  if (d && d.autocorrelation) more.push(["Lag-1 autocorrelation", "r\u2081 = " + d.autocorrelation.r1.toFixed(3) + (d.autocorrelation.strong ? " (strong)" : ""), "Ljung-Box " + fmtP(d.autocorrelation.p)]);
  if (d && d.runs) more.push(["Runs about the median", d.runs.runs + " runs (" + d.runs.expected.toFixed(1) + " expected); longest " + d.runs.longest + ", rows " + d.runs.longestFirstRow + "-" + d.runs.longestLastRow,
    (d.runs.exact ? "exact " : "") + fmtP(d.runs.p)]);
  if (d && d.trend) more.push(["Mann-Kendall trend", "tau " + d.trend.tau.toFixed(3) + (d.slope ? "; Sen's slope " + fmt(d.slope.slope, 3) + " per reading" : ""), fmtP(d.trend.p)]);
  if (s.changePoint) {
    const c = s.changePoint;
    more.push(["Change point (Pettitt)", "after " + (c.subgroup ? "subgroup " + c.subgroup : "reading " + c.position + " (row " + c.row + ")") +
      ": mean " + fmt(c.meanBefore, 2) + " before, " + fmt(c.meanAfter, 2) + " after", fmtP(c.p)]);
  }
  if (more.length) kids.push(el("details", null, el("summary", { text: "Small shifts, drift and change point" }),
    table(["Test", "Result", "p or run length"], more, "figs drift-t")));
  kids.push(el("details", null, el("summary", { text: "The checks as applied" }),
    table(["Check", "On", "Signals", "Looks for"], (s.checks || []).map((c) => [c.name, c.on ? "on" : "off", String(c.count), c.text]), "figs checks-t")));
  // on paper the checks switched off are left out (class off on their rows)
  kids[kids.length - 1].querySelectorAll(".checks-t tbody tr").forEach((tr, i) => { if (!(s.checks[i] || {}).on) tr.classList.add("off"); });
  kids.push(chartFigure("run", (rep.input.order ? "Run chart: values in the order of " + rep.input.order : "Run chart: values in data order") + " with the median; flagged readings marked."));
  kids.push(helpLinks(LINKS));
  return card("time", "Over time", ...kids);
}

addCard("time", timeCard);

function arl(v) { return v === undefined || v === null ? "\u2013" : String(Math.round(v * 10) / 10); }

function chartCaption(ch) {
  const what = { individuals: "Individuals and moving range chart", "mean-range": "Mean and range chart", "mean-sd": "Mean and SD chart" }[ch.kind] || "Control chart";
  return what + ": centre line, limits and shaded 1\u03c3 and 2\u03c3 zones; triangles beyond a limit, diamonds in a run or pattern, squares for EWMA or CUSUM alarms, open circles left out; labels give the row." +
    (ch.thinned ? " Thinned for drawing; every signal kept." : "");
}

// ---------- settings ----------
// fillOverTimeSettings makes a switch for each check (in #signal-switches).
export function fillOverTimeSettings(onChange) {
  const box = $("signal-switches");
  if (!box || box.querySelector("input")) return;
  for (const [code, name, on] of CHECKS) {
    const cb = el("input", { type: "checkbox", id: "sig-" + code, "data-code": code });
    cb.checked = on; cb.dataset.default = on ? "1" : "0";
    cb.addEventListener("change", onChange);
    box.append(el("label", { class: "check" }, cb, " " + name));
  }
  for (const id of ["baseline", "ewma-lambda", "ewma-l", "cusum-k", "cusum-h"]) $(id).addEventListener("input", onChange);
  $("chart-spread").addEventListener("change", onChange);
}

// readOverTimeSettings adds the section's options to o; problems go to errs
// and bad(id) marks the field (the first one gets the focus).
export function readOverTimeSettings(o, errs, bad) {
  // a field to fix is shown (its section opened) before it takes the focus
  const openBad = (id) => { $("overtime-settings").open = true; bad(id); };
  const b = $("baseline").value.trim();
  $("baseline").removeAttribute("aria-invalid");
  if (b) {
    if (/^\s*\d+(\s*-\s*\d+)?(\s*[,;]\s*\d+(\s*-\s*\d+)?)*\s*$/.test(b)) o.baseline = b.replace(/\s+/g, "");
    else { errs.push("Baseline rows: type rows like 2-61 or 2-61, 80-99."); openBad("baseline"); }
  }
  for (const [id, key, label] of [["ewma-lambda", "ewmaLambda", "EWMA weight"], ["ewma-l", "ewmaL", "EWMA limit width"], ["cusum-k", "cusumK", "CUSUM k"], ["cusum-h", "cusumH", "CUSUM h"]]) {
    const v = parseNum($(id).value);
    $(id).removeAttribute("aria-invalid");
    if (v === null) continue;
    if (isNaN(v) || v <= 0) { errs.push(label + " must be a positive number."); openBad(id); continue; }
    o[key] = v;
  }
  if ($("chart-spread").value) o.chartSpread = $("chart-spread").value;
  const sw = {};
  let any = false;
  for (const cb of document.querySelectorAll("#signal-switches input[data-code]")) {
    if (cb.checked !== (cb.dataset.default === "1")) { sw[cb.dataset.code] = cb.checked; any = true; }
  }
  if (any) o.signals = sw;
}

// restoreOverTimeSettings puts a shared link's options back into the form.
export function restoreOverTimeSettings(o) {
  $("baseline").value = o.baseline || "";
  $("ewma-lambda").value = o.ewmaLambda ? String(o.ewmaLambda) : "";
  $("ewma-l").value = o.ewmaL ? String(o.ewmaL) : "";
  $("cusum-k").value = o.cusumK ? String(o.cusumK) : "";
  $("cusum-h").value = o.cusumH ? String(o.cusumH) : "";
  $("chart-spread").value = o.chartSpread || "";
  for (const cb of document.querySelectorAll("#signal-switches input[data-code]")) {
    const v = o.signals && o.signals[cb.dataset.code];
    cb.checked = v === undefined ? cb.dataset.default === "1" : v;
  }
}
