// Encrypted stored copy of a shared analysis (off unless the site turns it
// on): the payload's bytes (made by the engine) are encrypted here with
// AES-256-GCM (Web Crypto) and only the ciphertext goes to the site's edge
// worker, which keeps it for the days the sender picks. The key is random
// (256 bits) and travels in the link's fragment (after #, never sent to a
// server), or is derived from a passphrase with PBKDF2-SHA-256 (ITERATIONS
// rounds, 16-byte random salt) and never leaves the browser.
//
// The stored blob, envelope format 1 (help/sharing.md says the same):
//   byte 0      1 (envelope format)
//   byte 1      1: key in the link, 2: passphrase
//   (mode 2)    16 bytes salt, 4 bytes rounds (big-endian)
//   12 bytes    AES-GCM IV (random)
//   the rest    AES-256-GCM ciphertext with its 16-byte tag; the bytes
//               before the IV are the additional authenticated data
//
// This module makes network requests, and only when the user asks: to learn
// whether the site keeps copies (GET api/share), to store (POST), to open
// a stored link (GET api/share/<id>) and to delete (DELETE).
import { $ } from "./state.js";

export const STORED = true;           // the page has the option (shown only when the site answers)
export const ITERATIONS = 600000;     // PBKDF2-SHA-256 rounds for a passphrase
const API = "api/share";
const ID = /^[A-Za-z0-9_-]{22}$/;
const KEY = /^[A-Za-z0-9_-]{43}$/;

function err(code, message) { return Object.assign(new Error(message), { code }); }

