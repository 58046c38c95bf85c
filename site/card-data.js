// What was read: the column, the counts, the unused cells by row.
import { unit, el, num, helpLinks, table, missing } from "./dom.js";
import { downloadProblems } from "./export.js";
import { addCard, card, quote } from "./card-kit.js";

// unusedHeading counts the list the way the counts table, the verdict and
// input.summary do: the value column's cells not used are counts.rejected
// (not numbers) + counts.missing (empty or marked missing); the rest of the
// list is about other columns and the file as a whole.
function unusedHeading(rep, probs) {
  const c = rep.counts, col = rep.input.column;
  const own = c.rejected + c.missing;
  const rest = probs.filter((p) => !(p.row > 0 && p.column === col)).length;
  let t = own === 0 ? "No cell of \u201c" + col + "\u201d left unused"
    : own + (own === 1 ? " cell" : " cells") + " of \u201c" + col + "\u201d not used (" + c.rejected + " not " + (c.rejected === 1 ? "a number" : "numbers") + ", " + c.missing + " empty or marked missing)";
  if (rest) t += "; " + rest + (rest === 1 ? " note" : " notes") + " on other columns and the file";
  return t + ", by row";
}

function dataCard(rep) {
  const c = rep.counts;
  const rows = [["Values used", el("span", { class: "num", "data-field": "used", "data-value": String(c.used), text: String(c.used) })], ["Empty or marked missing", String(c.missing)], ["Cells not numbers", String(c.rejected)],
    ["Left out by you", String(c.excluded)], ["Distinct values", String(c.distinct)]];
  if (c.resolution) rows.push(["Resolution (smallest step as typed)", [num(c.resolution, 0, "resolution")].concat(unit() ? [" " + unit()] : [])]);
  rows.push(["Fingerprint (SHA-256 of the input as read)", el("code", { class: "fp", text: rep.input.fingerprint })]);
  const kids = [
    el("p", { class: "quote" }, el("span", { class: "quote-label", text: "Column " }), el("strong", { class: "colname", text: rep.input.column || "value" }), rep.input.unit ? " (" + rep.input.unit + ")" : ""),
    el("p", { text: rep.input.summary }),
    table(null, rows, "figs kv"),
  ];
  const probs = rep.input.problems || [];
  if (probs.length) {
    const shown = probs.slice(0, 300);
    kids.push(el("details", { class: "problems", open: probs.length <= 20 ? "" : null },
      el("summary", { text: unusedHeading(rep, probs) }),
      table(["Row", "Column", "As typed", "Why", "What was done"], shown.map((p) => [String(p.row), p.column || "", p.text || "", p.reason, p.action]), "figs problems-t"),
      probs.length > shown.length ? el("p", { text: "First " + shown.length + " shown; all " + probs.length + " are in the CSV below and in the report JSON." }) : null,
      el("button", { type: "button", class: "small", text: "Download the unused cells (CSV)", onclick: () => downloadProblems() })));
  }
  kids.push(helpLinks([["data-formats", "data formats"], ["resolution", "resolution"], ["privacy", "privacy"]]));
  return card("data", "What was read", ...kids);
}

addCard("data", dataCard);
