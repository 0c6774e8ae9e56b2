import fc from "fast-check";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { appUrl } from "../../helpers/stack";
import { createApiPerson, createFixture, UNKNOWN_ID, type ApiPerson, type Fixture } from "../api/helpers";
import { answerOf, closeBucketClient, expectClear4xx, expectHealthy, expectNot5xx, expectRefusedChangesNothing, FUZZ_SEED, HOSTILE_TEXT, PATH_LIKE_NAMES, storedCounts, type Answer } from "./helpers";

// The JSON routes of /api/v1 under random and hostile bodies, query strings and path segments: never a 5xx,
// every refusal a problem+json 4xx that stored nothing (rows and bucket objects), and the app still healthy.

let fx: Fixture;
/** Callers by role, several of each, used in turn so the write limit per user and minute never answers. */
let callers: Record<"technician" | "engineer", ApiPerson[]>;
const turns = { technician: 0, engineer: 0 };

beforeAll(async () => {
  fx = await createFixture("hostile-api");
  const make = (role: "technician" | "engineer") => Promise.all([1, 2, 3].map((i) => createApiPerson(role, `hostile-api-${role}-${i}`)));
  callers = { technician: await make("technician"), engineer: await make("engineer") };
}, 120_000);

afterAll(async () => {
  closeBucketClient();
  await closeDb();
  await closeLucia();
});

function caller(role: "technician" | "engineer" | null): ApiPerson | null {
  if (!role) return null;
  return callers[role][turns[role]++ % callers[role].length];
}

type Method = "post" | "patch" | "put" | "delete";

