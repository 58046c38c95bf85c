// The page's state, declared in one place, and the few things every module
// shares: the element lookup, the status line, the request schema, and the
// page's actions (filled in by input.js, called by the cards: late binding
// keeps the modules' imports free of cycles, which the build's
// fingerprinting needs).

export const SCHEMA = "lotlens.request/1";

export const $ = (id) => document.getElementById(id);

export const state = {
  source: null,     // "text" | "file"
  text: "",         // the pasted text last analysed
  file: null,       // the File last read (its name for the report; its text comes from the engine)
  sourceName: "",   // shown beside the preview: the file's name, "demo", or a shared link's name
  hasTable: false,  // the engine keeps the file's table
  exclude: new Set(),
  leaveOutRows: [], // rows typed in "Leave out rows"
  leaveOutText: "",
  allSuspects: false,
  cols: { value: "", group: "", order: "", subgroup: "" },
  report: null,
  svg: {},
  full: false,      // full precision
  when: null,
  busy: 0,
  analyses: 0,
  timing: null,
  loadPhases: null, // engine load phases (engine-client.js)
  warmStageMs: null, // the engine's warm-up stages, ms each (engine-client.js)
  sentAt: 0,
  runToken: 0,      // the latest analysis; older answers are dropped
  lastKey: "",      // the last request sent (data version, settings, columns): not sent twice
  dataVersion: 0,   // counts changes of the data (new paste, edit, file, link)
  settingsError: null, // {message, field} while a setting is invalid
  bigText: "",      // a large paste kept out of the text box
  tip: { row: null, fig: null, index: -1 }, // the chart point whose tip is shown
  shared: null,     // the data came from a shared payload: {how, created, name, fingerprint, bytes} (share.js)
  reasons: new Map(), // row -> the user's reason for leaving it out (carried in a share payload)
  carried: {},      // options of a shared payload the page has no field for (kept for re-runs)
};

// actions are set by input.js: analyse (run the analysis again),
// toggleExclude(row) and reasonChanged(row); by cards.js: render.
export const actions = {
  analyse: () => {},
  toggleExclude: () => {},
  render: () => {},       // draw the report again (set by cards.js)
  reasonChanged: () => {}, // a reason was typed (set by input.js)
};

export function setStatus(msg, isError) {
  const status = $("status");
  status.textContent = msg;
  status.classList.toggle("error", !!isError);
}

// errorOf reads the engine's JSON error object {error, code}: the message
// to show and its code ("" when the object has none).
export function errorOf(res) {
  if (!res || !res.error) return null;
  return { message: String(res.error), code: res.code ? String(res.code) : "" };
}

// showError puts an engine error in the status line and marks the page's
// state for scripts and tests (data-error-code).
export function showError(err) {
  setStatus(err.message, true);
  if (err.code) document.body.dataset.errorCode = err.code;
  else delete document.body.dataset.errorCode;
}
