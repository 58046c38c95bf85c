// The page: sends the pasted text to the engine worker and shows the report.
"use strict";
(() => {
  const $ = (id) => document.getElementById(id);
  const status = $("status");
  const engine = new Worker("engine.js");
  let ready = false, seq = 0;
  const pending = new Map();

  engine.onmessage = (ev) => {
    const m = ev.data;
    if (m.type === "ready") { ready = true; status.textContent = "Ready."; document.body.dataset.ready = "1"; return; }
    if (m.type === "error") { status.textContent = m.error; return; }
    const done = pending.get(m.id);
    if (done) { pending.delete(m.id); done(JSON.parse(m.report)); }
  };

  // analyse(request) -> Promise<report>: the same entry point scripts may use.
  function analyse(request) {
    return new Promise((resolve) => {
      const id = ++seq;
      pending.set(id, resolve);
      engine.postMessage({ id, request: Object.assign({ schema: "lotlens.request/1" }, request) });
    });
  }
  window.lotlens = { analyse };

  function show(rep) {
    if (rep.error) { status.textContent = rep.error; $("report").hidden = true; return; }
    $("n").textContent = rep.counts.used;
    $("mean").textContent = rep.centre.mean;
    $("median").textContent = rep.centre.median;
    $("sd").textContent = rep.spread.sd;
    $("summary").textContent = rep.input.summary;
    $("report").hidden = false;
    status.textContent = "Analysed.";
    document.body.dataset.analysed = String(Date.now());
  }

  async function run() {
    if (!ready) { status.textContent = "The engine is still loading…"; return; }
    show(await analyse({ text: $("data").value }));
  }
  $("analyse").addEventListener("click", run);
  $("demo").addEventListener("click", async () => {
    $("data").value = await (await fetch("demo/capsule-fill.tsv")).text();
    run();
  });
})();
