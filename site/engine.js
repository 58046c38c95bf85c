// Web Worker: runs the Go engine (lotlens.wasm) off the page's main thread,
// so the page never freezes. Messages in (from app.js):
//   {type:"run", id, request, useTable}  analyse; reply {type:"result", id, json, svg, ms}
//   {type:"analyse", id, request}        automation; reply {type:"report", id, json}
//   {type:"file", id, file}              read a File in chunks; replies
//        {type:"progress", id, read, total} and then {type:"file-read", id, json}
//   {type:"cancel"}                      stop reading; the file call answers
//                                        {type:"file-read", id, json} with code "cancelled"
//   {type:"forget"}                      drop the kept table and the data's bytes
//   {type:"share", id, share, form}      make a share payload (form "link", "file" or "bytes");
//                                        reply {type:"shared", id, json, bytes?}
//   {type:"open", id, data, form}        open a payload: data is the link text, a File
//                                        (.lotlens) or a Uint8Array (decrypted stored copy);
//                                        reply {type:"opened", id, json, shared?, svg}
// Every json is a report or the engine's error object {error, code}.
// Out, once: {type:"phases", phases} (load times on the shared clock), then
// {type:"ready"} (posted by the Go side) or {type:"error", error};
// then {type:"warmed", ms, json, svg} when the warm-up has run every stage
// (json and svg: the last stage's report, for the page to warm its rendering).
"use strict";
// Load phases on the shared clock (performance.timeOrigin + now), sent to
// the page before the Go side says "ready" (for `make bench-page`).
const abs = () => performance.timeOrigin + performance.now();
const phases = { workerStart: abs() };
// The engine's download and compilation start first, before wasm_exec.js
// is fetched: compiling needs no imports, only instantiating does.
const wasmURL = "lotlens.wasm";
const compiled = WebAssembly.compileStreaming(fetch(wasmURL).then((r) => { phases.response = abs(); return r; }))
  .catch(async () => {
    // a server without the application/wasm type: compile from bytes
    const buf = await (await fetch(wasmURL)).arrayBuffer();
    return WebAssembly.compile(buf);
  });
importScripts("wasm_exec.js");

