// Number formatting and DOM helpers shared by the cards, the exports and
// the input. Numbers are written the way the engine reports the data: to
// their decimals, with a decimal comma when the value column used one.
import { state } from "./state.js";

export function comma() { return !!(state.report && state.report.input && state.report.input.decimalComma); }
export function decimals() { return (state.report && state.report.counts && state.report.counts.decimals) || 0; }
// fmt writes v to the data's decimals plus extra, or to full precision.
// Very large or very small magnitudes (where fixed decimals would print 16
// digits, or only zeros) are written with 5 significant digits and a power
// of ten: 1.6733 × 10^200.
export function fmt(v, extra) {
  if (v === null || v === undefined || !isFinite(v)) return "–";
  let s;
  const d = Math.max(0, Math.min(12, decimals() + (extra || 0)));
  const a = Math.abs(v);
  if (a >= 1e15 || (a !== 0 && a < 0.5 * Math.pow(10, -d) && a < 1e-4)) s = sci(v, state.full ? 16 : 5);
  else if (state.full) s = String(v);
  else {
    s = v.toFixed(d);
    if (/^-0(\.0*)?$/.test(s)) s = s.slice(1);
  }
  return comma() ? s.replace(".", ",") : s;
}
const SUP = { "0": "\u2070", "1": "\u00b9", "2": "\u00b2", "3": "\u00b3", "4": "\u2074", "5": "\u2075", "6": "\u2076", "7": "\u2077", "8": "\u2078", "9": "\u2079", "-": "\u207b" };
// sci writes v with sig significant digits (trailing zeros dropped) times a
// power of ten written in superscript digits.
export function sci(v, sig) {
  const [m, e] = v.toExponential(Math.max(0, Math.min(20, sig - 1))).split("e");
  const mant = m.includes(".") ? m.replace(/0+$/, "").replace(/\.$/, "") : m;
  const exp = String(Number(e));
  return mant + "\u00a0\u00d7\u00a010" + exp.split("").map((c) => SUP[c] || c).join("");
}
// ordinal: 1st, 2nd, 3rd, 4th, 11th, 12th, 13th, 21st; a non-whole number
// (0.135) takes "th".
export function ordinal(p) {
  const s = String(p);
  if (!Number.isInteger(p)) return s + "th";
  const t = p % 100, u = p % 10;
  if (t >= 11 && t <= 13) return s + "th";
  return s + (u === 1 ? "st" : u === 2 ? "nd" : u === 3 ? "rd" : "th");
}
export function fmtP(p) {
  if (p === null || p === undefined || !isFinite(p)) return "–";
  if (state.full) return String(p);
  if (p < 0.0001) return "<\u00a00.0001".replace(".", comma() ? "," : ".");
  const s = p.toFixed(p < 0.01 ? 4 : 3);
  return comma() ? s.replace(".", ",") : s;
}
// pText is "p = 0.123" or "p < 0.0001" (never "p = < 0.0001").
export function pText(p) {
  const s = fmtP(p).replace("\u00a0", " ");
  return s.startsWith("<") ? "p " + s : "p = " + s;
}
// count writes "1 value", "2 values" (many defaults to one + "s").
export function count(n, one, many) {
  return (typeof n === "number" ? n.toLocaleString("en-US") : String(n)) + " " + (n === 1 ? one : (many || one + "s"));
}
export function pct(level) { return (Math.round(level * 1000) / 10) + " %"; }
// parseNum reads a setting typed with a decimal point or comma.
export function parseNum(s) {
  s = s.trim().replace(/\s/g, "");
  if (s === "") return null;
  if (/^[-+]?\d*[.,]?\d+([eE][-+]?\d+)?$/.test(s)) return Number(s.replace(",", "."));
  return NaN;
}
export function unit() { return (state.report && state.report.input.unit) || ""; }

