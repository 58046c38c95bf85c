// Against the spec (placeholder): the target tests where given, and what
// the section will need (limits). To be replaced by the spec section's card.
import { el, num, withUnit, helpLinks, table, missing } from "./dom.js";
import { addCard, card, quote, testRows } from "./card-kit.js";

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

addCard("spec", specCard);
