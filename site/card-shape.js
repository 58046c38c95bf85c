// Shape: the normality tests, skewness and kurtosis, the probability plot.
import { fmtP, el, num, helpLinks, table, missing, pct } from "./dom.js";
import { addCard, card, quote, chartFigure, testRows } from "./card-kit.js";

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
  kids.push(chartFigure("probplot", probPlotCaption(rep)));
  const rows = [];
  if (sh.skewness) rows.push(["Skewness (G1)", [num(sh.skewness.value, 3), " \u00b1 ", num(sh.skewness.se, 3)], sh.skewness.test ? fmtP(sh.skewness.test.p) : "\u2013"]);
  if (sh.kurtosis) rows.push(["Excess kurtosis (G2)", [num(sh.kurtosis.value, 3), " \u00b1 ", num(sh.kurtosis.se, 3)], sh.kurtosis.test ? fmtP(sh.kurtosis.test.p) : "\u2013"]);
  if (rows.length) kids.push(table(["Figure", "Value \u00b1 SE", "p"], rows));
  const tests = testRows([sh.shapiroWilk, sh.andersonDarling, sh.omnibus, sh.large]);
  if (tests.length) kids.push(table(["Test", "Statistic", "df", "p", "Method"], tests));
  kids.push(links);
  return card("shape", "Shape", ...kids);
}

// The probability plot's caption names its envelope: simultaneous, so one
// point outside it is enough to doubt the normal model at its level.
function probPlotCaption(rep) {
  const pp = rep.charts && rep.charts.probPlot;
  const base = "Normal probability plot: points near the straight line suggest a normal shape.";
  if (!pp || !pp.bandLevel || !pp.band || pp.band.length < 2) return base;
  return base + " The shaded envelope is simultaneous (" + pp.bandMethod + " method, " + pct(pp.bandLevel) +
    "): a normal sample has all its readings inside it together with " + pct(pp.bandLevel) +
    " probability, so if any point leaves it, the normal model is doubtful at that level.";
}

addCard("shape", shapeCard);
