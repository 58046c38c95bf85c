// The verdict: what to quote and why, the warnings and the caution.
import { el, num, withUnit, helpLinks, missing, quoteIsMedian, count } from "./dom.js";
import { addCard, card, quote } from "./card-kit.js";

function verdictCard(rep) {
  const v = rep.verdict || {};
  const med = quoteIsMedian();
  const kids = [];
  if (v.quote === "value" && rep.centre) {
    kids.push(el("p", { class: "lead" }, "One reading: ", ...withUnit(num(rep.centre.mean, 2, "verdict-mean")), ". No spread can be quoted from one reading."));
  } else if (med && rep.centre && rep.spread) {
    kids.push(el("p", { class: "lead" }, "Quote the median, ", ...withUnit(num(rep.centre.median, 1, "verdict-median")), ", and the interquartile range, ", ...withUnit(num(rep.spread.iqr, 1, "verdict-iqr")), "."));
  } else if (rep.centre && rep.spread) {
    kids.push(el("p", { class: "lead" }, "Quote the mean, ", ...withUnit(num(rep.centre.mean, 2, "verdict-mean")), ", and the standard deviation, ", ...withUnit(num(rep.spread.sd, 2, "verdict-sd")), "."));
  } else {
    kids.push(el("p", { class: "lead", text: "No centre or spread could be computed: see the notes below." }));
  }
  kids.push(el("p", { class: "basis", text: count(rep.counts.used, "value") + " used" +
    (rep.counts.excluded ? ", " + rep.counts.excluded + " left out by you" : "") +
    (rep.counts.rejected ? ", " + count(rep.counts.rejected, "cell") + (rep.counts.rejected === 1 ? " not a number" : " not numbers") : "") +
    (rep.counts.missing ? ", " + rep.counts.missing + " empty or marked missing" : "") + "." }));
  if (v.reasons && v.reasons.length) kids.push(el("ul", { class: "reasons" }, ...v.reasons.map((r) => el("li", { "data-code": r.code, text: r.text }))));
  if (v.warnings && v.warnings.length) kids.push(el("ul", { class: "warnings", "aria-label": "Warnings" }, ...v.warnings.map((r) => el("li", { "data-code": r.code }, el("strong", { text: "Warning: " }), r.text))));
  // the other sections' verdicts in their own cards' words, each with a
  // link to its card: the limits, the target, over time, between groups
  const glance = [];
  if (rep.spec && rep.spec.statement) glance.push(["spec", "Against the limits", rep.spec.statement]);
  if (rep.target && rep.target.statement) glance.push(["spec", "Against the target", rep.target.statement]);
  if (rep.stability && rep.stability.verdict) glance.push(["time", "Over time", rep.stability.verdict + "."]);
  if (rep.groups && rep.groups.statement) glance.push(["groups", "Between groups", rep.groups.statement]);
  if (glance.length) {
    kids.push(el("ul", { class: "glance", "aria-label": "The other sections' verdicts" },
      ...glance.map(([id, label, text]) => el("li", { "data-section": id }, el("a", { href: "#card-" + id, text: label }), ": " + text))));
  }
  kids.push(el("p", { class: "caution" }, el("strong", { text: "Caution: " }),
    v.caution || "For safety-critical parts, legal net quantity or medical products, follow your local regulations, codes and licensed practice; this report supports, and does not replace, that judgement."));
  kids.push(helpLinks([["verdict", "how the verdict is reached"], ["reading-your-report", "reading your report"], ["cautions", "cautions"]]));
  return card("verdict", "Verdict", ...kids);
}

addCard("verdict", verdictCard);
