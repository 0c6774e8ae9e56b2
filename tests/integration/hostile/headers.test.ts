import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { appUrl } from "../../helpers/stack";
import { createApiPerson, type ApiPerson } from "../api/helpers";
import { answerOf, expectClear4xx, expectHealthy, rawStatus } from "./helpers";

// Oversized and malformed headers: Node's parser refuses what is over its 16 KiB header limit before the app
// sees it (431, no body of ours); everything under the limit reaches the app and gets a problem+json 4xx.

let viewer: ApiPerson;

beforeAll(async () => {
  viewer = await createApiPerson("viewer", "hostile-headers");
});

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

function head(lines: string[]): string {
  const { host } = new URL(appUrl());
  return [`GET /api/v1/me HTTP/1.1`, `Host: ${host}`, ...lines, "Connection: close", "", ""].join("\r\n");
}

describe("headers over the limit", () => {
  it("answers 431 to one header of 20 KB, of 200 KB, and to 20 KB spread over many headers, and stays up", async () => {
    // Node's default --max-http-header-size is 16 KiB (Node docs, http.maxHeaderSize).
    expect(await rawStatus(head([`X-Big: ${"a".repeat(20_000)}`]))).toBe(431);
    const huge = await rawStatus(head([`X-Huge: ${"b".repeat(200_000)}`]));
    // The server may answer and reset while the rest is still being written; either way nothing is served.
    expect([431, 0]).toContain(huge);
    expect(await rawStatus(head(Array.from({ length: 400 }, (_, i) => `X-Many-${i}: ${"c".repeat(50)}`)))).toBe(431);
    expect(await rawStatus(head([`Cookie: tankbook_session=${"d".repeat(20_000)}`]))).toBe(431);
    await expectHealthy();
  });

  it("answers 400 to headers the HTTP parser cannot read", async () => {
    expect(await rawStatus(head(["X-Bad\u0000Name: 1"]))).toBe(400);
    expect(await rawStatus(head(["X-Bad: value\u0000with NUL"]))).toBe(400);
    expect(await rawStatus(head(["No colon here"]))).toBe(400);
    expect(await rawStatus(`GET /api/v1/me HTTP/1.1\r\nHost: x\r\nContent-Length: 5\r\nContent-Length: 6\r\n\r\n`)).toBe(400);
    expect(await rawStatus(`GET /api/v1/me HTTP/1.1\r\nHost: x\r\nContent-Length: 5\r\nTransfer-Encoding: chunked\r\n\r\n0\r\n\r\n`)).toBe(400);
    await expectHealthy();
  });
});

describe("credentials that are large or malformed but under the limit", () => {
  it("answers 401 problem+json to each and never acts for anyone", async () => {
    const values = [
      `Bearer ${"t".repeat(8_000)}`,
      `Bearer tbk_${"x".repeat(190)}`,
      "Bearer",
      "Bearer ",
      `Bearer ${viewer.token.slice(0, -1)}`,
      `bearer ${viewer.token}x`,
      `Basic ${Buffer.from(`${viewer.email}:bench automation 2026`).toString("base64")}`,
      "Token abc",
      "Bearer ../../etc/passwd",
      `Bearer ${"%00".repeat(20)}`,
    ];
    for (const value of values) {
      const res = await request(appUrl()).get("/api/v1/me").set("authorization", value);
      expect(expectClear4xx(answerOf(res), `Authorization: ${value.slice(0, 40)}`).status).toBe(401);
    }
    for (const cookie of [`tankbook_session=${"s".repeat(8_000)}`, "tankbook_session=", "tankbook_session=../../x", `tankbook_session=${"é".repeat(100)}`, "tankbook_session=a; tankbook_session=b"]) {
      const res = await request(appUrl()).get("/api/v1/me").set("cookie", cookie);
      expect(expectClear4xx(answerOf(res), `Cookie: ${cookie.slice(0, 40)}`).status).toBe(401);
    }
    // The real token still works afterwards: nothing above locked it or the app.
    expect((await request(appUrl()).get("/api/v1/me").set("authorization", `Bearer ${viewer.token}`)).status).toBe(200);
  });

  it("refuses a huge or odd Accept, Content-Type or X-Forwarded-For without a server error", async () => {
    const odd: Record<string, string> = {
      accept: "x/".repeat(4_000),
      "content-type": `application/json; ${"p=1; ".repeat(1_000)}`,
      "x-forwarded-for": Array.from({ length: 500 }, (_, i) => `10.0.${i % 250}.1`).join(", "),
      "x-forwarded-host": "evil.example",
      "user-agent": "u".repeat(6_000),
    };
    for (const [name, value] of Object.entries(odd)) {
      const res = await request(appUrl()).get("/api/v1/me").set(name, value).set("authorization", `Bearer ${viewer.token}`);
      expect(res.status, `${name}: ${res.text.slice(0, 200)}`).toBe(200);
    }
    const sign = await request(appUrl()).post("/api/v1/session").set("content-type", "application/json").set("user-agent", "u".repeat(6_000)).set("x-forwarded-for", "x".repeat(3_000)).send({ email: viewer.email, password: "wrong password here" });
    expect(expectClear4xx(answerOf(sign), "sign-in with odd headers").status).toBe(401);
    await expectHealthy();
  });
});
