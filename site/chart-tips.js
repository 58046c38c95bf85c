// Chart points: tap, hover and keyboard. A tap or click within 22 CSS px of
// a point's centre selects it (a touch target of at least 44 px, whatever
// the point's drawn size); the tip opens beside the point, never over it.
import { $, state, actions } from "./state.js";
import { el } from "./dom.js";
import { drawChart } from "./card-kit.js";

const tip = $("tip");
export const HIT = 22; // px from a point's centre: a 44 px target
// pointsOf draws a chart still waiting (card-kit.js) before it is used
export function pointsOf(fig) { drawChart(fig); return Array.from(fig.querySelectorAll("[data-row]")); }

// nearestPoint is the point of fig whose centre is nearest (x, y) in
// client coordinates, within HIT px; null when none is that close.
function nearestPoint(fig, x, y) {
  let best = null, bd = HIT * HIT;
  for (const p of pointsOf(fig)) {
    const b = p.getBoundingClientRect();
    const dx = b.left + b.width / 2 - x, dy = b.top + b.height / 2 - y;
    const d = dx * dx + dy * dy;
    if (d <= bd) { bd = d; best = p; }
  }
  return best;
}

export function showTip(pt, fig) {
  document.querySelectorAll(".pt.hl").forEach((p) => p.classList.remove("hl"));
  pt.classList.add("hl");
  const row = Number(pt.getAttribute("data-row"));
  const title = pt.querySelector("title");
  tip.replaceChildren(
    el("span", { text: title ? title.textContent : "row " + row }),
    el("button", { type: "button", class: "small", text: state.exclude.has(row) ? "Put back" : "Leave out",
      onclick: () => { actions.toggleExclude(row); hideTip(); } }));
  tip.hidden = false;
  // beside the point: right of its 44 px target, or left when there is no
  // room; vertically centred on it and kept inside the window
  const b = pt.getBoundingClientRect();
  const cx = b.left + b.width / 2, cy = b.top + b.height / 2;
  const w = tip.offsetWidth, h = tip.offsetHeight;
  let left = cx + HIT + 4;
  if (left + w > window.innerWidth - 4) left = cx - HIT - 4 - w;
  if (left < 4) { // no room either side: above or below the target
    left = Math.min(Math.max(4, cx - w / 2), window.innerWidth - w - 4);
    const top = cy - HIT - 4 - h >= 4 ? cy - HIT - 4 - h : cy + HIT + 4;
    tip.style.left = (left + window.scrollX) + "px";
    tip.style.top = (top + window.scrollY) + "px";
  } else {
    const top = Math.min(Math.max(4, cy - h / 2), window.innerHeight - h - 4);
    tip.style.left = (left + window.scrollX) + "px";
    tip.style.top = (top + window.scrollY) + "px";
  }
  state.tip.row = row; state.tip.fig = fig;
  state.tip.index = pointsOf(fig).indexOf(pt);
}
export function hideTip() {
  tip.hidden = true; state.tip.row = null;
  document.querySelectorAll(".pt.hl").forEach((p) => p.classList.remove("hl"));
}
document.addEventListener("pointerover", (ev) => {
  if (ev.pointerType !== "mouse") return;
  const pt = ev.target.closest && ev.target.closest(".chart-fig [data-row]");
  if (pt) showTip(pt, pt.closest(".chart-fig"));
});
document.addEventListener("click", (ev) => {
  if (tip.contains(ev.target)) return;
  const fig = ev.target.closest && ev.target.closest(".chart-fig");
  if (fig && ev.target.closest("svg")) {
    const pt = ev.target.closest("[data-row]") || nearestPoint(fig, ev.clientX, ev.clientY);
    if (pt) { showTip(pt, fig); return; }
  }
  hideTip();
});
document.addEventListener("keydown", (ev) => {
  if (ev.key === "Escape") { hideTip(); return; }
  const fig = ev.target.closest && ev.target.closest(".chart-fig");
  if (!fig || ev.target !== fig) return;
  const pts = pointsOf(fig);
  if (!pts.length) return;
  if (ev.key === "ArrowRight" || ev.key === "ArrowDown" || ev.key === "ArrowLeft" || ev.key === "ArrowUp") {
    ev.preventDefault();
    if (state.tip.fig !== fig) state.tip.index = -1;
    const fwd = ev.key === "ArrowRight" || ev.key === "ArrowDown";
    const i = (state.tip.index + (fwd ? 1 : -1) + pts.length) % pts.length;
    showTip(pts[i], fig);
  } else if (ev.key === "Enter" && state.tip.row !== null && state.tip.fig === fig) {
    ev.preventDefault();
    actions.toggleExclude(state.tip.row);
  }
});
