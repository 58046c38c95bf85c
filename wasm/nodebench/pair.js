// pair.js A.wasm B.wasm [reps] [warm]: two builds of the engine (GOOS=js
// GOARCH=wasm go build -o X.wasm ./wasm) in one Node process, taking turns
// on pastes of 10,000 invented readings (lotlensRun); checks that both give
// the same JSON and SVG on every call and prints each one's median time
// and the median of B/A over the calls after the first warm ones. Taking
// turns in one process keeps a shared, noisy machine's load the same for
// both. See DEVELOPERS.md ("Comparing two engine builds").
const { text, load } = require("./engines.js");
const reps = +(process.argv[4] || 60), warm = +(process.argv[5] || 20);
(async () => {
  const runs = [(await load(process.argv[2])).lotlensRun, (await load(process.argv[3])).lotlensRun];
  const ts = [[], []];
  const firsts = [];
  for (let rep = 0; rep < reps; rep++) {
    const t = JSON.stringify({ text: text(10000, rep + 1) });
    const order = rep % 2 ? [1, 0] : [0, 1];
    const out = [];
    for (const k of order) {
      const t0 = performance.now();
      const r = runs[k](t, false);
      out[k] = r;
      const dt = performance.now() - t0;
      if (rep === 0) firsts[k] = dt;
      if (rep >= warm) ts[k].push(dt);
    }
    if (out[0].json !== out[1].json) { console.log("JSON differs at rep", rep); process.exit(1); }
    for (const key of new Set([...Object.keys(out[0].svg), ...Object.keys(out[1].svg)])) if (out[0].svg[key] !== out[1].svg[key]) { console.log("SVG", key, "differs at rep", rep); process.exit(1); }
  }
  const med = (a) => { const s = [...a].sort((x, y) => x - y); return s[s.length >> 1]; };
  const ratio = ts[1].map((b, i) => b / ts[0][i]);
  console.log(`A median ${med(ts[0]).toFixed(1)} min ${Math.min(...ts[0]).toFixed(1)} first ${firsts[0].toFixed(0)} | B median ${med(ts[1]).toFixed(1)} min ${Math.min(...ts[1]).toFixed(1)} first ${firsts[1].toFixed(0)} | B/A median ratio ${med(ratio).toFixed(3)}`);
  process.exit(0);
})();
