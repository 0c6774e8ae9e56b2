// Shared by the /api/v1 tests: people and API tokens made through the accounts services, requests through
// supertest against the running app (APP_URL), problem+json and documented-shape checks, and capture CSVs.
import { randomBytes } from "node:crypto";
import { generateIdFromEntropySize } from "lucia";
import request, { type Response, type Test } from "supertest";
import { expect } from "vitest";
import type { z } from "zod";
import { createUser } from "@/db/queries/users";
import { createApiToken } from "@/lib/auth/api-tokens";
import { hashPassword } from "@/lib/auth/password";
import { roles, type Role } from "@/lib/auth/permissions";
import { synthCaptureCsv, type SynthCaptureOptions } from "../../../scripts/lib/synth-capture";
import { appUrl } from "../../helpers/stack";

export { appUrl, roles, type Role };

export const TEST_PASSWORD = "bench automation 2026";

export interface ApiPerson {
  id: string;
  email: string;
  name: string;
  role: Role;
  token: string;
}

/** A new account of `role` with an API token, made through the accounts services (never over HTTP). */
export async function createApiPerson(role: Role, label: string = role): Promise<ApiPerson> {
  const email = `${label}-${randomBytes(5).toString("hex")}@api-tests.test`;
  const user = await createUser({ id: generateIdFromEntropySize(10), email, name: `API ${label}`, role, passwordHash: await hashPassword(TEST_PASSWORD) });
  const { token } = await createApiToken({ userId: user.id, name: `api tests ${label}` });
  return { id: user.id, email, name: user.name, role, token };
}

/** One person per role, made in parallel. */
export async function createRoleTeam(label = "team"): Promise<Record<Role, ApiPerson>> {
  const people = await Promise.all(roles.map((role) => createApiPerson(role, `${label}-${role}`)));
  return Object.fromEntries(people.map((p) => [p.role, p])) as Record<Role, ApiPerson>;
}

type Method = "get" | "post" | "put" | "patch" | "delete";

/** A request with the person's token (or none for `null`). */
export function api(method: Method, path: string, who: { token: string } | null): Test {
  const req = request(appUrl())[method](path).redirects(0);
  if (who) req.set("authorization", `Bearer ${who.token}`);
  return req;
}

/** A JSON request with the person's token. */
export function sendJson(method: Method, path: string, who: { token: string } | null, body: unknown): Test {
  return api(method, path, who).set("content-type", "application/json").send(JSON.stringify(body));
}

