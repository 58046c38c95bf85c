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

// parseChart: the engine's SVG text parsed by the HTML parser of an inert
// <template> (no script runs, nothing loads; the text in it is escaped by
// the Go chart package): several times faster than DOMParser's XML parser
// plus importNode, which took most of the page's rendering time.
function parseChart(src) {
  const tpl = document.createElement("template");
  tpl.innerHTML = src;
  const svg = tpl.content.firstElementChild;
  return svg && svg.nodeName === "svg" && tpl.content.childElementCount === 1 ? svg : null;
}
const NOT_DRAWN = "The chart could not be drawn.";

// Large charts wait (the SVG of a long series: about 400 KB and 3,000
// elements for a control chart of 1,000,000 readings). While render() draws
// a report (drawLater), a chart of more than LATER characters gets a
// placeholder of its size, and chartsDrawn() parses it just after the report
// has been painted: the verdict and the figures come on
// screen without waiting for the charts below them (parsing and laying out
// the charts of a 1M-value file took 20-50 ms). A chart is drawn at once
// whenever something needs it: a tap, a key, focus (pointsOf in
// chart-tips.js), print.
const LATER = 16384;
const waiting = new Map(); // figure -> its SVG text, not drawn yet
let later = false;
export function drawLater(on) {
  if (on) waiting.clear(); // a new report: the old figures are gone
  later = on;
}
export function drawChart(fig) {
  const src = waiting.get(fig);
  if (src === undefined) return;
  waiting.delete(fig);
  const wait = fig.querySelector(".chart-wait");
  if (!wait) return;
  const svg = parseChart(src);
  if (svg) wait.replaceWith(svg);
  else fig.replaceWith(el("p", { class: "missing", text: NOT_DRAWN }));
}
export function drawCharts() { for (const fig of [...waiting.keys()]) drawChart(fig); }
// chartsDrawn resolves once no chart waits: it draws them all in one task
// once the frame that shows the report has been painted (or after 100 ms,
// should frames not come: a hidden tab). One task, not one a chart: each
// chart drawn in a task of its own waited for a frame of its own. It
// resolves with the two moments (performance.now()): painted, the start of
// that task; drawn, its end.
export function chartsDrawn() {
  return new Promise((resolve) => {
    let done = false;
    const draw = () => {
      if (done) return;
      done = true;
      const painted = performance.now();
      drawCharts();
      resolve({ painted, drawn: performance.now() });
    };
    requestAnimationFrame(() => setTimeout(draw, 0));
    setTimeout(draw, 100);
  });
}
window.addEventListener("beforeprint", drawCharts);

// chartFigure: a chart with its caption and Save button. The Save button
// comes before the keyboard hint, and the hint shows only while the figure
// itself has keyboard focus, so nothing moves under a click.
export function chartFigure(key, caption) {
  const src = state.svg && state.svg[key];
  if (!src) return el("p", { class: "missing", text: "No chart: the report has no data for it." });
  let body;
  if (later && src.length > LATER) {
    body = el("div", { class: "chart-wait" });
    const vb = /viewBox="0 0 ([0-9.]+) ([0-9.]+)"/.exec(src.slice(0, 300));
    if (vb) body.style.aspectRatio = vb[1] + " / " + vb[2];
  } else {
    body = parseChart(src);
    if (!body) return el("p", { class: "missing", text: NOT_DRAWN });
  }
  const fig = el("figure", { class: "chart-fig", "data-chart": key, tabindex: "0",
    "aria-describedby": "kbd-" + key });
  fig.append(body);
  const save = el("button", { type: "button", class: "small save-svg", text: "Save SVG", onclick: () => download(fileBase() + "-" + key + ".svg", src, "image/svg+xml") });
  fig.append(el("figcaption", null, el("span", { class: "cap", text: caption + " " }), save,
    el("span", { id: "kbd-" + key, class: "kbd-hint", text: "Tap or hover a point for its row; with the keyboard, arrow keys step through the points and Enter leaves one out or puts it back." })));
  if (body.classList.contains("chart-wait")) waiting.set(fig, src);
  return fig;
}
