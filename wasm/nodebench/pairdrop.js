// pairdrop.js A.wasm B.wasm [reps]: two builds of the engine in one Node
// process, taking turns on a file of 1,000,000 invented readings read in
// 64 KB chunks (lotlensBegin/Chunk/End) and analysed (lotlensRun on the
// kept table); prints the read and analysis times of each, the median and
// least analysis time and the median of B/A, and says when the JSON or an
// SVG differs. DIGEST=<64 hex digits> hands B a fingerprint as the page
// does (Web Crypto), so B's read leaves out the hashing; the fingerprint
// in B's JSON then differs, as it must.
const { text, load } = require("./engines.js");
const reps = +(process.argv[4] || 4);
function drop(f, bytes, digest) {
  const t0 = performance.now();
  f.lotlensBegin("d.txt", bytes.length);
  for (let i = 0; i < bytes.length; i += 65536) f.lotlensChunk(bytes.subarray(i, Math.min(bytes.length, i + 65536)));
  f.lotlensEnd(digest);
  const t1 = performance.now();
  const r = f.lotlensRun(JSON.stringify({ options: {} }), true);
  const t2 = performance.now();
  f.lotlensForget();
  return { read: t1 - t0, run: t2 - t1, json: r.json, svg: r.svg || {} };
}
(async () => {
  const E = [await load(process.argv[2]), await load(process.argv[3])];
  const warm = new TextEncoder().encode(text(21000, 3));
  for (const f of E) drop(f, warm, "");
  const bytes = new TextEncoder().encode(text(1000000, 1));
  const digest = process.env.DIGEST || "";
  const res = [[], []];
  for (let rep = 0; rep < reps; rep++) {
    const order = rep % 2 ? [1, 0] : [0, 1];
    const out = [];
    for (const k of order) { out[k] = drop(E[k], bytes, k === 1 ? digest : ""); res[k].push(out[k]); }
    if (out[0].json !== out[1].json) console.log("JSON differs at rep", rep);
    for (const key of new Set([...Object.keys(out[0].svg), ...Object.keys(out[1].svg)])) if (out[0].svg[key] !== out[1].svg[key]) console.log("SVG", key, "differs at rep", rep);
  }
  for (const k of [0, 1]) console.log(k ? "B" : "A", res[k].map((r) => `read ${r.read.toFixed(0)} run ${r.run.toFixed(0)}`).join(" | "));
  const med = (a) => { const s = [...a].sort((x, y) => x - y); return s[s.length >> 1]; };
  const run = res.map((rs) => rs.map((r) => r.run));
  console.log(`run: A median ${med(run[0]).toFixed(0)} min ${Math.min(...run[0]).toFixed(0)} | B median ${med(run[1]).toFixed(0)} min ${Math.min(...run[1]).toFixed(0)} | B/A median ratio ${med(run[1].map((b, i) => b / run[0][i])).toFixed(3)}`);
  process.exit(0);
})();
