// What every report card needs: the registry of cards (each card-*.js module
// registers itself; cards.js imports them in the order they appear), the
// card frame, the quoted figure, chart figures and test rows.
//
// Adding a card: write site/card-<name>.js calling addCard(id, build) and add
// one line `import "./card-<name>.js";` to cards.js at the place the card
// should appear. build(report) returns the card element (use card()); it may
// return null when it has nothing to show.
import { state } from "./state.js";
import { fmtP, el, num, withUnit } from "./dom.js";
import { download, fileBase } from "./export.js";

const registry = [];
export function addCard(id, build) {
  const i = registry.findIndex((c) => c.id === id);
  if (i >= 0) registry[i] = { id, build }; // a later module replaces a placeholder
  else registry.push({ id, build });
}
export function cardList() { return registry.slice(); }

// card is the frame of one card: id "spec" or "spec placeholder" (a
// placeholder says what the section will need and is left out of print).
export function card(id, title, ...kids) {
  const key = id.split(" ")[0];
  return el("article", { class: "card" + (id.endsWith(" placeholder") ? " placeholder" : ""), id: "card-" + key, "aria-labelledby": "card-" + key + "-h" },
    el("h3", { id: "card-" + key + "-h", text: title }), ...kids);
}
export function quote(label, v, extra, field) {
  return el("p", { class: "quote" }, el("span", { class: "quote-label", text: label + " " }), ...withUnit(Object.assign(num(v, extra, field), { className: "num big" })));
}
export function testRows(tests) {
  return tests.filter(Boolean).map((t) => [t.name, num(t.statistic, 3), t.df !== undefined && t.df !== null ? num(t.df, 0) : "\u2013", fmtP(t.p), t.method || ""]);
}

// chartFigure: the engine's SVG text parsed by the HTML parser of an inert
// <template> (no script runs, nothing loads; the text in it is escaped by
// the Go chart package): several times faster than DOMParser's XML parser
// plus importNode, which took most of the page's rendering time. The Save
// button comes before the keyboard hint, and the hint shows only while the
// figure itself has keyboard focus, so nothing moves under a click.
export function chartFigure(key, caption) {
  const src = state.svg && state.svg[key];
  if (!src) return el("p", { class: "missing", text: "No chart: the report has no data for it." });
  const tpl = document.createElement("template");
  tpl.innerHTML = src;
  const svg = tpl.content.firstElementChild;
  if (!svg || svg.nodeName !== "svg" || tpl.content.childElementCount !== 1) return el("p", { class: "missing", text: "The chart could not be drawn." });
  const fig = el("figure", { class: "chart-fig", "data-chart": key, tabindex: "0",
    "aria-describedby": "kbd-" + key });
  fig.append(svg);
  const save = el("button", { type: "button", class: "small save-svg", text: "Save SVG", onclick: () => download(fileBase() + "-" + key + ".svg", src, "image/svg+xml") });
  fig.append(el("figcaption", null, el("span", { class: "cap", text: caption + " " }), save,
    el("span", { id: "kbd-" + key, class: "kbd-hint", text: "Tap or hover a point for its row; with the keyboard, arrow keys step through the points and Enter leaves one out or puts it back." })));
  return fig;
}