/** Asserts an RFC 9457 problem response with `status`, and returns its body. */
export function expectProblem(res: Response, status: number): { type: string; title: string; status: number; detail: string; fields?: Record<string, string[]>; [k: string]: unknown } {
  expect(res.status, `${res.status} ${res.text.slice(0, 300)}`).toBe(status);
  expect(res.headers["content-type"]).toMatch(/^application\/problem\+json/);
  const body = JSON.parse(res.text);
  expect(body).toMatchObject({ status, title: expect.any(String), detail: expect.any(String), type: expect.stringMatching(/^https?:\/\//) });
  expect(body.detail.length).toBeGreaterThan(0);
  return body;
}

/**
 * Asserts a body has the documented shape: the lib/openapi schema parses it, and it has no field the document
 * does not name (at the top level). This is what keeps the document honest about responses.
 */
export function expectDocumented<S extends z.ZodObject>(schema: S, body: unknown): z.output<S> {
  const parsed = schema.safeParse(body);
  expect(parsed.success, parsed.success ? "" : JSON.stringify(parsed.error.issues.slice(0, 5), null, 1)).toBe(true);
  const documentedKeys = Object.keys(schema.shape).sort();
  const actualKeys = Object.keys(body as object).sort();
  expect(actualKeys.filter((k) => !documentedKeys.includes(k)), "fields the document does not name").toEqual([]);
  return parsed.data as z.output<S>;
}

/** Every key in a JSON value, at any depth (to check camelCase throughout). */
export function allKeys(value: unknown, out: string[] = []): string[] {
  if (Array.isArray(value)) value.forEach((v) => allKeys(v, out));
  else if (value && typeof value === "object") {
    for (const [k, v] of Object.entries(value)) {
      out.push(k);
      allKeys(v, out);
    }
  }
  return out;
}

/** A Colpitts around 370 kHz: L 100 µH, C1 2.2 nF, C2 4.7 nF (series 1.499 nF → 411 kHz ideal). */
export const COLPITTS_PARTS = {
  L: { value: "100u", tolerance: "5%" },
  C1: { value: "2.2n", tolerance: "5%", tempco: "C0G" },
  C2: { value: "4.7n", tolerance: "5%", tempco: "C0G" },
};

/** A capture CSV of a steady sine with a little distortion and noise (seeded). */
export function captureCsv(frequencyHz: number, seed: number, extra: Partial<SynthCaptureOptions> = {}): string {
  return synthCaptureCsv({
    frequencyHz,
    sampleRateHz: 50e6,
    samples: 20_000,
    amplitudeV: 1.2,
    harmonicsDbc: [-32, -45],
    noiseVrms: 0.002,
    seed,
    ...extra,
  });
}

/** Uploads a capture through the multipart route. */
export function uploadCapture(
  buildId: string,
  who: { token: string } | null,
  csv: string | Buffer,
  fields: Record<string, string> = {},
  options: { filename?: string; contentType?: string; idempotencyKey?: string } = {},
): Test {
  const req = api("post", `/api/v1/builds/${buildId}/runs`, who);
  if (options.idempotencyKey) req.set("idempotency-key", options.idempotencyKey);
  for (const [name, value] of Object.entries(fields)) req.field(name, value);
  return req.attach("file", Buffer.isBuffer(csv) ? csv : Buffer.from(csv, "utf8"), {
    filename: options.filename ?? "capture.csv",
    contentType: options.contentType ?? "text/csv",
  });
}

/** Polls GET /api/v1/runs/{id} until the run is done or failed (the worker analyses it). */
export async function waitForRun(runId: string, who: { token: string }, timeoutMs = 90_000): Promise<Record<string, unknown>> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const res = await api("get", `/api/v1/runs/${runId}`, who);
    expect(res.status, res.text.slice(0, 300)).toBe(200);
    if (res.body.status === "done" || res.body.status === "failed") return res.body;
    if (Date.now() > until) throw new Error(`run ${runId} still ${res.body.status} after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 300));
  }
}

/** A unique name for things that must be unique (project names, build labels). */
export function unique(label: string): string {
  return `${label} ${randomBytes(3).toString("hex")}`;
}

export interface Fixture {
  team: Record<Role, ApiPerson>;
  projectId: string;
  designId: string;
  buildId: string;
}

/**
 * A project, a Colpitts design with a spec (target 411 kHz ± 2 %, harmonics ≤ −30 dBc) and a build, made through
 * the API by the team's engineer and technician.
 */
export async function createFixture(label: string, team?: Record<Role, ApiPerson>): Promise<Fixture> {
  const people = team ?? (await createRoleTeam(label));
  const project = await sendJson("post", "/api/v1/projects", people.engineer, { name: unique(`${label} project`), purpose: "api tests" });
  expect(project.status, project.text).toBe(201);
  const design = await sendJson("post", `/api/v1/projects/${project.body.id}/designs`, people.engineer, {
    name: "Colpitts 411k",
    topology: "colpitts",
    parts: COLPITTS_PARTS,
    spec: { targetHz: "411k", toleranceValue: 2, toleranceUnit: "percent", maxHarmonicDbc: -30, maxThdPercent: 5 },
  });
  expect(design.status, design.text).toBe(201);
  const build = await sendJson("post", `/api/v1/designs/${design.body.id}/builds`, people.technician, { label: unique("BB"), kind: "breadboard" });
  expect(build.status, build.text).toBe(201);
  return { team: people, projectId: project.body.id, designId: design.body.id, buildId: build.body.id };
}

/** An id no row has. */
export const UNKNOWN_ID = "00000000-0000-4000-8000-000000000000";