/** encodeURIComponent, with a lone surrogate (which it refuses) written as U+FFFD. */
function safeEncode(text: string): string {
  return encodeURIComponent(text.replace(/[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/g, "\ufffd"));
}

function safeDecode(segment: string): string {
  try {
    return decodeURIComponent(segment);
  } catch {
    return segment;
  }
}

/** Every JSON write of /api/v1, with the lowest role that may make it (so the body, not the role, decides). */
function writeTargets(): { method: Method; path: string; role: "technician" | "engineer" | null }[] {
  return [
    { method: "post", path: "/api/v1/projects", role: "engineer" },
    { method: "patch", path: `/api/v1/projects/${fx.projectId}`, role: "engineer" },
    { method: "post", path: `/api/v1/projects/${fx.projectId}/designs`, role: "engineer" },
    { method: "patch", path: `/api/v1/designs/${fx.designId}`, role: "engineer" },
    { method: "post", path: `/api/v1/designs/${fx.designId}/builds`, role: "technician" },
    { method: "post", path: `/api/v1/builds/${fx.buildId}/tweaks`, role: "technician" },
    { method: "post", path: `/api/v1/builds/${fx.buildId}/review`, role: "engineer" },
    { method: "post", path: `/api/v1/builds/${fx.buildId}/retune`, role: "technician" },
    { method: "post", path: "/api/v1/uploads", role: "technician" },
    { method: "post", path: `/api/v1/uploads/${UNKNOWN_ID}/complete`, role: "technician" },
    { method: "post", path: "/api/v1/session", role: null },
  ];
}

const hostileString = fc.oneof(fc.constantFrom(...HOSTILE_TEXT, ...PATH_LIKE_NAMES), fc.string({ maxLength: 40 }), fc.string({ unit: "binary", maxLength: 40 }));
const fieldValue: fc.Arbitrary<unknown> = fc.oneof(
  hostileString,
  fc.double(),
  fc.integer(),
  fc.constantFrom(null, true, false, 1e308, -1e308, 2 ** 53 + 1, -0, 0.1, 1e-320),
  fc.array(hostileString, { maxLength: 3 }),
  fc.dictionary(hostileString, hostileString, { maxKeys: 3 }),
);
/** Names the handlers read, plus prototype keys and nonsense. */
const knownKey = fc.constantFrom(
  "name", "purpose", "topology", "parts", "spec", "windings", "extraCapacitance", "changeNote", "label", "kind", "kindRevision", "builtBy",
  "partRef", "toValue", "note", "planned", "decision", "comment", "reason", "series", "buildId", "filename", "sizeBytes", "contentType",
  "channel", "probe", "supplyV", "temperatureC", "tweakId", "keepDuplicate", "email", "password", "role", "id", "createdBy",
  "__proto__", "constructor", "prototype",
);
/** Bodies shaped like the real ones (right keys, wrong values) and bodies of any JSON at all. */
const shapedBody = fc.dictionary(knownKey, fieldValue, { maxKeys: 6 }).map((o) => JSON.stringify(o));
const partsBody = fc
  .record({ name: hostileString, topology: fc.constantFrom("colpitts", "hartley", "clapp", "tank", "other", ""), parts: fc.dictionary(fc.constantFrom("L", "C", "C1", "C2", "C3", "L1", "L2", "X"), fc.dictionary(fc.constantFrom("value", "tolerance", "tempco"), fieldValue, { maxKeys: 3 }), { maxKeys: 4 }), spec: fc.dictionary(fc.constantFrom("targetHz", "toleranceValue", "toleranceUnit", "maxThdPercent", "maxHarmonicDbc", "minFundamentalVpk", "maxDriftPpm"), fieldValue, { maxKeys: 4 }) })
  .map((o) => JSON.stringify(o));
const rawText = fc.oneof(
  fc.json(),
  fc.string({ maxLength: 200 }),
  fc.constantFrom(
    "",
    "{",
    "[[[[[[",
    '{"name": "x",}',
    "{'name': 'single quotes'}",
    '{"name": NaN}',
    '{"name": Infinity}',
    '{"name": "\\ud800"}',
    '{"name": "nul\\u0000"}',
    '{"name\\u0000": "key with nul"}',
    '{"__proto__": {"role": "admin", "isAdmin": true}}',
    '{"constructor": {"prototype": {"role": "admin"}}}',
    "\ufeff{}",
    "null",
    "0",
    "true",
    '"just a string"',
    "[]",
    "9".repeat(400),
  ),
);
/** Bodies too big to print in a counterexample: generated by name, written out when sent. */
const BIG_BODIES: Record<string, () => string> = {
  "2 MB name": () => `{"name": "${"z".repeat(2_000_000)}"}`,
  "array nested 50 000 deep": () => "[".repeat(50_000) + "]".repeat(50_000),
  "object nested 5 000 deep": () => `{"a":${'{"a":'.repeat(5_000)}1${"}".repeat(5_000)}}`,
  "20 000 keys": () => JSON.stringify(Object.fromEntries(Array.from({ length: 20_000 }, (_, i) => [`k${i}`, i]))),
  "10 000 parts": () => JSON.stringify({ name: "wide", topology: "tank", parts: Object.fromEntries(Array.from({ length: 10_000 }, (_, i) => [`C${i}`, { value: "1n" }])) }),
};
const bigBody = fc.constantFrom(...Object.keys(BIG_BODIES)).map((name) => ({ big: name }));
const body = fc.oneof({ weight: 3, arbitrary: shapedBody }, { weight: 1, arbitrary: partsBody }, { weight: 2, arbitrary: rawText }, { weight: 1, arbitrary: bigBody });
const contentType = fc.constantFrom("application/json", "application/json", "application/json; charset=utf-8", "text/plain", "application/x-www-form-urlencoded", "application/xml", "application/json; charset=utf-16", "");

async function send(method: Method, path: string, who: ApiPerson | null, text: string, type: string): Promise<Answer> {
  const req = request(appUrl())[method](path).redirects(0).set("x-forwarded-for", "203.0.113.9");
  if (who) req.set("authorization", `Bearer ${who.token}`);
  if (type) req.set("content-type", type);
  return answerOf(await req.send(text));
}

describe("random and hostile JSON bodies on every write", () => {
  it("never answers 5xx, and every refusal is a clear 4xx that stored nothing", async () => {
    let refused = 0;
    let accepted = 0;
    await fc.assert(
      fc.asyncProperty(fc.nat(writeTargets().length - 1), body, contentType, async (which, generated, type) => {
        const target = writeTargets()[which];
        const text = typeof generated === "string" ? generated : BIG_BODIES[generated.big]();
        const before = await storedCounts();
        const answer = await send(target.method, target.path, caller(target.role), text, type);
        const context = `${target.method.toUpperCase()} ${target.path} (${type}) ${typeof generated === "string" ? text.slice(0, 160) : generated.big}`;
        if (await expectRefusedChangesNothing(answer, before, context)) refused += 1;
        else accepted += 1;
      }),
      { seed: FUZZ_SEED, numRuns: 260, endOnFailure: true },
    );
    expect(refused).toBeGreaterThan(150);
    await expectHealthy();
    // The prototype keys changed nobody's role and no object's prototype on the server.
    expect(await db()("auth_user").whereIn("id", [...callers.technician, ...callers.engineer].map((p) => p.id)).whereNot({ role: "technician" }).whereNot({ role: "engineer" }).count<{ count: string }[]>("* as count").then((r) => Number(r[0].count))).toBe(0);
    expect(accepted + refused).toBe(260);
  }, 120_000);

  it("keeps a refused body's bad field in the problem's detail", async () => {
    const tech = caller("technician");
    const cases: [Method, string, unknown, RegExp][] = [
      ["post", `/api/v1/designs/${fx.designId}/builds`, { label: "x".repeat(5000), kind: "breadboard" }, /label/i],
      ["post", `/api/v1/designs/${fx.designId}/builds`, { label: "ok", kind: "spaceship" }, /kind/i],
      ["post", `/api/v1/builds/${fx.buildId}/tweaks`, { partRef: "C1", toValue: "4.7q" }, /4\.7q|toValue/],
      ["post", `/api/v1/builds/${fx.buildId}/tweaks`, { note: "nul\u0000" }, /NUL/],
      ["post", "/api/v1/uploads", { buildId: fx.buildId, filename: "a.csv", sizeBytes: -5 }, /sizeBytes|empty/i],
      ["post", "/api/v1/uploads", { buildId: "../../etc/passwd", filename: "a.csv", sizeBytes: 10 }, /buildId|id/i],
      ["post", "/api/v1/uploads", { buildId: fx.buildId, filename: "x".repeat(300) + ".csv", sizeBytes: 10 }, /filename|too long/i],
    ];
    for (const [method, path, payload, detail] of cases) {
      const before = await storedCounts();
      const answer = await send(method, path, tech, JSON.stringify(payload), "application/json");
      const problem = expectClear4xx(answer, `${path} ${JSON.stringify(payload).slice(0, 80)}`);
      // The detail, or the field list beside it, names what was wrong.
      expect(`${problem.detail} ${JSON.stringify(problem.fields ?? {})}`).toMatch(detail);
      expect(await storedCounts()).toEqual(before);
    }
  }, 60_000);
});

describe("random query strings and path segments on the reads", () => {
  const lists = () => [
    "/api/v1/projects",
    `/api/v1/projects/${fx.projectId}/designs`,
    `/api/v1/designs/${fx.designId}/builds`,
    `/api/v1/builds/${fx.buildId}/runs`,
    `/api/v1/builds/${fx.buildId}/runs.csv`,
    `/api/v1/builds/${fx.buildId}/retune`,
  ];
  const queryKey = fc.constantFrom("cursor", "limit", "q", "verdict", "status", "from", "to", "kind", "topology", "series", "page", "sort", "__proto__");
  const queryValue = fc.oneof(hostileString, fc.integer().map(String), fc.constantFrom("-1", "0", "1e9", "201", "NaN", "2026-13-45", "9999-12-31T25:61:00Z", "pass", "fail", "none", "E12", "E999"));

  it("answers every generated query with 2xx or a clear 4xx", async () => {
    const viewer = await createApiPerson("viewer", "hostile-query");
    await fc.assert(
      fc.asyncProperty(fc.nat(lists().length - 1), fc.array(fc.tuple(queryKey, queryValue), { maxLength: 4 }), async (which, pairs) => {
        const path = lists()[which];
        const query = pairs.map(([k, v]) => `${safeEncode(k)}=${safeEncode(v)}`).join("&");
        const res = await request(appUrl()).get(`${path}?${query}`).set("authorization", `Bearer ${viewer.token}`).redirects(0);
        const answer = answerOf(res);
        const context = `GET ${path}?${query.slice(0, 200)}`;
        expectNot5xx(answer, context);
        if (answer.status >= 400) expectClear4xx(answer, context);
        else expect(answer.status, context).toBe(200);
      }),
      { seed: FUZZ_SEED, numRuns: 120, endOnFailure: true },
    );
    await expectHealthy();
  }, 120_000);

  it("answers path-like and random ids with a clear 404 or 400, never a file and never a 5xx", async () => {
    const viewer = await createApiPerson("viewer", "hostile-path");
    const routes = ["/api/v1/runs/{}", "/api/v1/runs/{}/capture", "/api/v1/runs/{}/plot", "/api/v1/runs/{}/results.json", "/api/v1/builds/{}", "/api/v1/builds/{}/runs", "/api/v1/designs/{}", "/api/v1/projects/{}", "/api/v1/builds/{}/follow"];
    // Only well-formed escapes: a malformed one (%ZZ, overlong %C0%AE) is refused by Next's router before any
    // route runs, with a plain 500 (it looks for a /400 page the App Router does not have).
    const named = ["..%2F..%2Fetc%2Fpasswd", "%2e%2e%2f%2e%2e%2fetc%2fpasswd", "%00", "%2500", "captures%2F2026%2F01%2Fx.csv", "a".repeat(4000), "'%20OR%20'1'%3D'1", UNKNOWN_ID, UNKNOWN_ID.toUpperCase(), `${UNKNOWN_ID}%00`, "%E2%80%AE", "%EF%BF%BD"];
    const segment = fc.oneof(
      fc.constantFrom(...named),
      fc.string({ minLength: 1, maxLength: 80 }).map(safeEncode),
      fc.string({ unit: "binary", minLength: 1, maxLength: 40 }).map(safeEncode),
    );
    await fc.assert(
      fc.asyncProperty(fc.nat(routes.length - 1), segment, async (which, seg) => {
        // "." and ".." are resolved by the client before they are sent; they name another route, not an id.
        fc.pre(!/^\.{1,2}$/.test(safeDecode(seg)));
        const path = routes[which].replace("{}", seg);
        const res = await request(appUrl()).get(path).set("authorization", `Bearer ${viewer.token}`).redirects(0);
        const answer = answerOf(res);
        expect([400, 404], `GET ${path.slice(0, 200)}: ${answer.status} ${answer.text.slice(0, 200)}`).toContain(answer.status);
        expectClear4xx(answer, `GET ${path.slice(0, 200)}`);
        expect(answer.text).not.toMatch(/root:.*:0:0:/);
      }),
      { seed: FUZZ_SEED, numRuns: 120, endOnFailure: true },
    );
    await expectHealthy();
  }, 120_000);
});
