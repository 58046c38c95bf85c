// Lotlens page, entry module: the output buttons, the automation entry
// point and the start. The engine runs in a Web Worker (engine.js, driven by
// engine-client.js); the page never computes a statistic, it only shows what
// the engine reports. Modules: state.js (the page's state, in one place),
// engine-client.js, input.js (paste, file, settings, shared link), cards.js
// (the report), dom.js (formatting and DOM helpers), export.js (downloads,
// summary), share.js (links, .lotlens files, opening them) and stored.js
// (the encrypted stored copy, off unless the site keeps copies).
//
// Automation (for the help page help/automation.md):
//   On the page, once it has loaded:
//     const report = await lotlens.analyse({ text: "5.12\n5.08\n5.10\n" , options: { confidence: 0.95 } });
//   analyse(request) takes a request object (schema "lotlens.request/1": text or
//   cells, optional value/group/order/subgroup column names, options) and
//   resolves to the report object (schema "lotlens.report/1"), the same JSON
//   that stats.Analyze gives in Go. It rejects with an Error whose message is
//   the engine's explanation when no report can be made, and whose code is
//   the engine's error code (e.g. "internal"). It runs in the same
//   Web Worker as the page, never touches the page's own data or settings, and
//   sends nothing anywhere. lotlens.ready() resolves once the engine has loaded.
//   lotlens.shownReport() is the report the page shows, as JSON text.
import { $, SCHEMA, state, setStatus, errorOf } from "./state.js";
import { startEngine, whenReady, call, onWarmed } from "./engine-client.js";
import { warmRender } from "./cards.js";
import { readSettings, buildRequest } from "./input.js";
import { copyText, summaryText, download, fileBase, suspectsCSV } from "./export.js";
import { shareLink, takeFromAddress, openIncoming } from "./share.js";

$("copy").addEventListener("click", async () => {
  setStatus(await copyText(summaryText()) ? "Summary copied as text." : "The browser did not allow copying; use Download JSON instead.", false);
});
$("dl-json").addEventListener("click", () => download(fileBase() + "-report.json", JSON.stringify(state.report, null, 2) + "\n", "application/json"));
$("dl-csv").addEventListener("click", () => download(fileBase() + "-suspect-readings.csv", suspectsCSV(), "text/csv"));
$("print").addEventListener("click", () => window.print());
$("share").addEventListener("click", () => {
  const o = readSettings();
  shareLink(o ? buildRequest(o) : null);
});

// ---------- scripts ----------
window.lotlens = Object.freeze({
  version: "1",
  ready: whenReady,
  analyse(request) {
    const req = Object.assign({ schema: SCHEMA }, request || {});
    return call({ type: "analyse", request: req }).then((m) => {
      const rep = JSON.parse(m.json);
      const err = errorOf(rep);
      if (err) throw Object.assign(new Error(err.message), { code: err.code });
      return rep;
    });
  },
  // timing of the page's last analysis (ms), for the speed checks
  timing: () => state.timing && Object.assign({}, state.timing),
  // when the engine's worker started, its wasm response arrived and the
  // module was compiled (ms since navigation), for the speed checks
  loadPhases: () => state.loadPhases && Object.assign({}, state.loadPhases),
  // the warm-up's stages, ms each: the longest is the most a first request waits
  warmStages: () => state.warmStageMs && state.warmStageMs.slice(),
  // the report the page shows, as JSON text (null when none): for checks
  // that two pages show the very same report
  shownReport: () => state.report ? JSON.stringify(state.report) : null,
});

// ---------- start ----------
// A shared link is read from the address and removed from it (and from the
// current history entry) before anything else, so it does not linger.
const incoming = takeFromAddress();
startEngine();
// once the engine is warm, warm the page's rendering too, when idle
onWarmed(warmRender);
whenReady().then(async () => {
  if (incoming) await openIncoming(incoming);
  else if (!document.body.dataset.shareError && !state.report) setStatus("Ready. Paste values, open a file or try the demo.");
});
window.addEventListener("hashchange", () => {
  const found = takeFromAddress();
  if (found) whenReady().then(() => openIncoming(found));
});
// The service worker (offline use) is registered once the engine is ready:
// its install downloads every asset, the engine included, and would
// otherwise compete with the engine's own download and compilation.
if ("serviceWorker" in navigator && location.protocol !== "file:") {
  whenReady().then(() => navigator.serviceWorker.register("sw.js"))
    .then(() => { document.body.dataset.sw = "registered"; })
    .catch(() => { /* offline use needs it; the page works without */ });
}
