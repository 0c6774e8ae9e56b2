import http from "node:http";
import { describe, expect, it } from "vitest";
import { appUrl } from "../../helpers/stack";

// RFC 9110 §10.1.1: a server may refuse an expectation other than 100-continue with 417. Node's HTTP server did
// so itself, before the app, with no body at all; the full fuzz campaign counted 29 such /api answers that were
// not problem+json. The app's preload (scripts/lib/expectation-failed.mjs) now answers them.

function send(path: string, method: string, headers: Record<string, string>, body?: string): Promise<{ status: number; type: string; text: string }> {
  const url = new URL(path, appUrl());
  return new Promise((resolve, reject) => {
    const req = http.request({ host: url.hostname, port: url.port, path: url.pathname, method, headers: { ...headers, ...(body ? { "content-length": String(Buffer.byteLength(body)) } : {}) } }, (res) => {
      let text = "";
      res.setEncoding("utf8");
      res.on("data", (c: string) => (text += c));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, type: String(res.headers["content-type"] ?? ""), text }));
    });
    req.on("error", reject);
    req.end(body);
  });
}

describe("an Expect header the server cannot meet", () => {
  it.each([
    ["a range as the expectation", "GET", "/api/v1/me", "bytes=0-0,-1", undefined],
    ["a PATCH with a body", "PATCH", "/api/v1/builds/00000000-0000-0000-0000-000000000000", "%7B%7D", '{"label":"x"}'],
    ["a 3,000-character value", "GET", "/api/health", "x".repeat(3000), undefined],
  ])("%s is a 417 problem+json naming the header", async (_label, method, path, expectValue, body) => {
    const res = await send(path, method, { expect: expectValue, "content-type": "application/json" }, body);
    expect(res.status).toBe(417);
    expect(res.type).toMatch(/^application\/problem\+json/);
    const problem = JSON.parse(res.text) as { status: number; detail: string };
    expect(problem.status).toBe(417);
    expect(problem.detail).toMatch(/Expect header/);
    expect(problem.detail).toContain(expectValue.slice(0, 20));
    expect(problem.detail.length).toBeLessThan(300);
  });

  it("leaves Expect: 100-continue alone: the request is answered by the app as usual", async () => {
    const res = await send("/api/health", "GET", { expect: "100-continue" });
    expect(res.status).toBe(200);
    expect(JSON.parse(res.text)).toMatchObject({ ok: true });
  });
});