const go = new Go();
async function load() {
  return WebAssembly.instantiate(await compiled, go.importObject);
}
// Warm-up: browsers compile WebAssembly functions lazily and optimise the
// busy ones later, and the Go runtime grows its heap on first use, so the
// first analysis of a large paste pays for all of that. Right after the
// engine is up, while the user is still reading the page, this runs the
// engine on invented data in short stages that together reach every path a
// report of 10,000 readings uses: more than 5,000 readings (the large-sample
// shape test), a header and a cell that is not a number, target and limits,
// a file read in chunks, and last, once the rest is optimised, a long
// series (21,000 readings) for the paths of large files. Each stage but the
// last is one call of a few thousand readings; between stages the worker
// answers any request that has arrived, so a user's first action waits at
// most for one stage, and the
// warm-up stops for good at the user's first request (it must not touch the
// user's file or table). A helper worker warming up a copy of the compiled
// module was tried (the browser shares the compiled code between workers)
// and was no faster for a first request, during its warm-up or after it
// (DEVELOPERS.md, "The page", the warm-up).
function warmText(n, header) {
  const a = header ? ["Warm-up (g)"] : [];
  let x = 7;
  for (let i = 0; i < n; i++) { x = (x * 16807) % 2147483647; a.push((5 + (x / 2147483647 - 0.5) * 0.4).toFixed(3)); }
  if (header) a[11] = "n/a";
  return a.join("\n") + "\n";
}
const WARM_OPTS = { target: 5, lsl: 4.7, usl: 5.3 };
const warmStages = [
  () => self.lotlensRun(JSON.stringify({ text: warmText(600, false) }), false),
  () => self.lotlensRun(JSON.stringify({ text: warmText(2500, true), options: WARM_OPTS }), false),
  () => self.lotlensRun(JSON.stringify({ text: warmText(5200, false) }), false),
  () => {
    const bytes = new TextEncoder().encode(warmText(5200, true));
    self.lotlensBegin("warm-up.csv", bytes.length);
    self.lotlensChunk(bytes.subarray(0, bytes.length >> 1));
    self.lotlensChunk(bytes.subarray(bytes.length >> 1));
    self.lotlensEnd();
  },
  () => { warmReport = self.lotlensRun(JSON.stringify({ options: WARM_OPTS }), true); self.lotlensForget(); },
  // a long series read as the page reads a dropped file (64 KB chunks):
  // the paths of large data (drift tests on block means above 20,000
  // readings, thinned charts); a loop first met in one long call of a
  // million readings would otherwise run unoptimised to its end
  () => {
    const bytes = new TextEncoder().encode(warmText(21000, false));
    self.lotlensBegin("warm-up.txt", bytes.length);
    for (let i = 0; i < bytes.length; i += 65536) self.lotlensChunk(bytes.subarray(i, Math.min(bytes.length, i + 65536)));
    self.lotlensEnd();
    self.lotlensRun(JSON.stringify({ options: {} }), true);
    self.lotlensForget();
  },
  longStage, longStage, longStage,
];
// The loops over every reading (reading the file, the first pass, the
// counts, the over-time scans) are optimised by the browser only after
// they have run a while, and a call already running keeps its code: on a
// first file of 1,000,000 readings they ran their first few hundred
// thousand readings unoptimised (about 45 ms more than the next file). So
// the warm-up ends with three series of 60,000 readings, read as the page
// reads a dropped file (SLICE) and analysed, each its own stage.
let longWarm = null;
function longStage() {
  if (!longWarm) longWarm = new TextEncoder().encode(warmText(60000, false));
  self.lotlensBegin("warm-up.txt", longWarm.length);
  for (let i = 0; i < longWarm.length; i += SLICE) self.lotlensChunk(longWarm.subarray(i, Math.min(longWarm.length, i + SLICE)));
  self.lotlensEnd();
  self.lotlensRun(JSON.stringify({ options: {} }), true);
  self.lotlensForget();
}
let warmReport = null; // the last stage's answer: the page warms its rendering with it
let warmStage = 0, warmT0 = 0, userCame = false;
const warmStageMs = []; // each stage's time: the most a user's first request waits
function warmUp() {
  if (userCame) return;
  if (warmStage === 0) warmT0 = performance.now();
  if (warmStage >= warmStages.length) { postMessage({ type: "warmed", ms: performance.now() - warmT0, stageMs: warmStageMs, json: warmReport && warmReport.json, svg: warmReport && warmReport.svg }); warmReport = null; return; }
  const t = performance.now();
  try { warmStages[warmStage](); } catch (e) { /* warm-up only */ }
  warmStageMs.push(performance.now() - t);
  warmStage++;
  setTimeout(warmUp, 10);
}
load()
  .then((instance) => {
    phases.compiled = abs();
    postMessage({ type: "phases", phases });
    setTimeout(warmUp, 0);
    return go.run(instance);
  })
  .catch((e) => postMessage({ type: "error", error: "The engine did not load (" + e + "). Reload the page; if it persists, the browser may block WebAssembly." }));

let reading = null; // {id, cancelled}

// A file up to WHOLE_MAX (the 64 MiB the engine keeps for sharing) is read
// from the browser once, whole: the engine parses it in slices of SLICE
// bytes, and the browser's Web Crypto computes its fingerprint (SHA-256 of
// its bytes) from the same buffer on a thread of its own meanwhile. Read as
// a stream for the engine and whole again for the fingerprint, as before,
// the file crossed from the browser twice, in 64 KB steps. A larger file is
// read as a stream and the engine hashes it as it reads (Web Crypto needs
// the whole file in memory at once); so it does when Web Crypto is missing
// or fails (the fingerprint "").
const WHOLE_MAX = 64 * 1024 * 1024;
const SLICE = 512 * 1024;
function hex(d) { return Array.from(new Uint8Array(d), (x) => x.toString(16).padStart(2, "0")).join(""); }

// Every YIELD_MS between slices the worker lets its queued messages in (a
// cancel, a newer file) through a message to itself: setTimeout in a
// worker waits at least 4 ms once nested. A yield after every slice cost
// about 1 ms each, 10-15 ms of a 7 MB file's 70-110 ms.
const YIELD_MS = 30;
const yieldChan = new MessageChannel();
const yielded = [];
yieldChan.port1.onmessage = () => { const f = yielded.shift(); if (f) f(); };
function letMessagesIn() { return new Promise((r) => { yielded.push(r); yieldChan.port2.postMessage(0); }); }

