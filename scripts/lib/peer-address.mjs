// Preloaded into the web app (`node --import ./scripts/lib/peer-address.mjs …next start`): stamps each request
// with the address of the socket it came on, under a header name chosen at random per process, before Next
// sees it. Next keeps a client's own X-Forwarded-For as it is, so without this the app cannot tell the peer's
// address from one the client made up (lib/auth/client-ip.ts reads it; TRUST_PROXY decides what else counts).
import { randomBytes } from "node:crypto";
import http from "node:http";

const headerName = `x-tankbook-peer-${randomBytes(8).toString("hex")}`;
globalThis[Symbol.for("tankbook.peerAddressHeader")] = headerName;

const emit = http.Server.prototype.emit;
http.Server.prototype.emit = function emitWithPeer(event, ...args) {
  if (event === "request") {
    const [req] = args;
    req.headers[headerName] = req.socket?.remoteAddress ?? "";
  }
  return emit.call(this, event, ...args);
};
