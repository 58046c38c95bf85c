// Against the spec: the target tests where a target is given, then the
// batch against its limits (report.spec): conformance, expected fraction
// outside, capability indices with their bounds, the model, the tolerance
// intervals and the sample sizes, as the engine reports them. Nothing is
// computed here but the display of ppm.
import { el, num, pct, comma, table, helpLinks, withUnit, missing, methodName } from "./dom.js";
import { addCard, card, testRows, chartFigure } from "./card-kit.js";

// ppm writes a fraction given in ppm: ppm below 1 %, a percentage above.
function ppm(v) {
  if (v === null || v === undefined || !isFinite(v)) return "\u2013";
  let s;
  if (v === 0) s = "0 ppm";
  else if (v < 0.01) s = "< 0.01 ppm";
  else if (v < 10000) s = Number(v.toPrecision(2)).toString() + " ppm";
  else s = Number((v / 1e4).toPrecision(2)).toString() + " %";
  return comma() ? s.replace(".", ",") : s;
}
function two(v) {
  if (v === null || v === undefined || !isFinite(v)) return "\u2013";
  const s = v.toFixed(2);
  return comma() ? s.replace(".", ",") : s;
}
function idx(v, field) {
  return el("span", { class: "num", "data-value": String(v), "data-field": field, text: two(v) });
}

