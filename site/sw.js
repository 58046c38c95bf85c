// Service worker: keeps a copy of the app so that, after the first visit, the
// page loads and works with the network off. It caches only this site's own
// files (never a stored copy of a shared analysis) and never sends anything
// anywhere.
// The build replaces __LOTLENS_BUILD__ with a build id and the asset list
// below with every file in dist/ (root-relative URLs): the page's modules
// are one bundle there (build/dist/bundle.go).
"use strict";
const BUILD = "__LOTLENS_BUILD__";
const CACHE = "lotlens-" + BUILD;
// Only the build's dist/ can be served (the engine is compiled there), and
// the build always fills this list in.
const ASSETS = ["__LOTLENS_ASSETS__"];

self.addEventListener("install", (ev) => {
  ev.waitUntil(caches.open(CACHE).then(async (c) => {
    // one missing file must not stop the rest from being cached
    await Promise.all(ASSETS.map((u) => c.add(new Request(u, { cache: "reload" })).catch(() => {})));
    if (!(await c.match("index.html")) && !(await c.match("./"))) throw new Error("index not cached");
  }).then(() => self.skipWaiting()));
});

self.addEventListener("activate", (ev) => {
  ev.waitUntil(caches.keys()
    .then((keys) => Promise.all(keys.filter((k) => k.startsWith("lotlens-") && k !== CACHE).map((k) => caches.delete(k))))
    .then(() => self.clients.claim()));
});

self.addEventListener("fetch", (ev) => {
  const req = ev.request;
  if (req.method !== "GET") return;
  const url = new URL(req.url);
  if (url.origin !== self.location.origin) return;
  // Stored copies (api/share, api/share/<id>) and their links (s/<id>) go to
  // the network untouched: a deleted copy must not open from a cache, and
  // nothing of a copy is kept on this device.
  const path = url.pathname.slice(new URL(self.registration.scope).pathname.length);
  if (path === "api/share" || path.startsWith("api/share/") || path.startsWith("s/")) return;
  ev.respondWith((async () => {
    const c = await caches.open(CACHE);
    if (req.mode === "navigate") {
      // the page itself: the fresh one when online, the cached one offline
      try {
        const res = await fetch(req);
        if (res.ok && url.pathname.endsWith("/")) c.put("index.html", res.clone());
        return res;
      } catch (e) {
        const hit = await c.match(req, { ignoreSearch: true }) || await c.match("index.html") || await c.match("./");
        if (hit) return hit;
        throw e;
      }
    }
    const hit = await c.match(req, { ignoreSearch: true });
    if (hit) return hit;
    const res = await fetch(req);
    if (res.ok && res.type === "basic") c.put(req, res.clone());
    return res;
  })());
});
