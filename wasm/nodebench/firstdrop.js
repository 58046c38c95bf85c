// firstdrop.js A.wasm B.wasm [rounds]: the first analysis of a dropped
// 1,000,000-value file on a fresh engine, as on the page: each round
// starts one Node process per build, in turn, that warms the engine on
// drops of 600, 2500, 5200 and 21000 invented readings (the page's
// warm-up sizes) and then times the analyses of three drops of the big
// file (V8 optimises a wasm function only between calls, so the first is
// the slowest); prints each process's times, the median and least first
// analysis of each build, and says when the JSON or an SVG of the first
// analysis differs.
const { execFileSync } = require("child_process");
const { text, load } = require("./engines.js");

function drop(f, bytes) {
  f.lotlensBegin("d.txt", bytes.length);
  for (let i = 0; i < bytes.length; i += 65536) f.lotlensChunk(bytes.subarray(i, Math.min(bytes.length, i + 65536)));
  f.lotlensEnd("");
  const t0 = performance.now();
  const r = f.lotlensRun(JSON.stringify({ options: {} }), true);
  const t = performance.now() - t0;
  f.lotlensForget();
  return { t, r };
}

if (process.argv[2] === "--one") {
  (async () => {
    const f = await load(process.argv[3]);
    for (const n of [600, 2500, 5200, 21000]) drop(f, new TextEncoder().encode(text(n, 3)));
    const bytes = new TextEncoder().encode(text(1000000, 1));
    const runs = [drop(f, bytes), drop(f, bytes), drop(f, bytes)];
    const crypto = require("crypto");
    const h = crypto.createHash("sha256").update(runs[0].r.json);
    for (const k of Object.keys(runs[0].r.svg || {}).sort()) h.update(k).update(runs[0].r.svg[k]);
    console.log(JSON.stringify({ ms: runs.map((x) => +x.t.toFixed(1)), digest: h.digest("hex") }));
    process.exit(0);
  })();
} else {
  const rounds = +(process.argv[4] || 6);
  const res = [[], []];
  for (let round = 0; round < rounds; round++) {
    const order = round % 2 ? [1, 0] : [0, 1];
    const out = [];
    for (const k of order) {
      out[k] = JSON.parse(execFileSync(process.execPath, [__filename, "--one", process.argv[2 + k]]).toString());
      res[k].push(out[k].ms);
    }
    if (out[0].digest !== out[1].digest) console.log("JSON or SVG differs in round", round);
  }
  const med = (a) => { const s = [...a].sort((x, y) => x - y); return s[s.length >> 1]; };
  for (const k of [0, 1]) {
    const first = res[k].map((m) => m[0]);
    console.log(k ? "B" : "A", res[k].map((m) => m.join(" ")).join(" | "), `| first: median ${med(first)} min ${Math.min(...first)}`);
  }
}
