// Number formatting and DOM helpers shared by the cards, the exports and
// the input. Numbers are written the way the engine reports the data: to
// their decimals, with a decimal comma when the value column used one.
import { state } from "./state.js";

export function comma() { return !!(state.report && state.report.input && state.report.input.decimalComma); }
export function decimals() { return (state.report && state.report.counts && state.report.counts.decimals) || 0; }
// fmt writes v to the data's decimals plus extra, or to full precision.
export function fmt(v, extra) {
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
export function fmtP(p) {
  if (p === null || p === undefined || !isFinite(p)) return "–";
  if (state.full) return String(p);
  if (p < 0.0001) return "<\u00a00.0001".replace(".", comma() ? "," : ".");
  const s = p.toFixed(p < 0.01 ? 4 : 3);
  return comma() ? s.replace(".", ",") : s;
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
export function intervalText(ci, extra) {
  if (!ci) return null;
  const p = el("p", { class: "interval" },
    pct(ci.level) + " confidence interval: ", num(ci.lo, extra, "lo"), " to ", num(ci.hi, extra, "hi"));
  if (unit()) p.append(" " + unit());
  if (ci.method) p.append(el("span", { class: "method", text: " (" + ci.method + ")" }));
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
export function sourceText() { return state.source === "file" && state.file ? "file " + state.file.name : "pasted text"; }
