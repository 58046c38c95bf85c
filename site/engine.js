// Web Worker: runs the Go engine (lotlens.wasm) off the page's main thread.
// Messages in: {id, request}. Messages out: {type:"ready"} once, then
// {id, report} where report is the engine's JSON text.
importScripts("wasm_exec.js");
const go = new Go();
WebAssembly.instantiateStreaming(fetch("lotlens.wasm"), go.importObject)
  .then((r) => go.run(r.instance))
  .catch((e) => postMessage({ type: "error", error: "the engine did not load: " + e }));
onmessage = (ev) => {
  const { id, request } = ev.data;
  postMessage({ id, report: self.lotlensAnalyze(JSON.stringify(request)) });
};
