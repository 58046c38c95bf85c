// Engine client: the page's side of the Web Worker (engine.js) that runs the
// Go engine. Calls are messages with an id; the answer resolves the call.
import { state, setStatus } from "./state.js";

let engine = null, engineReady = false, seq = 0;
const pending = new Map(); // id -> {resolve, reject, onProgress}
let readyWaiters = [];
const warmedListeners = [];
// onWarmed(f): f(json, svg) once the engine has warmed up, with a report of
// invented data the page may draw off screen to warm its own code.
export function onWarmed(f) { warmedListeners.push(f); }

export function startEngine() {
  engineReady = false;
  // the worker boot.js started while the modules loaded, or a new one
  const boot = window.lotlensBoot && window.lotlensBoot.adopt();
  engine = boot ? boot.worker : new Worker("engine.js");
  engine.onmessage = onMessage;
  if (boot) for (const ev of boot.early) onMessage(ev);
  engine.onerror = (e) => setStatus("The engine stopped: " + (e.message || e) + ". Reload the page.", true);
}
function onMessage(ev) {
  const m = ev.data;
  if (m.type === "ready") {
    engineReady = true;
    if (!document.body.dataset.readyMs) document.body.dataset.readyMs = String(Math.round(performance.now()));
    document.body.dataset.ready = "1";
    readyWaiters.forEach((f) => f());
    readyWaiters = [];
    return;
  }
  if (m.type === "phases") { // load phases, as ms on the page's clock, for the speed checks
    const rel = {};
    for (const k in m.phases) rel[k] = Math.round(m.phases[k] - performance.timeOrigin);
    state.loadPhases = rel;
    return;
  }
  if (m.type === "error") { setStatus(m.error, true); return; }
  if (m.type === "warmed") {
    document.body.dataset.warmedMs = String(Math.round(performance.now()));
    state.warmStageMs = m.stageMs || []; // for the speed checks
    if (m.json) for (const f of warmedListeners) f(m.json, m.svg || {});
    return;
  }
  const p = pending.get(m.id);
  if (!p) return;
  if (m.type === "progress") { if (p.onProgress) p.onProgress(m.read, m.total); return; }
  pending.delete(m.id);
  p.resolve(m);
}
export function whenReady() {
  return engineReady ? Promise.resolve() : new Promise((r) => readyWaiters.push(r));
}
export function call(msg, onProgress) {
  return whenReady().then(() => new Promise((resolve, reject) => {
    const id = ++seq;
    pending.set(id, { resolve, reject, onProgress });
    engine.postMessage(Object.assign({ id }, msg));
  }));
}
// A cancel that the worker cannot hear (it is busy computing) ends it.
export function restartEngine(reason) {
  engine.terminate();
  for (const [, p] of pending) p.reject(new Error(reason));
  pending.clear();
  state.hasTable = false;
  state.lastKey = "";
  startEngine();
}
// cancelRead asks the worker to stop reading a file (it answers the file
// call with the error code "cancelled").
export function cancelRead() {
  if (engine) engine.postMessage({ type: "cancel" });
}
