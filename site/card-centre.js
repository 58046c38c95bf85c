// Centre: the quoted centre with its interval, every centre figure, the histogram.
import { pct, el, num, helpLinks, table, intervalText, missing, quoteIsMedian } from "./dom.js";
import { addCard, card, quote, chartFigure } from "./card-kit.js";

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

addCard("centre", centreCard);