// chunksOf yields the file's bytes in steps and, once done, its
// fingerprint (a promise of the hex digest, or of "").
function chunksOf(file) {
  const whole = file.size <= WHOLE_MAX && self.crypto && crypto.subtle;
  if (!whole) {
    const rd = file.stream().getReader();
    return { digest: Promise.resolve(""), next: () => rd.read(), stop: () => rd.cancel().catch(() => {}) };
  }
  const buf = file.arrayBuffer();
  const digest = buf.then((b) => crypto.subtle.digest("SHA-256", b)).then(hex).catch(() => "");
  let at = 0, bytes = null, yieldedAt = 0;
  return {
    digest,
    async next() {
      if (bytes === null) {
        bytes = new Uint8Array(await buf);
        yieldedAt = performance.now();
      } else if (performance.now() - yieldedAt >= YIELD_MS) {
        await letMessagesIn();
        yieldedAt = performance.now();
      }
      if (at >= bytes.length) return { done: true };
      const value = bytes.subarray(at, Math.min(bytes.length, at + SLICE));
      at += value.length;
      return { done: false, value };
    },
    stop() {},
  };
}

// The engine reads one file at a time: lotlensBegin drops a read in
// progress. So a file dropped while another is still being read supersedes
// it: the earlier job stops at its next step without calling the engine
// again (its chunks would land in the new file's read) and answers
// "cancelled"; the page ignores that answer (input.js, analyseFile).
const SUPERSEDED = JSON.stringify({ error: "reading stopped: another file was opened", code: "cancelled" });

// stopped is the answer for a read that a newer file or a cancel stopped
// (the engine's read ended for a cancel), or null while it goes on.
function stopped(job) {
  if (job.superseded) return SUPERSEDED;
  if (job.cancelled) return self.lotlensCancel();
  return null;
}

async function readFile(id, file) {
  if (reading) reading.superseded = true;
  const job = { id, cancelled: false, superseded: false };
  reading = job;
  const src = chunksOf(file);
  self.lotlensBegin(file.name || "file", file.size);
  const total = file.size;
  let read = 0, last = 0;
  const answer = (json) => postMessage({ type: "file-read", id, json });
  try {
    for (;;) {
      const { done, value } = await src.next();
      const stop = stopped(job);
      if (stop) { src.stop(); answer(stop); return; }
      if (done) break;
      const r = self.lotlensChunk(value);
      if (typeof r === "string") { answer(r); return; } // the engine's error object
      read = r;
      const now = performance.now();
      if (now - last > 50) {
        last = now;
        postMessage({ type: "progress", id, read, total });
      }
    }
    postMessage({ type: "progress", id, read, total });
    const fp = await src.digest;
    answer(stopped(job) || self.lotlensEnd(fp));
  } catch (e) {
    if (job.superseded) { answer(SUPERSEDED); return; }
    self.lotlensCancel();
    answer(JSON.stringify({ error: "Could not read " + file.name + ": " + e, code: "file-read" }));
  } finally {
    if (reading === job) reading = null;
  }
}

async function openPayload(id, data, form) {
  try {
    if (typeof data !== "string" && !(data instanceof Uint8Array)) data = new Uint8Array(await data.arrayBuffer());
    const r = self.lotlensOpen(data, form);
    postMessage({ type: "opened", id, json: r.json, shared: r.shared, svg: r.svg });
  } catch (e) {
    postMessage({ type: "opened", id, json: JSON.stringify({ error: "The file could not be read: pick it again.", code: "file-read" }) });
  }
}

onmessage = (ev) => {
  const m = ev.data;
  userCame = true; // the warm-up stops: the user's data and table are not touched
  switch (m.type) {
    case "run":
      {
        const t0 = performance.now();
        const r = self.lotlensRun(JSON.stringify(m.request), !!m.useTable);
        const t1 = performance.now();
        postMessage({ type: "result", id: m.id, json: r.json, svg: r.svg, ms: t1 - t0,
          at: [performance.timeOrigin + t0, performance.timeOrigin + t1] });
      }
      break;
    case "analyse":
      postMessage({ type: "report", id: m.id, json: self.lotlensAnalyze(JSON.stringify(m.request)) });
      break;
    case "file":
      readFile(m.id, m.file);
      break;
    case "cancel":
      if (reading) reading.cancelled = true;
      break;
    case "forget":
      self.lotlensForget();
      break;
    case "share":
      {
        const r = self.lotlensShare(JSON.stringify(m.share), m.form);
        postMessage({ type: "shared", id: m.id, json: r.json, bytes: r.bytes }, r.bytes ? [r.bytes.buffer] : []);
      }
      break;
    case "open":
      openPayload(m.id, m.data, m.form);
      break;
  }
};
