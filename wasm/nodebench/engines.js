// engines.js: what pair.js and pairdrop.js share. load(path) starts one
// build of the engine in this Node process and returns its calls (each
// build keeps its own, so two can take turns); text(n, seed) writes n
// invented readings, one a line.
const { execSync } = require("child_process");
const path = require("path");
const fs = require("fs");
require(process.env.WASM_EXEC || path.join(execSync("go env GOROOT").toString().trim(), "lib", "wasm", "wasm_exec.js"));

function text(n, s) {
  const a = new Array(n);
  let x = s;
  for (let i = 0; i < n; i++) { x = (x * 16807) % 2147483647; a[i] = (5 + (x / 2147483647 - 0.5) * 0.4).toFixed(3); }
  return a.join("\n") + "\n";
}

async function load(file) {
  const go = new Go();
  let ready; const rp = new Promise((r) => (ready = r));
  globalThis.postMessage = (m) => { if (m.type === "ready") ready(); };
  const inst = await WebAssembly.instantiate(await WebAssembly.compile(fs.readFileSync(file)), go.importObject);
  go.run(inst); await rp;
  const f = {};
  for (const k of ["lotlensBegin", "lotlensChunk", "lotlensEnd", "lotlensRun", "lotlensForget"]) f[k] = globalThis[k];
  return f;
}

module.exports = { text, load };
