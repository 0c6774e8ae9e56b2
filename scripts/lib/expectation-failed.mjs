// Preloaded into the web app (`node --import ./scripts/lib/expectation-failed.mjs …next start`): answers a request
// whose Expect header asks for anything but 100-continue with a 417 problem+json that names the header. Without a
// 'checkExpectation' listener Node's HTTP server answers such a request itself, before Next sees it, with a bare
// 417 and no body. RFC 9110 §10.1.1 lets a server refuse an expectation it cannot meet; this answer says which.
import http from "node:http";

const MAX_SHOWN_CHARS = 80;

/** @param {http.IncomingMessage} req @param {http.ServerResponse} res */
function expectationFailed(req, res) {
  const raw = String(req.headers.expect ?? "");
  const shown = raw.length > MAX_SHOWN_CHARS ? `${raw.slice(0, MAX_SHOWN_CHARS)}…` : raw;
  const body = JSON.stringify({
    type: "https://tankbook.test/problems/expectation-failed",
    title: "Expectation failed",
    status: 417,
    detail: `The Expect header asks for ${JSON.stringify(shown)}; this server meets only "100-continue". Send the request without it.`,
  });
  // The body, if any, is not read: closing the connection keeps its bytes from being taken for the next request.
  res.writeHead(417, {
    "content-type": "application/problem+json",
    "content-length": Buffer.byteLength(body),
    "cache-control": "no-store",
    "x-content-type-options": "nosniff",
    connection: "close",
  });
  res.end(body);
}

const emit = http.Server.prototype.emit;
http.Server.prototype.emit = function emitWithExpectationAnswer(event, ...args) {
  // Every request arrives on a connection, so a server has its listener before its first request is parsed.
  if (event === "connection" && this.listenerCount("checkExpectation") === 0) this.on("checkExpectation", expectationFailed);
  return emit.call(this, event, ...args);
};