// ---------- DOM helpers ----------
export function el(tag, attrs, ...kids) {
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
export function num(v, extra, field) {
  return el("span", { class: "num", "data-value": String(v), "data-field": field, text: fmt(v, extra) });
}
export function withUnit(node) {
  const u = unit();
  return u ? [node, el("span", { class: "unit", text: " " + u })] : [node];
}
export function helpLinks(slugs) {
  const p = el("p", { class: "help" }, "Help: ");
  slugs.forEach(([slug, label], i) => {
    if (i) p.append(" · ");
    p.append(el("a", { href: "help/" + slug + ".html", target: "_blank", rel: "noopener", text: label }));
  });
  return p;
}
export function table(head, rows, cls) {
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
// methodName is the words for a method the report names by a code (an
// interval's method, a sigma estimator, a set of pairwise comparisons, a
// quartile definition); the page shows no code as it is. Quartile
// definitions take their names from the Quartile definition choice in the
// settings; a code not known here is shown as it is.
const methodWords = {
  "student-t": "Student's t", "chi-square": "chi-square", "f-distribution": "F distribution",
  "order-statistics": "order statistics, exact",
  "interpolated-order-statistics": "interpolated order statistics, Hettmansperger and Sheather",
  "clopper-pearson": "Clopper-Pearson, exact", "welch": "Welch", "hodges-lehmann": "Hodges-Lehmann",
  "tukey-kramer": "Tukey-Kramer", "games-howell": "Games-Howell", "dunn-holm": "Dunn's test with Holm's adjustment",
  "bissell-1990": "Bissell 1990", "boyles-1991": "Boyles 1991",
  "odeh-owen-exact": "Odeh and Owen, exact", "noncentral-t": "noncentral t", "wilks-1941": "Wilks 1941",
  "moving-range": "average moving range / d2", "median-moving-range": "median moving range / d4",
  "pooled-sd": "pooled SD of the subgroups / c4", "mean-range": "average subgroup range / d2",
  "mean-sd": "average subgroup SD / c4", "sample-sd": "sample SD of all readings",
};
export function methodName(code) {
  if (!code) return "";
  if (methodWords[code]) return methodWords[code];
  const opt = [...document.querySelectorAll("#quantile option")].find((o) => o.value === code);
  return opt ? opt.textContent : code;
}
export function intervalText(ci, extra) {
  if (!ci) return null;
  const p = el("p", { class: "interval" },
    pct(ci.level) + " confidence interval: ", num(ci.lo, extra, "lo"), " to ", num(ci.hi, extra, "hi"));
  if (unit()) p.append(" " + unit());
  if (ci.method) p.append(el("span", { class: "method", text: " (" + methodName(ci.method) + ")" }));
  return p;
}
export function notesFor(field) {
  return ((state.report && state.report.notes) || []).filter((n) => n.field === field || n.field.startsWith(field + "."));
}
export function missing(field, what) {
  const ns = notesFor(field);
  const box = el("div", { class: "missing" });
  box.append(el("p", { text: ns.length ? what + " could not be computed for this data:" : what + ": not in this report. The engine gave no figures for this section." }));
  if (ns.length) box.append(el("ul", null, ...ns.map((n) => el("li", { text: n.text }))));
  return box;
}

// ---------- report helpers ----------
// quoteIsMedian: the verdict quotes the median and IQR (else mean and SD).
export function quoteIsMedian() { return state.report.verdict && state.report.verdict.quote === "median-iqr"; }

export function settingsLines(rep) {
  const st = rep.settings, out = [];
  out.push("Confidence level: " + pct(st.confidence || 0.95));
  out.push("Quartile definition: " + (st.quantile || ""));
  if (unit()) out.push("Unit: " + unit());
  if (st.target !== undefined && st.target !== null) out.push("Target: " + fmt(st.target, 0));
  if (st.lsl !== undefined && st.lsl !== null) out.push("LSL: " + fmt(st.lsl, 0));
  if (st.usl !== undefined && st.usl !== null) out.push("USL: " + fmt(st.usl, 0));
  return out;
}
// reasonText is the reason the user typed for leaving a row out ("" if none).
export function reasonText(row) { return ((state.reasons && state.reasons.get(row)) || "").trim(); }
// excludedLine: "row 5 (6.40; reason: gauge dropped)", for the print header
// and the summary.
export function excludedLine(r) {
  const why = reasonText(r.row);
  return "row " + r.row + " (" + r.text + (why ? "; reason: " + why : "; no reason given") + ")";
}
// whenText: the report's date and time with its time zone, in the reader's
// words and as ISO 8601 with the offset from UTC and the zone's name, so a
// printed record reads the same anywhere:
// "3 Dec 2026, 14:05:09 GMT+5:30 (2026-12-03T14:05:09+05:30, Asia/Kolkata)".
export function whenText() {
  const d = state.when || new Date();
  const local = d.toLocaleString(undefined, { dateStyle: "medium", timeStyle: "long" });
  const p2 = (n) => String(n).padStart(2, "0");
  const off = -d.getTimezoneOffset(); // minutes east of UTC
  const iso = d.getFullYear() + "-" + p2(d.getMonth() + 1) + "-" + p2(d.getDate()) + "T" + p2(d.getHours()) + ":" + p2(d.getMinutes()) + ":" + p2(d.getSeconds()) +
    (off === 0 ? "Z" : (off > 0 ? "+" : "-") + p2(Math.floor(Math.abs(off) / 60)) + ":" + p2(Math.abs(off) % 60));
  let zone = "";
  try { zone = Intl.DateTimeFormat().resolvedOptions().timeZone || ""; } catch (e) { /* no zone name */ }
  return local + " (" + iso + (zone ? ", " + zone : "") + ")";
}
export function sourceText() { return state.source === "file" && state.file ? "file " + state.file.name : "pasted text"; }
