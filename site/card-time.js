// Over time (placeholder): the run chart and what the section will need
// (an order or time column). To be replaced by the stability section's card.
import { state } from "./state.js";
import { el, helpLinks } from "./dom.js";
import { addCard, card, chartFigure } from "./card-kit.js";

function timeCard(rep) {
  const kids = [chartFigure("run", (rep.input.order ? "Run chart: values in the order of " + rep.input.order : "Run chart: values in data order") + ", labelled by row, with the median, the target and the limits; flagged readings marked.")];
  kids.push(el("p", { class: "why", text: "Values in the order they were recorded show drifts, steps and cycles that the histogram hides. Long runs on one side of the median suggest the process moved." }));
  // advice names the Columns choice only where it is on screen
  const canChoose = (rep.input.columns || []).length > 1; // the Columns choice is shown
  kids.push(el("p", { class: "needs", text: state.cols.order
    ? "Stability checks over the chosen order column (control limits, run rules) are not computed in this version; the run chart follows that column."
    : canChoose
      ? "For control limits and run rules over time, choose an order or time column under Columns (the chart above uses the order of the rows)."
      : "For control limits and run rules over time, paste or drop the values with a second column giving each reading's time or order, with a header row (the chart above uses the order of the rows)." }));
  kids.push(helpLinks([["run-chart", "run chart"]]));
  return card("time", "Over time", ...kids);
}

addCard("time", timeCard);
