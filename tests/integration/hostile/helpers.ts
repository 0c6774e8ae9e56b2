// Shared by the hostile-input tests: what is stored (rows and bucket objects) before and after a request, the
// "clear 4xx" contract every refusal must meet, raw HTTP for requests supertest would tidy up, and the
// hostile strings the fuzzers mix in.
import net from "node:net";
import type { Response } from "supertest";
import request from "supertest";
import { expect } from "vitest";
import { db } from "@/db/index";
import { closeStorage, listObjectKeys } from "@/lib/storage";
import { appUrl } from "../../helpers/stack";

/** The one seed of every property in these files, so a failure replays exactly. */
export const FUZZ_SEED = 20_261_201;

/** Tables a rejected request must leave alone. */
const STORED_TABLES = ["projects", "designs", "design_revisions", "builds", "tweaks", "runs", "upload_slots"] as const;
export type StoredCounts = Record<(typeof STORED_TABLES)[number] | "objects", number>;

/** Every object key in the test bucket (S3_BUCKET), all pages. */
export const bucketKeys = listObjectKeys;

/** Row counts of the logbook tables and the number of objects in the bucket. */
export async function storedCounts(): Promise<StoredCounts> {
  const rows = await Promise.all(STORED_TABLES.map((t) => db()(t).count<{ count: string }[]>("* as count").then((r) => Number(r[0].count))));
  const counts = Object.fromEntries(STORED_TABLES.map((t, i) => [t, rows[i]])) as StoredCounts;
  counts.objects = (await bucketKeys()).length;
  return counts;
}

export const closeBucketClient = closeStorage;

export interface Answer {
  status: number;
  contentType: string;
  text: string;
}

export function answerOf(res: Response): Answer {
  return { status: res.status, contentType: String(res.headers["content-type"] ?? ""), text: res.text ?? "" };
}

/**
 * The refusal contract: a 4xx in application/problem+json whose detail says what was wrong (not the generic
 * server-failure sentence). Returns the parsed problem.
 */
export function expectClear4xx(answer: Answer, context: string): { status: number; detail: string; fields?: Record<string, string[]> } {
  expect(answer.status, `${context}: ${answer.status} ${answer.text.slice(0, 300)}`).toBeGreaterThanOrEqual(400);
  expect(answer.status, `${context}: ${answer.text.slice(0, 300)}`).toBeLessThan(500);
  expect(answer.contentType, `${context}: content type`).toMatch(/^application\/problem\+json/);
  const body = JSON.parse(answer.text);
  expect(body.status, context).toBe(answer.status);
  expect(typeof body.detail, context).toBe("string");
  expect(body.detail.length, `${context}: empty detail`).toBeGreaterThan(5);
  expect(body.detail, context).not.toMatch(/Something failed on the server/);
  return body;
}

/** No answer of a hostile request may be a server error. */
export function expectNot5xx(answer: Answer, context: string): void {
  expect(answer.status, `${context}: ${answer.status} ${answer.text.slice(0, 300)}`).toBeLessThan(500);
}

/**
 * Checks one answer against what is stored: a refusal changed nothing; a success is allowed to have stored.
 * @returns whether the request was refused
 */
export async function expectRefusedChangesNothing(answer: Answer, before: StoredCounts, context: string): Promise<boolean> {
  expectNot5xx(answer, context);
  if (answer.status < 400) return false;
  expectClear4xx(answer, context);
  expect(await storedCounts(), `${context}: a refused request stored something`).toEqual(before);
  return true;
}

export async function expectHealthy(): Promise<void> {
  const res = await request(appUrl()).get("/api/health");
  expect(res.status, res.text).toBe(200);
  expect(res.body.ok).toBe(true);
}

/**
 * One HTTP/1.1 request written byte for byte on a socket (for headers a client library would refuse or
 * tidy up), and the status of what came back: 0 when the server closed without answering.
 */
