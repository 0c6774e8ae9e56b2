import { readdirSync, readFileSync, readlinkSync } from "node:fs";
import net from "node:net";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { ANONYMOUS_JSON_BODY_LIMIT_BYTES } from "@/lib/http/json-body";
import { appUrl } from "../../helpers/stack";

// A 200 MB body sent in full to the one route anyone can reach (POST /api/v1/session), while the test watches
// the web server's resident memory and keeps asking /api/health. The body cap (lib/http/json-body.ts) must
// refuse it once it passes the limit, long before the last byte, and the server must not buffer what follows
// (OWASP API Security Top 10 2023, API4 "Unrestricted Resource Consumption").

/** How much the server's RSS may grow while the 200 MB arrive. Reading the body whole would add ≥ 200 MB. */
const RSS_GROWTH_BOUND_BYTES = 64 * 1024 * 1024;
const BODY_BYTES = 200_000_000;
/** The refusal must come before this much was sent; socket buffers on both sides hold a few MB at most. */
const ANSWERED_BEFORE_BYTES = 40_000_000;

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

/** The process that listens on the app's port (found through the socket's inode, as `ss -p` does). */
function serverPid(port: number): number {
  const hexPort = port.toString(16).toUpperCase().padStart(4, "0");
  const inodes = new Set<string>();
  for (const table of ["/proc/net/tcp", "/proc/net/tcp6"]) {
    let text = "";
    try {
      text = readFileSync(table, "utf8");
    } catch {
      continue;
    }
    for (const line of text.split("\n").slice(1)) {
      const cols = line.trim().split(/\s+/);
      // local_address is "ADDR:PORT"; state 0A is LISTEN; column 9 is the inode.
      if (cols.length > 9 && cols[1].endsWith(`:${hexPort}`) && cols[3] === "0A") inodes.add(cols[9]);
    }
  }
  for (const pid of readdirSync("/proc").filter((d) => /^\d+$/.test(d))) {
    let fds: string[] = [];
    try {
      fds = readdirSync(`/proc/${pid}/fd`);
    } catch {
      continue;
    }
    for (const fd of fds) {
      try {
        const m = /^socket:\[(\d+)\]$/.exec(readlinkSync(`/proc/${pid}/fd/${fd}`));
        if (m && inodes.has(m[1])) return Number(pid);
      } catch {
        // the descriptor closed meanwhile
      }
    }
  }
  throw new Error(`no process listens on port ${port}`);
}

function rssBytes(pid: number): number {
  const kb = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, "utf8"));
  if (!kb) throw new Error(`no VmRSS for process ${pid}`);
  return Number(kb[1]) * 1024;
}

/** The payload of a chunked HTTP/1.1 body (RFC 9112 §7.1). */
function unchunk(body: string): string {
  let out = "";
  let at = 0;
  for (;;) {
    const eol = body.indexOf("\r\n", at);
    if (eol < 0) return out;
    const size = parseInt(body.slice(at, eol), 16);
    if (!(size > 0)) return out;
    out += body.slice(eol + 2, eol + 2 + size);
    at = eol + 2 + size + 2;
  }
}

interface Refusal {
  status: number;
  contentType: string;
  body: string;
  sentWhenAnswered: number;
  sentInAll: number;
}

/**
 * Streams `BODY_BYTES` to the session route as fast as the socket takes them (chunked, or with a truthful
 * Content-Length), stops sending once an answer arrives, and returns the answer with how much was sent by then.
 */
function streamHugeBody(framing: "chunked" | "content-length"): Promise<Refusal> {
  const { hostname, port } = new URL(appUrl());
  return new Promise((resolve, reject) => {
    const socket = net.connect({ host: hostname, port: Number(port) });
    let sent = 0;
    let sentWhenAnswered = -1;
    let received = Buffer.alloc(0);
    let finished = false;
    const chunk = Buffer.alloc(1024 * 1024, 0x61);
    const timer = setTimeout(() => done(new Error(`no answer after ${sent} bytes`)), 60_000);

    function done(err?: Error) {
      if (finished) return;
      finished = true;
      clearTimeout(timer);
      socket.destroy();
      if (err) return reject(err);
      const text = received.toString("utf8");
      const head = text.slice(0, text.indexOf("\r\n\r\n"));
      const rest = text.slice(head.length + 4);
      resolve({
        status: Number(/^HTTP\/1\.1 (\d{3})/.exec(head)?.[1] ?? 0),
        contentType: /\r\ncontent-type:\s*([^\r\n]*)/i.exec(head)?.[1] ?? "",
        body: /\r\ntransfer-encoding:\s*chunked/i.test(head) ? unchunk(rest) : rest,
        sentWhenAnswered,
        sentInAll: sent,
      });
    }

    function complete(): boolean {
      const text = received.toString("latin1");
      const end = text.indexOf("\r\n\r\n");
      if (end < 0) return false;
      const head = text.slice(0, end);
      const length = /\r\ncontent-length:\s*(\d+)/i.exec(head);
      if (length) return received.length >= end + 4 + Number(length[1]);
      if (/\r\ntransfer-encoding:\s*chunked/i.test(head)) return text.endsWith("0\r\n\r\n");
      return false;
    }

    socket.on("data", (data) => {
      if (sentWhenAnswered < 0) sentWhenAnswered = sent;
      received = Buffer.concat([received, data]);
      if (complete()) done();
    });
    socket.on("error", () => (sentWhenAnswered >= 0 ? done() : done(new Error(`connection failed after ${sent} bytes with no answer`))));
    socket.on("close", () => (sentWhenAnswered >= 0 ? done() : done(new Error(`connection closed after ${sent} bytes with no answer`))));

    const head =
      `POST /api/v1/session HTTP/1.1\r\nHost: ${hostname}:${port}\r\nContent-Type: application/json\r\nX-Forwarded-For: 203.0.113.77\r\n` +
      (framing === "chunked" ? "Transfer-Encoding: chunked\r\n\r\n" : `Content-Length: ${BODY_BYTES}\r\n\r\n`);
    socket.write(head);
    const pump = () => {
      while (!finished && sentWhenAnswered < 0 && sent < BODY_BYTES) {
        const piece = chunk.subarray(0, Math.min(chunk.length, BODY_BYTES - sent));
        const framed = framing === "chunked" ? Buffer.concat([Buffer.from(`${piece.length.toString(16)}\r\n`), piece, Buffer.from("\r\n")]) : piece;
        sent += piece.length;
        if (!socket.write(framed)) return void socket.once("drain", pump);
      }
      if (!finished && sentWhenAnswered < 0 && sent >= BODY_BYTES && framing === "chunked") socket.write("0\r\n\r\n");
    };
    socket.once("connect", pump);
  });
}

