// Outputs: downloads (report JSON, suspect readings and unused cells as
// CSV, chart SVG), the plain-text summary and the clipboard.
import { state, setStatus } from "./state.js";
import { fmt, pText, pct, unit, el, quoteIsMedian, settingsLines, sourceText, reasonText, excludedLine, whenText } from "./dom.js";

export function fileBase() {
  const name = (state.report && state.report.input.column || "data").replace(/[^A-Za-z0-9._-]+/g, "-").replace(/^-+|-+$/g, "").slice(0, 40) || "data";
  return "lotlens-" + name;
}
export function download(name, content, type) {
  const url = URL.createObjectURL(new Blob([content], { type }));
  const a = el("a", { href: url, download: name });
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10000);
  setStatus("Saved " + name + ".");
}
// csvCell quotes one cell. A cell that a spreadsheet would run as a formula
// (starting with =, +, -, @, tab or CR) gets a leading apostrophe, unless it
// is a plain number such as -5.12 or +1e3, which stays a number.
const PLAIN_NUMBER = /^[-+]?(\d+([.,]\d*)?|[.,]\d+)([eE][-+]?\d+)?$/;
export function csvCell(v) {
  let s = String(v === undefined || v === null ? "" : v);
  if (/^[=+\-@\t\r]/.test(s) && !PLAIN_NUMBER.test(s)) s = "'" + s;
  return '"' + s.replace(/"/g, '""') + '"';
}
export function suspectsCSV() {
  const rep = state.report;
  const lines = [["row", "column", "as_typed", "value", "rules", "left_out", "reason"].join(",")];
  const rs = (rep.suspects && rep.suspects.readings) || [];
  for (const r of rs) lines.push([r.row, r.column || rep.input.column, r.text, r.value, (r.flags || []).map((f) => f.rule).join(" "), state.exclude.has(r.row) ? "yes" : "no", reasonText(r.row)].map(csvCell).join(","));
  for (const r of rep.settings.excluded || []) if (!rs.some((s) => s.row === r.row)) lines.push([r.row, r.column || rep.input.column, r.text, r.value, "", "yes", reasonText(r.row)].map(csvCell).join(","));
  return lines.join("\r\n") + "\r\n";
}
export function downloadProblems() {
  const ps = state.report.input.problems || [];
  const lines = ["row,column,as_typed,kind,reason,action"].concat(ps.map((p) => [p.row, p.column, p.text, p.kind, p.reason, p.action].map(csvCell).join(",")));
  download(fileBase() + "-unused-cells.csv", lines.join("\r\n") + "\r\n", "text/csv");
}

export function summaryText() {
  const rep = state.report, L = [];
  const u = unit() ? " " + unit() : "";
  L.push("Lotlens report: " + (rep.input.column || "value") + (u ? " (" + unit() + ")" : ""));
  L.push("Made " + whenText() + " from " + sourceText());
  L.push("Data fingerprint (SHA-256): " + rep.input.fingerprint);
  L.push(rep.input.summary);
  L.push("");
  if (rep.centre && rep.spread) {
    if (rep.verdict && rep.verdict.quote === "value") L.push("Quote: the one reading, " + fmt(rep.centre.mean, 2) + u + "; no spread from one reading");
    else if (quoteIsMedian()) L.push("Quote: median " + fmt(rep.centre.median, 1) + u + ", IQR " + fmt(rep.spread.iqr, 1) + u);
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
  if (rep.shape && (rep.shape.shapiroWilk || rep.shape.large)) { const t = rep.shape.shapiroWilk || rep.shape.large; L.push(t.name + ": " + pText(t.p)); }
  if (rep.target && rep.target.statement) L.push(rep.target.statement);
  L.push("Settings: " + settingsLines(rep).join("; "));
  const ex = rep.settings.excluded || [];
  L.push(ex.length ? "Left out by the user: " + ex.map(excludedLine).join(", ") : "No reading left out by the user.");
  if (rep.verdict && rep.verdict.caution) L.push("Caution: " + rep.verdict.caution);
  return L.join("\n") + "\n";
}

export async function copyText(text) {
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