function b64url(bytes) {
  let s = "";
  for (let i = 0; i < bytes.length; i++) s += String.fromCharCode(bytes[i]);
  return btoa(s).replace(/\+/g, "-").replace(/\//g, "_").replace(/=+$/, "");
}
function unb64url(s) {
  const bin = atob(s.replace(/-/g, "+").replace(/_/g, "/"));
  const out = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
  return out;
}

function siteURL(path) { return new URL(path, location.origin + location.pathname).href; }

async function request(url, init) {
  try {
    return await fetch(siteURL(url), Object.assign({ credentials: "omit", cache: "no-store", referrerPolicy: "no-referrer" }, init));
  } catch (e) {
    throw err("stored-offline", "The site could not be reached (are you offline?). A stored copy needs a connection; a link or a .lotlens file does not.");
  }
}

let config; // undefined: not asked yet; null: the site keeps no copies

// storedAvailable asks the site once whether it keeps encrypted copies:
// {maxBytes, minDays, maxDays, iterations} or null.
export async function storedAvailable() {
  if (config !== undefined) return config;
  let res;
  try { res = await request(API, { method: "GET" }); } catch (e) { return null; }
  if (res.status === 404) { config = null; return null; }
  if (!res.ok) return null;
  try {
    const c = await res.json();
    config = { maxBytes: Number(c.maxBytes) || 0, minDays: Number(c.minDays) || 1, maxDays: Number(c.maxDays) || 30, iterations: ITERATIONS };
  } catch (e) { return null; }
  return config;
}

async function passKey(pass, salt, rounds) {
  const base = await crypto.subtle.importKey("raw", new TextEncoder().encode(pass), "PBKDF2", false, ["deriveKey"]);
  return crypto.subtle.deriveKey({ name: "PBKDF2", hash: "SHA-256", salt, iterations: rounds },
    base, { name: "AES-GCM", length: 256 }, false, ["encrypt", "decrypt"]);
}
function rawKey(raw) { return crypto.subtle.importKey("raw", raw, "AES-GCM", false, ["encrypt", "decrypt"]); }

// storeEncrypted encrypts the payload bytes and stores the ciphertext for
// days (1 to 30). It returns {url, id, deleteToken, expires, size}.
export async function storeEncrypted(bytes, days, pass) {
  const cfg = await storedAvailable();
  if (!cfg) throw err("stored-off", "This site does not keep stored copies: send the .lotlens file instead.");
  let head, key, raw = null;
  if (pass) {
    const salt = crypto.getRandomValues(new Uint8Array(16));
    head = new Uint8Array(22);
    head.set([1, 2]); head.set(salt, 2);
    new DataView(head.buffer).setUint32(18, ITERATIONS);
    key = await passKey(pass, salt, ITERATIONS);
  } else {
    raw = crypto.getRandomValues(new Uint8Array(32));
    head = new Uint8Array([1, 1]);
    key = await rawKey(raw);
  }
  const iv = crypto.getRandomValues(new Uint8Array(12));
  const ct = new Uint8Array(await crypto.subtle.encrypt({ name: "AES-GCM", iv, additionalData: head }, key, bytes));
  const blob = new Uint8Array(head.length + iv.length + ct.length);
  blob.set(head); blob.set(iv, head.length); blob.set(ct, head.length + iv.length);
  if (cfg.maxBytes && blob.length > cfg.maxBytes) {
    throw err("stored-too-large", "The encrypted copy would be " + (blob.length / 1e6).toFixed(1) + " MB, more than the " + (cfg.maxBytes / 1e6).toFixed(0) + " MB this site keeps: send the .lotlens file instead.");
  }
  const res = await request(API + "?days=" + encodeURIComponent(String(days)), {
    method: "POST", headers: { "Content-Type": "application/octet-stream" }, body: blob });
  if (res.status === 429) throw err("stored-rate", "This connection has stored many copies lately: try again in an hour, or send the .lotlens file.");
  if (res.status === 413) throw err("stored-too-large", "The encrypted copy is larger than this site keeps: send the .lotlens file instead.");
  if (!res.ok) throw err("stored-refused", "The site did not keep the copy (answer " + res.status + "): send the .lotlens file instead.");
  const j = await res.json();
  if (!ID.test(j.id || "")) throw err("stored-refused", "The site gave an unexpected answer: send the .lotlens file instead.");
  return { url: siteURL("s/" + j.id) + (raw ? "#" + b64url(raw) : ""), id: j.id, deleteToken: j.deleteToken, expires: j.expires, size: blob.length };
}

// deleteStored removes the stored copy (the sender's delete token).
export async function deleteStored(id, token) {
  const res = await request(API + "/" + id, { method: "DELETE", headers: { "Authorization": "Bearer " + token } });
  if (res.status === 404) throw err("stored-gone", "The stored copy no longer exists (it expired or was deleted).");
  if (!res.ok) throw err("stored-refused", "The site did not delete the copy (answer " + res.status + ").");
}

// askPass shows the passphrase box and resolves with what the user types.
function askPass(msg) {
  const box = $("pass-box"), input = $("pass-input"), go = $("pass-go");
  $("pass-msg").textContent = msg;
  box.hidden = false;
  input.value = "";
  input.focus();
  return new Promise((resolve) => {
    const done = (ev) => { ev.preventDefault(); go.removeEventListener("click", done); box.hidden = true; resolve(input.value); };
    go.addEventListener("click", done);
  });
}

// fetchStored downloads a stored copy and decrypts it here with the key
// from the link (or the passphrase the user types). It returns the payload
// bytes, or rejects with an error whose message says what to do.
export async function fetchStored(id, key) {
  if (!ID.test(id)) throw err("stored-id", "This stored link is damaged (its number is not one this site gives): ask the sender for the whole link again.");
  const res = await request(API + "/" + id, { method: "GET" });
  if (res.status === 404) throw err("stored-gone", "This stored copy no longer exists: it expired or the sender deleted it. Ask the sender to share the analysis again.");
  if (res.status === 429) throw err("stored-rate", "Too many requests from this connection: try again in a few minutes.");
  if (!res.ok) throw err("stored-refused", "The site did not give the stored copy (answer " + res.status + "): try again later.");
  const blob = new Uint8Array(await res.arrayBuffer());
  const damaged = err("stored-damaged", "The stored copy is damaged: ask the sender to share the analysis again.");
  if (blob.length < 2 + 12 + 16 || blob[0] !== 1 || (blob[1] !== 1 && blob[1] !== 2)) throw damaged;
  if (blob[1] === 1) {
    if (!KEY.test(key || "")) throw err("stored-key", "This link is missing its key or the key is cut short (the part after #): ask the sender for the whole link again.");
    const head = blob.subarray(0, 2), iv = blob.subarray(2, 14), ct = blob.subarray(14);
    try {
      return new Uint8Array(await crypto.subtle.decrypt({ name: "AES-GCM", iv, additionalData: head }, await rawKey(unb64url(key)), ct));
    } catch (e) {
      throw err("stored-key", "The key in this link does not open the stored copy: the link was changed or mixed up with another. Ask the sender for the whole link again.");
    }
  }
  if (blob.length < 22 + 12 + 16) throw damaged;
  const head = blob.subarray(0, 22), salt = blob.subarray(2, 18), rounds = new DataView(blob.buffer, blob.byteOffset).getUint32(18);
  if (rounds < 100000 || rounds > 10000000) throw damaged;
  const iv = blob.subarray(22, 34), ct = blob.subarray(34);
  let msg = "This shared analysis is protected by a passphrase: type the passphrase the sender gave you.";
  for (;;) {
    const pass = await askPass(msg);
    try {
      return new Uint8Array(await crypto.subtle.decrypt({ name: "AES-GCM", iv, additionalData: head }, await passKey(pass, salt, rounds), ct));
    } catch (e) {
      msg = "That passphrase does not open it: check it with the sender and type it again.";
    }
  }
}
