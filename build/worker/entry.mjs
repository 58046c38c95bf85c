// Entry module of the edge worker. The Go program (build/app.wasm, driven by
// the generated build/worker.mjs) answers every request; this wrapper only
// marks bodies that are already compressed (Content-Encoding set by the Go
// handler from a .br or .gz file) as such, so that the runtime sends them as
// they are instead of compressing them a second time.
import worker from "./build/worker.mjs";

export default {
  async fetch(request, env, ctx) {
    // At the edge the runtime rewrites Accept-Encoding; the client's own
    // header is in request.cf.clientAcceptEncoding. Choose by that one.
    const cae = request.cf && request.cf.clientAcceptEncoding;
    if (typeof cae === "string") {
      const headers = new Headers(request.headers);
      headers.set("Accept-Encoding", cae);
      request = new Request(request, { headers });
    }
    const res = await worker.fetch(request, env, ctx);
    if (!res.headers.has("Content-Encoding")) {
      return res;
    }
    return new Response(res.body, {
      status: res.status,
      statusText: res.statusText,
      headers: res.headers,
      encodeBody: "manual",
    });
  },
};
