// Groups (placeholder): what the section will need (a group column). To be
// replaced by the groups section's card.
import { state } from "./state.js";
import { el, helpLinks } from "./dom.js";
import { addCard, card } from "./card-kit.js";

function groupsCard(rep) {
  return card("groups placeholder", "Groups",
    el("p", { class: "needs", text: state.cols.group
      ? "Comparing the groups of the chosen column is not computed in this version of Lotlens."
      : (rep.input.columns || []).length > 1
        ? "To compare lines, shifts or suppliers, choose a group column under Columns."
        : "To compare lines, shifts or suppliers, paste or drop the values with a second column naming each reading's group, with a header row." }),
    helpLinks([["reading-your-report", "reading your report"]]));
}

addCard("groups", groupsCard);
