// Boot: starts the engine's Web Worker (engine.js) while the page's modules
// are still loading, so the engine's download and compilation begin at once
// rather than after the whole module graph has arrived. A classic script,
// first in the head after the security policy (modules run only once every
// import has loaded, and a script placed after a stylesheet waits for it). Messages that
// arrive before engine-client.js takes the worker over are kept and handed
// to it (adopt()). Nothing else happens here.
"use strict";
(function () {
  if (typeof Worker === "undefined") return;
  const worker = new Worker("engine.js");
  const early = [];
  worker.onmessage = (ev) => { early.push(ev); };
  worker.onerror = (e) => { early.push({ data: { type: "error", error: "The engine stopped: " + (e.message || e) + ". Reload the page." } }); };
  let taken = false;
  window.lotlensBoot = {
    // adopt hands the worker and its early messages to the page, once
    adopt() {
      if (taken) return null;
      taken = true;
      return { worker, early };
    },
  };
})();
