// Spread: the quoted spread with its interval, every spread figure, the quantiles.
import { state } from "./state.js";
import { pct, comma, el, num, helpLinks, table, intervalText, missing, quoteIsMedian, ordinal, methodName } from "./dom.js";
import { addCard, card, quote } from "./card-kit.js";

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
    for (const p of q.percentiles || []) qrows.push([ordinal(p.p) + " percentile", num(p.value, 1)]);
    const d = el("details", null, el("summary", { text: "Quantiles (" + methodName(q.method) + ")" }), table(["Quantile", "Value"], qrows));
    if (q.all && q.all.length) d.append(el("p", { text: "Quartiles under every definition:" }),
      table(["Definition", "Q1", "Median", "Q3"], q.all.map((a) => [methodName(a.method), num(a.q1, 1), num(a.median, 1), num(a.q3, 1)])));
    if (q.sensitive) d.append(el("p", { class: "warn-text" }, el("strong", { text: "Note: " }), q.note || "Another quartile definition would flag different readings."));
    kids.push(d);
  } else kids.push(missing("quantiles", "Quantiles"));
  kids.push(helpLinks([["standard-deviation", "standard deviation"], ["range-iqr", "range and IQR"], ["mad", "MAD"], ["cv", "CV"], ["sem", "standard error"], ["quantiles", "quantiles"]]));
  return card("spread", "Spread", ...kids);
}

addCard("spread", spreadCard);
