// Suspect readings: the flagged readings with their rules and switches, the
// readings left out by the user with their reasons, the box plot.
import { state, actions } from "./state.js";
import { unit, el, num, helpLinks, table, missing, reasonText } from "./dom.js";
import { addCard, card, chartFigure } from "./card-kit.js";

// excludedItem is one reading left out by the user: its row and value, the
// reason typed for it (an input on screen, its text on paper) and Put back.
function excludedItem(r) {
  const why = reasonText(r.row);
  const id = "reason-" + r.row;
  const input = el("input", { type: "text", id, class: "reason", "data-reason-row": String(r.row), autocomplete: "off",
    placeholder: "e.g. gauge dropped, part re-measured", maxlength: "200" });
  input.value = state.reasons.get(r.row) || "";
  input.addEventListener("input", () => {
    state.reasons.set(r.row, input.value);
    printed.textContent = input.value.trim() ? "Reason: " + input.value.trim() : "No reason given.";
    actions.reasonChanged(r.row);
  });
  const printed = el("span", { class: "reason-print", text: why ? "Reason: " + why : "No reason given." });
  return el("li", { "data-row-out": String(r.row) },
    el("span", { class: "out-what", text: "Row " + r.row + ": " + r.text + (unit() ? " " + unit() : "") + " " }),
    el("button", { type: "button", class: "small", text: "Put back", "data-put-back": String(r.row), "aria-label": "Put back row " + r.row, onclick: () => actions.toggleExclude(r.row) }),
    el("label", { class: "reason-label", for: id, text: "Why was row " + r.row + " left out? (optional, kept in the print and the share link)" }),
    input, printed);
}

// The box plot comes right after the card's opening sentence, so that on
// paper it floats beside the list of flagged readings.
function boxPlot() {
  return chartFigure("box", "Box plot: box from Q1 to Q3 with the median; whiskers to the last values inside the inner fences; flagged readings labelled by row.");
}

function suspectsCard(rep) {
  const links = helpLinks([["tukey-fences", "Tukey's fences"], ["adjusted-boxplot", "adjusted box plot"], ["modified-z", "modified z-score"], ["gesd", "generalized ESD"], ["box-plot", "box plot"]]);
  const s = rep.suspects;
  const excl = (rep.settings.excluded || []);
  const kids = [];
  if (!s) {
    kids.push(missing("suspects", "The suspect-reading rules"), boxPlot());
  } else {
    const n = s.readings.length;
    const lead = s.lead;
    const leadRule = lead ? (s.rules || []).find((r) => r.code === lead.rule) : null;
    const headline = lead ? lead.count : n;
    const plain = {};
    for (const r of s.rules || []) plain[r.code] = r.plain || r.name || r.code;
    kids.push(el("p", { class: "quote" }, el("span", { class: "quote-label", text: "Flagged readings " }), el("span", { class: "num big", "data-field": "suspects.lead.count", "data-value": String(headline), text: String(headline) }),
      leadRule ? el("span", { class: "quote-label", text: " by " + (leadRule.name || leadRule.code) }) : null));
    if (lead) kids.push(el("p", { class: "why", "data-field": "suspects.lead", text: lead.text }));
    kids.push(el("p", { class: "why", text: "The count is the leading rule's; readings only other rules flag are listed below it as \u201calso flagged by\u201d. Nothing is removed unless you choose to leave it out, and every exclusion is listed in the report." }));
    kids.push(boxPlot());
    if (n) {
      const shown = state.allSuspects || n <= 50 ? s.readings : s.readings.slice(0, 50);
      kids.push(table(["Row", "As typed", "Why it is flagged", "In the analysis"], shown.map((r) => {
        const out = state.exclude.has(r.row);
        const mine = (r.flags || []).filter((f) => f.lead);
        const others = (r.flags || []).filter((f) => !f.lead);
        const items = mine.map((f) => el("li", { "data-rule": f.rule, class: "lead", text: f.text || f.rule }));
        if (others.length) items.push(el("li", { class: "also", text: "also flagged by: " + others.map((f) => plain[f.rule] || f.rule).join("; ") }));
        return [String(r.row), r.text + (unit() ? " " + unit() : ""),
          el("ul", { class: "flags", "data-lead": r.lead ? "true" : "false" }, ...items),
          [el("span", { class: out ? "state out" : "state in", text: out ? "left out" : "used" }),
            el("button", { type: "button", class: "toggle", "aria-pressed": out ? "true" : "false", "data-row": String(r.row),
              "aria-label": (out ? "Put back row " : "Leave out row ") + r.row, text: out ? "Put back" : "Leave out",
              onclick: () => actions.toggleExclude(r.row) })]];
      }), "figs suspects-t"));
      if (shown.length < n) kids.push(el("button", { type: "button", class: "small", text: "Show all " + n + " flagged readings",
        onclick: () => { state.allSuspects = true; actions.render(); } }),
        el("p", { class: "print-only", text: "The first " + shown.length + " of " + n + " flagged readings are listed; all " + n + " are in the suspect-readings CSV and the report JSON." }));
    } else kids.push(el("p", { text: "No reading is flagged by any of the rules." }));
    if (s.rules && s.rules.length) kids.push(el("details", null, el("summary", { text: "The rules as applied" }),
      table(["Rule", "Lower limit", "Upper limit", "Flags", "Note"], s.rules.map((r) => [r.name || r.code,
        r.lo !== undefined && r.lo !== null ? num(r.lo, 1) : "\u2013", r.hi !== undefined && r.hi !== null ? num(r.hi, 1) : "\u2013", String(r.count), r.note || ""]))));
  }
  if (excl.length) kids.push(el("div", { class: "excluded" }, el("h4", { text: "Left out by you" }),
    el("ul", { class: "excluded-list" }, ...excl.map(excludedItem))));
  kids.push(links);
  return card("suspects", "Suspect readings", ...kids);
}

addCard("suspects", suspectsCard);
