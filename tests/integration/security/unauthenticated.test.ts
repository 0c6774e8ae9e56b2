import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { createApiToken } from "@/lib/auth/api-tokens";
import { closeLucia } from "@/lib/auth/lucia";
import { createApiPerson, UNKNOWN_ID } from "../api/helpers";
import { appUrl, createPerson, getPage } from "../auth/helpers";
import { answerOf, expectClear4xx } from "../hostile/helpers";
import { routeHandlers, signedInPages, type Method } from "./helpers";

// Walks app/api/** and app/(app)/** and knocks on every door without credentials. Public operations are
// listed here by hand, so a new public route has to be added on purpose.
const PUBLIC = new Set(["GET /api/health", "GET /api/v1/openapi.json", "POST /api/v1/session"]);

const routes = routeHandlers(UNKNOWN_ID);
const operations = routes.flatMap((r) => r.methods.map((m) => ({ method: m, path: r.path, key: `${m} ${r.path.replace(new RegExp(UNKNOWN_ID, "g"), "{id}")}` })));
const guarded = operations.filter((o) => !PUBLIC.has(`${o.method} ${o.path}`));

function call(method: Method, path: string) {
  const req = request(appUrl())[method.toLowerCase() as "get"](path).redirects(0);
  return method === "GET" || method === "DELETE" ? req : req.set("content-type", "application/json").send("{}");
}

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("the walk itself", () => {
  it("finds the route files and the signed-in pages the app has", () => {
    expect(routes.length).toBeGreaterThanOrEqual(20);
    expect(operations.map((o) => o.key)).toEqual(expect.arrayContaining(["POST /api/v1/builds/{id}/runs", "PATCH /api/v1/designs/{id}", "POST /api/v1/uploads", "GET /api/v1/me"]));
    for (const p of PUBLIC) expect(operations.map((o) => `${o.method} ${o.path}`), `${p} is a route`).toContain(p);
    expect(signedInPages(UNKNOWN_ID)).toEqual(expect.arrayContaining(["/dashboard", "/projects", `/builds/${UNKNOWN_ID}`, `/runs/${UNKNOWN_ID}`, "/people", "/profile"]));
  });
});

describe("every route handler without credentials", () => {
  it("answers 401 problem+json for every exported method that is not listed as public", async () => {
    const wrong: string[] = [];
    for (const op of guarded) {
      const answer = answerOf(await call(op.method, op.path));
      if (answer.status !== 401) wrong.push(`${op.key}: ${answer.status}`);
      else expectClear4xx(answer, op.key);
    }
    expect(wrong).toEqual([]);
  });

  it("answers the public ones without asking who is calling", async () => {
    expect((await request(appUrl()).get("/api/health")).status).toBe(200);
    expect((await request(appUrl()).get("/api/v1/openapi.json")).status).toBe(200);
    // Signing in is public; an empty body is a validation error, not a 401.
    expect(expectClear4xx(answerOf(await call("POST", "/api/v1/session")), "POST /api/v1/session {}").status).toBe(400);
  });

  it("answers 405 for methods a route does not export, not 200 and not 5xx", async () => {
    const wrong: string[] = [];
    for (const r of routes) {
      for (const m of (["POST", "PUT", "PATCH", "DELETE"] as Method[]).filter((x) => !r.methods.includes(x))) {
        const status = (await call(m, r.path)).status;
        if (status !== 405) wrong.push(`${m} ${r.path}: ${status}`);
      }
    }
    expect(wrong).toEqual([]);
  });

  it("refuses a made-up, a revoked and a disabled owner's token alike with 401", async () => {
    const revokedOwner = await createApiPerson("admin", "revoked-owner");
    const revoked = await createApiToken({ userId: revokedOwner.id, name: "to revoke" });
    await db()("api_tokens").where({ id: revoked.summary.id }).update({ revoked_at: new Date() });
    const disabledOwner = await createApiPerson("admin", "disabled-owner");
    await db()("auth_user").where({ id: disabledOwner.id }).update({ status: "disabled" });
    for (const [label, token] of [["made-up", `tbk_${"A".repeat(43)}`], ["revoked", revoked.token], ["disabled owner", disabledOwner.token]] as const) {
      for (const op of guarded.filter((o) => o.path.startsWith("/api/v1/") && o.method !== "DELETE").slice(0, 12)) {
        const req = request(appUrl())[op.method.toLowerCase() as "get"](op.path).set("authorization", `Bearer ${token}`).redirects(0);
        const res = op.method === "GET" ? await req : await req.set("content-type", "application/json").send("{}");
        expect(res.status, `${label} token on ${op.key}`).toBe(401);
      }
    }
  });
});

describe("pages of the signed-in shell without a session", () => {
  it("redirect to the sign-in page and show nothing of the page", async () => {
    const wrong: string[] = [];
    for (const page of signedInPages(UNKNOWN_ID)) {
      const res = await getPage(page);
      const location = String(res.headers.location ?? "");
      if (![303, 307, 308].includes(res.status) || !location.startsWith("/sign-in")) wrong.push(`${page}: ${res.status} → ${location}`);
    }
    expect(wrong).toEqual([]);
  });

  it("redirect a session that was disabled meanwhile, too", async () => {
    const person = await createPerson("engineer", "disabled-meanwhile");
    const { signedInCookie } = await import("../auth/helpers");
    const cookie = await signedInCookie(person);
    expect((await getPage("/dashboard", cookie)).status).toBe(200);
    await db()("auth_user").where({ id: person.id }).update({ status: "disabled" });
    for (const page of ["/dashboard", "/projects", "/profile"]) {
      const res = await getPage(page, cookie);
      expect([303, 307], page).toContain(res.status);
      expect(String(res.headers.location)).toMatch(/^\/sign-in/);
    }
  });
});

beforeAll(() => {
  // The walk reads app/ from the working directory; npm test runs from the project root.
  expect(routes.length).toBeGreaterThan(0);
});
