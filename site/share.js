// Sharing: a link, a .lotlens file and, where the site offers it, an
// encrypted stored copy. The engine makes and reads the payload (a versioned
// binary format with checksums, stats/share); this module only moves it into
// and out of the link, a file or the encrypted blob.
//
// Privacy rules kept here (help/privacy.md says the same to users):
// - making a link never writes it into the page's address or history; it is
//   shown in a box and copied;
// - opening a link reads the fragment once and removes it from the address
//   bar (history.replaceState) before anything else, so the next person on
//   a shared tablet does not find it;
// - nothing goes into localStorage, sessionStorage or IndexedDB;
// - no network request unless the user asks for a stored copy.
import { $, state, setStatus, showError, errorOf } from "./state.js";
import { call } from "./engine-client.js";
import { restoreOverTimeSettings } from "./card-time.js";
import { render } from "./cards.js";
import { copyText, download } from "./export.js";
import { el } from "./dom.js";
import { storedAvailable, storeEncrypted, fetchStored, deleteStored, STORED } from "./stored.js";

const LINK = "#s=";       // a link's fragment: "#s=" + the payload (base64url, starts "Lotl")
const OLD_LINK = "#d=";   // the page's links of before format 1 (refused with a message)
const WARN_CHARS = 8000;  // the engine marks links from here as long (bridge.LinkWarn)

// ---------- making ----------

// payload asks the engine for the analysis shown as a payload of the given
// form ("link", "file", "bytes"). It rejects with the engine's message.
async function payload(request, form) {
  const m = await call({ type: "share", form, share: {
    request, useTable: state.source === "file",
    name: state.source === "text" ? (state.sourceName || "") : "", created: Math.floor(Date.now() / 1000),
  } });
  const res = JSON.parse(m.json);
  const err = errorOf(res);
  if (err) throw Object.assign(new Error(err.message), { code: err.code });
  return { info: res, bytes: m.bytes };
}

function note(msg, warn) {
  const n = $("share-note");
  n.textContent = msg;
  n.classList.toggle("warn-text", !!warn);
}

let lastRequest = null; // the request the share box was opened for

// shareLink makes the link of the analysis shown (request: the engine's
// request as the page runs it, or null when the settings hold an error).
export async function shareLink(request) {
  const box = $("share-box"), input = $("share-url");
  box.hidden = false;
  $("stored-box").hidden = true;
  input.value = "";
  lastRequest = request;
  if (!request) {
    note("No link was made: correct the settings marked above first (a link carries every setting or none).", true);
    return;
  }
  note("Making the link…");
  let r;
  try { r = await payload(request, "link"); } catch (e) {
    note(e.message, true);
    box.dataset.tooLarge = e.code === "too-large" ? "1" : "";
    $("share-file").classList.toggle("primary", e.code === "too-large");
    return;
  }
  box.dataset.tooLarge = "";
  const url = location.origin + location.pathname + LINK + r.info.link;
  input.value = url;
  const copied = await copyText(url);
  let msg = (copied ? "Copied. " : "") + "The link holds " + url.length.toLocaleString() + " characters; anyone who has it can read the data. Fingerprint " + r.info.fingerprint.slice(0, 16) + "….";
  const long = r.info.long || url.length >= WARN_CHARS;
  if (long) msg += " This link is long: mail and chat programs often cut links of more than about 8,000 characters. Send the .lotlens file instead" + (STORED ? ", or store an encrypted copy" : "") + ".";
  note(msg, long);
  $("share-file").classList.toggle("primary", long);
  input.select();
}

async function saveFile() {
  if (!lastRequest) return;
  try {
    const r = await payload(lastRequest, "file");
    download(r.info.fileName, r.bytes, "application/octet-stream");
    note("Saved " + r.info.fileName + " (" + r.info.size.toLocaleString() + " bytes). Send it as an attachment; the receiver drops it on the Lotlens page or opens it with Open file. Fingerprint " + r.info.fingerprint.slice(0, 16) + "….");
  } catch (e) { note(e.message, true); }
}

// ---------- opening ----------