export async function rawStatus(head: string, timeoutMs = 15_000): Promise<number> {
  const { hostname, port } = new URL(appUrl());
  return new Promise((resolve, reject) => {
    const socket = net.connect({ host: hostname, port: Number(port) });
    let received = "";
    let settled = false;
    const settle = (status: number) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      socket.destroy();
      resolve(status);
    };
    const timer = setTimeout(() => {
      settled = true;
      socket.destroy();
      reject(new Error(`no answer within ${timeoutMs} ms to ${head.split("\r\n")[0]}`));
    }, timeoutMs);
    socket.on("data", (chunk) => {
      received += chunk.toString("latin1");
      const m = /^HTTP\/1\.1 (\d{3})/.exec(received);
      if (m) settle(Number(m[1]));
    });
    // The server may answer and reset while the client is still writing a huge header.
    socket.on("error", () => settle(Number(/^HTTP\/1\.1 (\d{3})/.exec(received)?.[1] ?? 0)));
    socket.on("close", () => settle(Number(/^HTTP\/1\.1 (\d{3})/.exec(received)?.[1] ?? 0)));
    socket.write(head);
  });
}

/** A multipart/form-data body built by hand: any bytes in names, types and values, in the order given. */
export function multipartBody(
  parts: ({ name: string; value: string } | { name: string; filename: Buffer | string; contentType?: string; content: Buffer | string })[],
  boundary = `----hostile${Math.random().toString(16).slice(2)}`,
): { body: Buffer; contentType: string } {
  const chunks: Buffer[] = [];
  for (const p of parts) {
    chunks.push(Buffer.from(`--${boundary}\r\n`));
    if ("filename" in p) {
      chunks.push(Buffer.from(`Content-Disposition: form-data; name="${p.name}"; filename="`), Buffer.from(p.filename), Buffer.from(`"\r\n`));
      if (p.contentType !== undefined) chunks.push(Buffer.from(`Content-Type: ${p.contentType}\r\n`));
      chunks.push(Buffer.from("\r\n"), Buffer.from(p.content), Buffer.from("\r\n"));
    } else {
      chunks.push(Buffer.from(`Content-Disposition: form-data; name="${p.name}"\r\n\r\n`), Buffer.from(p.value, "utf8"), Buffer.from("\r\n"));
    }
  }
  chunks.push(Buffer.from(`--${boundary}--\r\n`));
  return { body: Buffer.concat(chunks), contentType: `multipart/form-data; boundary=${boundary}` };
}

/** Names a path or an object key could be made from, if the server ever took them from the user. */
export const PATH_LIKE_NAMES = [
  "../../etc/passwd",
  "../../etc/passwd.csv",
  "..\\..\\windows\\win.ini.csv",
  "%2e%2e/%2e%2e/etc/passwd.csv",
  "..%2f..%2fcaptures%2fx.csv",
  "/etc/passwd.csv",
  "captures/2026/01/someone-elses.csv",
  "C:\\Users\\bench\\scope.csv",
  "./.././.csv",
  "....//....//x.csv",
  `${"a".repeat(300)}.csv`,
  `${"long-".repeat(2000)}.csv`,
  "name with spaces & ampersands.csv",
  "quote\"in-name.csv",
  "<script>alert(1)</script>.csv",
  "Messung-µs-Ω.csv",
  "捕获.csv",
  "\u202ecod.csv",
];

/** Text fields' worst cases: markup, control characters, NUL, huge, odd Unicode. */
export const HOSTILE_TEXT = [
  "<script>alert(1)</script>",
  '"><img src=x onerror=alert(1)>',
  "nul\u0000inside",
  "\u0000",
  "line\r\nInjected-Header: 1",
  "=HYPERLINK(\"http://x.test\")",
  "'; drop table runs; --",
  "\ud800 lone surrogate",
  "x".repeat(3000),
  "y".repeat(20_000),
  "   ",
  "",
  "🙂".repeat(50),
];