/** GET /api/health every 100 ms until stopped; every status and time is kept. */
function watchHealth(): { stop: () => Promise<{ status: number; ms: number }[]> } {
  const answers: { status: number; ms: number }[] = [];
  let running = true;
  const loop = (async () => {
    while (running) {
      const started = performance.now();
      try {
        const res = await fetch(`${appUrl()}/api/health`, { signal: AbortSignal.timeout(10_000) });
        await res.arrayBuffer();
        answers.push({ status: res.status, ms: performance.now() - started });
      } catch {
        answers.push({ status: 0, ms: performance.now() - started });
      }
      await new Promise((r) => setTimeout(r, 100));
    }
  })();
  return {
    stop: async () => {
      running = false;
      await loop;
      return answers;
    },
  };
}

describe("a 200 MB body to the sign-in route", () => {
  for (const framing of ["chunked", "content-length"] as const) {
    it(`is refused with 413 naming the limit before it is read whole (${framing}), the server's RSS stays within ${RSS_GROWTH_BOUND_BYTES / 2 ** 20} MiB and health keeps answering`, async () => {
      const pid = serverPid(Number(new URL(appUrl()).port));
      // Load the route's code first (a small refused sign-in), so the baseline holds it and the growth is the body's.
      await fetch(`${appUrl()}/api/v1/session`, { method: "POST", headers: { "content-type": "application/json", "x-forwarded-for": "203.0.113.78" }, body: "{}" }).then((r) => r.arrayBuffer());
      const before = rssBytes(pid);
      let peak = before;
      const sampler = setInterval(() => {
        try {
          peak = Math.max(peak, rssBytes(pid));
        } catch {
          // the process went away; the health check will say so
        }
      }, 50);
      const health = watchHealth();
      // Give the health loop a first answer before the body starts, so "kept answering" has a baseline.
      await new Promise((r) => setTimeout(r, 300));
      let refusal: Refusal;
      try {
        refusal = await streamHugeBody(framing);
        // Keep watching a little after the answer: a server that buffered the rest would grow now.
        await new Promise((r) => setTimeout(r, 1_000));
      } finally {
        clearInterval(sampler);
      }
      const answers = await health.stop();
      peak = Math.max(peak, rssBytes(pid));
      const slowest = Math.max(...answers.map((a) => a.ms));
      console.log(
        `${framing}: answered ${refusal.status} after ${refusal.sentWhenAnswered} bytes sent; server RSS ${(before / 2 ** 20).toFixed(0)} → peak ${(peak / 2 ** 20).toFixed(0)} MiB; ` +
          `${answers.length} health answers, slowest ${slowest.toFixed(0)} ms`,
      );

      expect(refusal.status, refusal.body.slice(0, 300)).toBe(413);
      expect(refusal.contentType).toMatch(/^application\/problem\+json/);
      const problem = JSON.parse(refusal.body);
      expect(problem.status).toBe(413);
      expect(problem.detail).toContain(`${ANONYMOUS_JSON_BODY_LIMIT_BYTES} bytes`);
      expect(refusal.sentWhenAnswered).toBeGreaterThanOrEqual(0);
      expect(refusal.sentWhenAnswered).toBeLessThan(ANSWERED_BEFORE_BYTES);
      expect(peak - before).toBeLessThan(RSS_GROWTH_BOUND_BYTES);
      expect(answers.length).toBeGreaterThanOrEqual(3);
      expect(answers.every((a) => a.status === 200), JSON.stringify(answers)).toBe(true);
    }, 90_000);
  }
});