// takeFromAddress reads a shared link from the address, if any, and removes
// it from the address bar and the current history entry at once. It returns
// {form: "link", data}, {stored: id, key} or null.
export function takeFromAddress() {
  const h = location.hash, q = new URLSearchParams(location.search);
  let found = null;
  if (h.startsWith(LINK) || h.startsWith(OLD_LINK)) found = { form: "link", data: h.startsWith(LINK) ? h.slice(LINK.length) : h.slice(1) };
  else if (q.has("s")) found = { stored: q.get("s") || "", key: h.slice(1) };
  if (found) history.replaceState(null, "", location.pathname);
  return found;
}

const SHARE_ERROR_TITLE = "This shared analysis was not opened. ";

function openFailed(err) {
  document.body.dataset.shareError = err.code || "share";
  showError({ message: SHARE_ERROR_TITLE + err.message, code: err.code });
  $("report").hidden = true;
  $("preview-box").hidden = true;
  document.body.dataset.state = "error";
}

// openShared opens a payload: data is a link's text, a .lotlens File or
// the decrypted bytes of a stored copy; how says where it came from for the
// banner.
export async function openShared(data, form, how) {
  setStatus("Opening the shared analysis…");
  const m = await call({ type: "open", data, form });
  const rep = JSON.parse(m.json);
  const err = errorOf(rep);
  if (err) { openFailed(err); return false; }
  apply(JSON.parse(m.shared), rep, m.svg || {}, how);
  return true;
}

// openIncoming opens what takeFromAddress found.
export async function openIncoming(found) {
  if (found.form) return openShared(found.data, "link", "link");
  let bytes;
  try { bytes = await fetchStored(found.stored, found.key); } catch (e) { openFailed(e); return false; }
  return openShared(bytes, "bytes", "stored");
}

// isSharedFile says whether a dropped or picked file is a .lotlens file.
export function isSharedFile(file) { return /\.lotlens$/i.test(file.name || ""); }

function setSelect(id, v) {
  const s = $(id);
  if (v === undefined || v === null || v === "" || v === 0) return;
  const val = String(v);
  if (!Array.from(s.options).some((o) => o.value === val)) s.append(el("option", { value: val, text: val }));
  s.value = val;
}

function apply(sh, rep, svg, how) {
  const o = sh.options || {};
  state.source = "file"; state.file = null; state.text = ""; state.hasTable = true; state.bigText = "";
  state.sourceName = sh.name || (how === "file" ? "shared file" : "shared link");
  state.exclude = new Set(o.exclude || []);
  state.leaveOutRows = []; state.leaveOutText = ""; $("leave-out").value = "";
  state.cols = { value: sh.value || "", group: sh.group || "", order: sh.order || "", subgroup: sh.subgroup || "" };
  // the reasons come back with the report: settings.excluded[].reason
  state.reasons = new Map();
  for (const r of (rep.settings && rep.settings.excluded) || []) if (r.reason) state.reasons.set(r.row, r.reason);
  // settings the page has no field for travel on with the data
  state.carried = {};
  if (o.populationSD !== undefined) state.carried.populationSD = o.populationSD;
  $("unit").value = o.unit || "";
  $("coverage").value = o.coverage ? String(Number((o.coverage * 100).toPrecision(12))) : "99";
  $("cpk-goal").value = o.cpkGoal ? String(o.cpkGoal) : "1.33";
  $("within-sigma").value = o.withinSigma || "";
  for (const k of ["target", "lsl", "usl"]) $(k).value = o[k] !== undefined && o[k] !== null ? String(o[k]) : "";
  setSelect("confidence", o.confidence);
  setSelect("quantile", o.quantile);
  $("decimal-mark").value = o.decimalMark || "";
  restoreOverTimeSettings(o);
  const data = $("data");
  data.value = "";
  data.placeholder = "Showing the data of a shared " + (how === "file" ? "file" : "link") + " (paste here to analyse other data instead)";
  state.shared = { how, created: sh.created, name: sh.name, fingerprint: sh.fingerprint, bytes: sh.bytes };
  delete document.body.dataset.shareError;
  delete document.body.dataset.errorCode;
  state.report = rep;
  state.svg = svg;
  state.when = new Date();
  const drawn = render();
  banner();
  state.analyses++;
  setStatus("Opened a shared analysis: " + rep.counts.used + " values" + (rep.counts.excluded ? " (" + rep.counts.excluded + " left out by the sender)" : "") + ". " + rep.input.summary);
  document.body.dataset.state = "report";
  const n = state.analyses;
  drawn.then(() => { if (state.analyses === n) document.body.dataset.analysed = String(n); });
}

