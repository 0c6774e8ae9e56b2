import { randomUUID } from "node:crypto";
import type { AddressInfo, Server as NetServer } from "node:net";
import { simpleParser } from "mailparser";
import { SMTPServer, type SMTPServerDataStream, type SMTPServerSession } from "smtp-server";
import type { HeldMessage } from "../lib/mail/held-message";
import { createMessageApi } from "./http-api";
import { MessageStore } from "./message-store";

/** Largest message accepted, in bytes; larger ones are refused with SMTP 552. */
export const DEFAULT_MAX_MESSAGE_BYTES = 10 * 1024 * 1024;

/** Options for {@link startFakeSmtp}. */
export interface FakeSmtpOptions {
  /** Interface for both listeners; loopback by default. */
  host?: string;
  /** SMTP port; 0 picks a free ephemeral port. */
  smtpPort: number;
  /** HTTP API port; 0 picks a free ephemeral port. */
  apiPort: number;
  /** Folder for messages.jsonl, kept across restarts. */
  directory: string;
  maxMessageBytes?: number;
}

/** A running fake SMTP server and its HTTP API. */
export interface FakeSmtp {
  smtpHost: string;
  smtpPort: number;
  /** Base URL of the HTTP API, to use as FAKE_SMTP_API_URL, e.g. "http://127.0.0.1:2526". */
  apiUrl: string;
  close(): Promise<void>;
}

function listen(server: NetServer, port: number, host: string): Promise<AddressInfo> {
  return new Promise((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, host, () => {
      server.off("error", reject);
      resolve(server.address() as AddressInfo);
    });
  });
}

function tooBig(maxBytes: number): Error & { responseCode: number } {
  return Object.assign(new Error(`Message exceeds the fake server's limit of ${maxBytes} bytes`), { responseCode: 552 });
}

/**
 * Start an SMTP server that accepts every message (any or no AUTH, no STARTTLS) and holds it,
 * plus an HTTP API to read the held messages back.
 *
 * @returns where each side listens and a `close()` that stops both and waits for pending writes.
 * @throws the listen error (e.g. EADDRINUSE) as is.
 */
export async function startFakeSmtp(options: FakeSmtpOptions): Promise<FakeSmtp> {
  const host = options.host ?? "127.0.0.1";
  const maxBytes = options.maxMessageBytes ?? DEFAULT_MAX_MESSAGE_BYTES;
  const store = await MessageStore.open(options.directory);

  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    // Advertised in EHLO so well-behaved clients refuse to send a bigger message at MAIL FROM already.
    size: maxBytes,
    logger: false,
    onAuth(_auth, _session, callback) {
      callback(null, { user: "fake-smtp" });
    },
    onData(stream: SMTPServerDataStream, session: SMTPServerSession, callback) {
      const chunks: Buffer[] = [];
      let bytes = 0;
      stream.on("data", (chunk: Buffer) => {
        bytes += chunk.length;
        // Stop buffering past the limit but keep reading, so the client gets a 552 reply and not a broken pipe.
        if (bytes <= maxBytes) chunks.push(chunk);
      });
      stream.on("error", (err) => callback(err));
      stream.on("end", () => {
        if (stream.sizeExceeded || bytes > maxBytes) {
          callback(tooBig(maxBytes));
          return;
        }
        simpleParser(Buffer.concat(chunks))
          .then((parsed) => {
            const message: HeldMessage = {
              id: randomUUID(),
              receivedAt: new Date().toISOString(),
              from: parsed.from?.text || (session.envelope.mailFrom ? session.envelope.mailFrom.address : ""),
              to: session.envelope.rcptTo.map((r) => r.address),
              subject: parsed.subject ?? "",
              text: parsed.text ?? "",
              html: typeof parsed.html === "string" ? parsed.html : "",
            };
            return store.add(message);
          })
          .then(
            () => callback(),
            (err: unknown) => callback(err instanceof Error ? err : new Error(String(err))),
          );
      });
    },
  });

  const api = createMessageApi(store);
  const smtpAddress = await listen(smtp.server, options.smtpPort, host);
  let apiAddress: AddressInfo;
  try {
    apiAddress = await listen(api, options.apiPort, host);
  } catch (err) {
    await new Promise<void>((resolve) => smtp.close(() => resolve()));
    throw err;
  }

  return {
    smtpHost: host,
    smtpPort: smtpAddress.port,
    apiUrl: `http://${host}:${apiAddress.port}`,
    async close() {
      await Promise.all([
        new Promise<void>((resolve) => smtp.close(() => resolve())),
        new Promise<void>((resolve, reject) => {
          api.close((err) => (err ? reject(err) : resolve()));
          // Keep-alive sockets from fetch() would otherwise hold close() open.
          api.closeAllConnections();
        }),
      ]);
      await store.flush();
    },
  };
}