const modelNames = {
  "normal-within": "normal, within-process sigma",
  "normal-overall": "normal, overall SD",
  "lognormal": "lognormal", "lognormal-3": "lognormal (3 parameters)",
  "weibull": "Weibull", "weibull-3": "Weibull (3 parameters)",
  "gamma": "gamma", "gamma-3": "gamma (3 parameters)",
  "box-cox": "Box-Cox-transformed normal", "empirical": "the data's own percentiles",
};
// specSection returns the elements of the spec part, or a hint when no
// limit is given.
function specSection(rep) {
  const sp = rep.spec;
  const st = rep.settings;
  const hasLimit = (st.lsl !== undefined && st.lsl !== null) || (st.usl !== undefined && st.usl !== null);
  if (!hasLimit) return [el("p", { class: "needs", text: "To see the fraction out of specification and the capability indices, give the lower or upper specification limit (LSL, USL) in Settings." })];
  if (!sp) return [el("p", { class: "missing", text: "The comparison with the limits could not be computed for these readings; see the notes." })];
  const out = [];
  out.push(el("p", { class: "lead-small spec-statement", text: sp.statement }));
  out.push(chartFigure("spec", "Readings per bin against the limits, with the fitted curves."));
  out.push(chartFigure("spec-spread", "Spread of the process against the tolerance."));

  // What is outside now.
  const o = sp.observed;
  const obsRows = [];
  const obsRow = (label, c) => [label, String(c.count) + " of " + o.n, ppm(c.ppm), ppm(c.ci.lo) + " to " + ppm(c.ci.hi), ppm(c.upperBound)];
  if (o.below) obsRows.push(obsRow("Below LSL", o.below));
  if (o.above) obsRows.push(obsRow("Above USL", o.above));
  obsRows.push(obsRow("Outside", o.total));
  out.push(el("h4", { text: "Readings outside, as typed" }));
  out.push(table(["", "Count", "Fraction", pct(rep.settings.confidence) + " interval", "Upper bound"], obsRows));

  // What the process is expected to put outside.
  if (sp.expected && sp.expected.length) {
    out.push(el("h4", { text: "Expected outside" }));
    out.push(table(["Model", "Below", "Above", "Total", "Upper bound"], sp.expected.map((e) => [
      (modelNames[e.model] || e.model) + (e.model === sp.lead || (sp.lead === "normal" && e.model === "normal-within") ? " (leads)" : ""),
      e.below !== undefined ? ppm(e.below) : "\u2013", e.above !== undefined ? ppm(e.above) : "\u2013", ppm(e.total),
      e.upperBound !== undefined ? ppm(e.upperBound) : "\u2013"])));
  }

  // Capability indices.
  if (sp.indices && sp.indices.length) {
    out.push(el("h4", { text: "Capability" }));
    const sig = sp.sigma;
    const sl = el("p", { class: "why" }, "Within-process sigma: ");
    if (sig.within) sl.append(...withUnit(num(sig.within.value, 2, "spec.sigma.within.value")), " (" + methodName(sig.within.method) + "; " + String(Math.round(sig.within.df)) + " degrees of freedom). ");
    else sl.append("not available. ");
    sl.append("Overall SD: ", ...withUnit(num(sig.overall.value, 2, "spec.sigma.overall.value")), ".");
    out.push(sl);
    out.push(table(["Index", "Sigma", "Value", pct(rep.settings.confidence) + " interval", "Lower bound", "Method"], sp.indices.map((x) => [
      x.name, x.basis === "percentile" ? "percentiles" : x.basis, idx(x.value, "spec." + x.name),
      x.ci ? el("span", null, idx(x.ci.lo), " to ", idx(x.ci.hi)) : "\u2013",
      x.lowerBound !== undefined ? idx(x.lowerBound) : "\u2013",
      x.ci ? methodName(x.ci.method) : (x.basis === "percentile" ? "ISO 22514-2" : "")])));
  }

  // The model (non-normal data).
  if (sp.model) {
    const m = sp.model;
    out.push(el("h4", { text: "Distributions tried" }));
    out.push(table(["Distribution", "Fits?", "AIC", "Anderson-Darling", "p"], m.candidates.map((c) => [
      (modelNames[c.family] || c.family) + (c.family === m.chosen ? " (chosen)" : ""),
      c.fitted ? (c.adequate ? "yes" : "no") : "not fitted: " + c.reason.replace(/-/g, " "),
      c.aic !== undefined ? two(c.aic) : "\u2013", c.ad !== undefined ? two(c.ad) : "\u2013",
      c.adP !== undefined ? (c.adP < 0.001 ? "< 0.001" : two(c.adP)) : "\u2013"])));
  }

  // Tolerance intervals.
  if (sp.toleranceIntervals && sp.toleranceIntervals.length) {
    out.push(el("h4", { text: "Tolerance intervals" }));
    const kinds = { "normal": "normal, two-sided", "normal-lower": "normal, lower", "normal-upper": "normal, upper", "distribution-free": "any distribution" };
    out.push(table(["Kind", "Claim", "Interval", "Inside the limits?"], sp.toleranceIntervals.map((t) => [
      kinds[t.kind] || t.kind,
      pct(t.confidence) + " sure that " + pct(t.coverage) + " of parts lie inside",
      t.supported ? el("span", null, t.lo !== undefined ? num(t.lo, 2) : "\u2212\u221e", " to ", t.hi !== undefined ? num(t.hi, 2) : "+\u221e")
        : "needs " + t.minN + " readings",
      t.insideSpec === undefined ? "\u2013" : (t.insideSpec ? "yes" : "no")])));
  }

  // Sample sizes.
  if (sp.sampleSize) {
    const s = sp.sampleSize;
    const p = el("p", { class: "why" });
    if (s.forCpkBound !== undefined) p.append("About " + s.forCpkBound + " readings would show Cpk above " + two(s.cpkGoal) + " with " + pct(rep.settings.confidence) + " confidence, if the estimate stays as it is. ");
    p.append("A claim for any distribution (" + pct(st.coverage || 0.99) + " of parts between the smallest and the largest reading) needs " + s.distributionFree + " readings; one-sided, " + s.distributionFreeOneSided + ".");
    out.push(p);
  }

  if (sp.cautions && sp.cautions.length) out.push(el("ul", { class: "cautions" }, ...sp.cautions.map((c) => el("li", { "data-code": c.code, text: c.text }))));
  out.push(helpLinks([["conformance", "outside the limits"], ["capability", "capability indices"], ["non-normal-capability", "non-normal data"], ["tolerance-intervals", "tolerance intervals"]]));
  return out;
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
  kids.push(...specSection(rep));
  kids.push(links);
  const empty = !rep.target && (st.target === undefined || st.target === null) && (st.lsl === undefined || st.lsl === null) && (st.usl === undefined || st.usl === null);
  return card(empty ? "spec placeholder" : "spec", "Against the spec", ...kids);
}

addCard("spec", specCard);
