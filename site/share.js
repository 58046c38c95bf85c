// Share link: the data as text, the settings and the exclusions, deflated
// into the part of the URL that browsers never send to a server. For a
// dropped file the text is the engine's: the file as its reader decoded it
// (UTF-16 and Latin-1 files arrive as UTF-8), never decoded again here.
import { state, errorOf } from "./state.js";
import { call } from "./engine-client.js";

function b64url(bytes) {
  let s = "";
  for (let i = 0; i < bytes.length; i += 0x8000) s += String.fromCharCode.apply(null, bytes.subarray(i, i + 0x8000));
  return btoa(s).replace(/\+/g, "-").replace(/\//g, "_").replace(/=+$/, "");
}
function unb64url(s) {
  const bin = atob(s.replace(/-/g, "+").replace(/_/g, "/"));
  const out = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
  return out;
}
async function pipe(bytes, stream) {
  return new Uint8Array(await new Response(new Blob([bytes]).stream().pipeThrough(stream)).arrayBuffer());
}
// dataText is the text the link carries.
async function dataText() {
  if (state.source !== "file") return state.text;
  const m = await call({ type: "text" });
  if (typeof m.text === "string") return m.text;
  const err = errorOf(JSON.parse(m.json)) || { message: "the engine gave no text" };
  throw new Error(err.message);
}
export async function makeShareLink(options) {
  const text = await dataText();
  // reasons: {row: text} for the rows left out with a reason typed (the
  // engine does not carry them yet; see options.excludeReasons to come)
  const reasons = {};
  for (const r of options.exclude || []) { const t = (state.reasons.get(r) || "").trim(); if (t) reasons[r] = t; }
  const payload = { v: 1, text, name: state.source === "file" ? state.file.name : "", cols: state.cols, options };
  if (Object.keys(reasons).length) payload.reasons = reasons;
  const z = await pipe(new TextEncoder().encode(JSON.stringify(payload)), new CompressionStream("deflate-raw"));
  return location.origin + location.pathname + "#d=" + b64url(z);
}
export async function readShareLink(hash) {
  const z = unb64url(hash.slice(3));
  const json = new TextDecoder().decode(await pipe(z, new DecompressionStream("deflate-raw")));
  const p = JSON.parse(json);
  if (!p || p.v !== 1 || typeof p.text !== "string") throw new Error("unknown link format");
  return p;
}