function banner() {
  const b = $("shared-banner"), sh = state.shared;
  if (!sh) { b.hidden = true; b.replaceChildren(); return; }
  const when = sh.created ? new Date(sh.created * 1000).toLocaleString() : "an unknown date";
  const from = { link: "a shared link", file: "a shared file", stored: "an encrypted stored copy" }[sh.how];
  const where = sh.how === "stored"
    ? "The data were decrypted in this browser with the key from the link; the site held only the encrypted copy and never saw the key or the data."
    : sh.how === "file"
      ? "The data came from the file itself; nothing was sent to or fetched from a server."
      : "The data came from the link itself (the part after #, which browsers never send to a server); nothing was fetched from a server.";
  b.replaceChildren(
    el("strong", { text: "Opened from " + from + (sh.name ? " (" + sh.name + ")" : "") + ", made " + when + "." }), " ",
    el("span", { text: where }), " ",
    el("span", { text: "Fingerprint of the data: " }), el("code", { id: "shared-fp", text: sh.fingerprint }),
    el("span", { text: " (compare it with the sender's report)." }));
  b.hidden = false;
}

// clearShared forgets that the data came from a shared payload (new data,
// or the report was cleared).
export function clearShared() {
  state.shared = null;
  state.reasons = new Map();
  state.carried = {};
  delete document.body.dataset.shareError;
  banner();
}

// ---------- stored encrypted copy ----------

async function showStored() {
  const sb = $("stored-box");
  sb.hidden = false;
  const st = $("stored-status");
  st.textContent = "Asking this site whether it keeps encrypted copies…";
  const cfg = await storedAvailable();
  if (!cfg) {
    sb.hidden = true;
    $("share-stored").hidden = true;
    note("This site does not keep stored copies (it is off here, or you are offline): send the .lotlens file instead.", true);
    return;
  }
  st.textContent = "The site will hold only the encrypted data (up to " + (cfg.maxBytes / 1e6).toFixed(0) + " MB), its size and its expiry date. The key stays in the link (after #), which browsers never send to a server; with a passphrase, the key is derived from it in this browser (PBKDF2-SHA-256, " + cfg.iterations.toLocaleString() + " rounds) and never leaves it.";
}

async function doStore() {
  if (!lastRequest) return;
  const st = $("stored-status");
  const days = Number($("stored-days").value);
  const pass = $("stored-pass").value;
  st.textContent = "Encrypting in this browser and storing the encrypted copy…";
  let r;
  try {
    const p = await payload(lastRequest, "bytes");
    r = await storeEncrypted(p.bytes, days, pass);
  } catch (e) { st.textContent = e.message; st.classList.add("warn-text"); return; }
  st.classList.remove("warn-text");
  $("share-url").value = r.url;
  const copied = await copyText(r.url);
  st.textContent = (copied ? "Copied. " : "") + "Stored " + r.size.toLocaleString() + " encrypted bytes until " + new Date(r.expires * 1000).toLocaleString() + "." +
    (pass ? " The receiver needs the passphrase too: send it by another channel." : " Anyone with the whole link can read the data.");
  const del = $("stored-delete");
  del.hidden = false;
  del.onclick = async () => {
    try { await deleteStored(r.id, r.deleteToken); st.textContent = "The stored copy was deleted; the link no longer opens."; del.hidden = true; } catch (e) { st.textContent = e.message; }
  };
}

// ---------- wiring ----------
$("share-file").addEventListener("click", saveFile);
$("share-stored").addEventListener("click", showStored);
$("stored-go").addEventListener("click", doStore);
