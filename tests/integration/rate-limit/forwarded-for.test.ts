import { spawn, type ChildProcess } from "node:child_process";
import net from "node:net";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { ACCOUNT_FAILURE_LIMIT } from "@/lib/auth/throttle";
import { apiSignIn, createPerson } from "../auth/helpers";

// X-Forwarded-For is whatever a client writes unless a proxy we trust added it (RFC 7239 §8.3; OWASP
// Authentication Cheat Sheet). The test stack trusts its loopback client as a proxy (TRUST_PROXY=127.0.0.1,
// scripts/bootstrap.mjs); a second server on the same build runs with the default, TRUST_PROXY unset.

let plain: ChildProcess;
let plainUrl: string;

async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const server = net.createServer().listen(0, "127.0.0.1", () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
  });
}

beforeAll(async () => {
  const port = await freePort();
  plainUrl = `http://127.0.0.1:${port}`;
  const env: NodeJS.ProcessEnv = { ...process.env, APP_URL: plainUrl };
  delete env.TRUST_PROXY;
  plain = spawn(process.execPath, ["--import", "./scripts/lib/peer-address.mjs", "node_modules/next/dist/bin/next", "start", "-H", "127.0.0.1", "-p", String(port)], {
    cwd: process.cwd(),
    env,
    stdio: "ignore",
  });
  const until = Date.now() + 60_000;
  for (;;) {
    const ok = await request(plainUrl).get("/api/health").then((r) => r.status === 200, () => false);
    if (ok) break;
    if (Date.now() > until) throw new Error("the second server did not start");
    await new Promise((r) => setTimeout(r, 250));
  }
}, 90_000);

afterAll(async () => {
  plain?.kill("SIGTERM");
  await closeDb();
  await closeLucia();
});

function signInAt(base: string, email: string, password: string, forwardedFor: string) {
  return request(base).post("/api/v1/session").set("content-type", "application/json").set("x-forwarded-for", forwardedFor).send({ email, password });
}

async function lastFailureIp(email: string): Promise<string | null> {
  const row = await db()("audit_events").where({ action: "sign-in.failed" }).whereRaw("detail->>'email' = ?", [email]).orderBy("id", "desc").first("ip");
  return row?.ip ?? null;
}

describe("X-Forwarded-For", () => {
  it("is ignored without TRUST_PROXY: the audit log records the socket's address, not the one the client wrote", async () => {
    const person = await createPerson("viewer");
    expect((await signInAt(plainUrl, person.email, "wrong", "203.0.113.77")).status).toBe(401);
    expect(await lastFailureIp(person.email)).toBe("127.0.0.1");
  });

  it("cannot be rotated past the lockout without TRUST_PROXY", async () => {
    const person = await createPerson("viewer");
    for (let i = 0; i < ACCOUNT_FAILURE_LIMIT; i++) {
      expect((await signInAt(plainUrl, person.email, `wrong ${i}`, `203.0.113.${10 + i}`)).status).toBe(401);
    }
    const rotated = await signInAt(plainUrl, person.email, "wrong again", "203.0.113.99");
    expect(rotated.status).toBe(429);
    // Through the trusted proxy the owner, from another address, still gets in (lock per account and address).
    expect((await apiSignIn(person.email, person.password)).status).toBe(201);
  });

  it("is read as far as TRUST_PROXY says: the entry the trusted proxy added, never one further left", async () => {
    const person = await createPerson("viewer");
    expect((await signInAt(process.env.APP_URL!, person.email, "wrong", "192.0.2.1, 198.51.100.23")).status).toBe(401);
    expect(await lastFailureIp(person.email)).toBe("198.51.100.23");
  });
});
