import { createServer, type IncomingMessage, type Server, type ServerResponse } from "node:http";
import type { MessageStore } from "./message-store";

function sendJson(res: ServerResponse, status: number, body: unknown): void {
  const payload = JSON.stringify(body);
  res.writeHead(status, { "content-type": "application/json; charset=utf-8", "content-length": Buffer.byteLength(payload) });
  res.end(payload);
}

/**
 * The read side of the fake SMTP server:
 * `GET /messages[?to=address]` (newest first), `GET /messages/:id`, `DELETE /messages`.
 */
export function createMessageApi(store: MessageStore): Server {
  return createServer((req: IncomingMessage, res: ServerResponse) => {
    const url = new URL(req.url ?? "/", "http://fake-smtp.invalid");
    const parts = url.pathname.split("/").filter(Boolean);
    if (parts[0] !== "messages" || parts.length > 2) {
      sendJson(res, 404, { error: `No such resource: ${url.pathname}` });
      return;
    }
    if (parts.length === 1 && req.method === "GET") {
      sendJson(res, 200, { messages: store.list(url.searchParams.get("to") ?? undefined) });
      return;
    }
    if (parts.length === 1 && req.method === "DELETE") {
      store.clear().then(
        () => sendJson(res, 200, { ok: true }),
        (err: unknown) => sendJson(res, 500, { error: `Could not clear messages: ${String(err)}` }),
      );
      return;
    }
    if (parts.length === 2 && req.method === "GET") {
      const message = store.get(decodeURIComponent(parts[1]));
      if (message) sendJson(res, 200, message);
      else sendJson(res, 404, { error: `No held message with id ${parts[1]}` });
      return;
    }
    res.setHeader("allow", parts.length === 1 ? "GET, DELETE" : "GET");
    sendJson(res, 405, { error: `${req.method} is not supported on ${url.pathname}` });
  });
}
