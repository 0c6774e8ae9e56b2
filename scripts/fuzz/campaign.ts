// The fuzz campaign against a running Tankbook (the test stack that `npm test` and `npm run fuzz` start):
// seeded inputs of six classes (lib: ./inputs.ts) sent one at a time by signed-in callers of every role (API
// tokens, and session cookies from a real sign-in) and by nobody. After every input it checks the contract:
// no 5xx; a refusal under /api is problem+json; a refusal stored nothing (row counts per table and the objects
// in the bucket, compared with the snapshot taken after the previous input). /api/health is asked every
// 250 ms throughout and its p95 reported. It never stops at the first failure: every broken answer is listed
// with the input that caused it, so one run tells everything.
import { generateIdFromEntropySize } from "lucia";
import { readdir } from "node:fs/promises";
import http from "node:http";
import path from "node:path";
import { db } from "../../db/index";
import { createUser } from "../../db/queries/users";
import { createApiToken } from "../../lib/auth/api-tokens";
import { hashPassword } from "../../lib/auth/password";
import { env } from "../../lib/env";
import { closeStorage, listObjectKeys } from "../../lib/storage";
import { synthCaptureCsv } from "../lib/synth-capture";
import { INPUT_CLASSES, inputAt, type CallerRef, type FixtureIds, type FuzzInput, type InputClass, type Role } from "./inputs";
import { Random } from "./random";

/** The seed of `npm run fuzz` and of the slice in `npm test` unless FUZZ_SEED says otherwise. */
export const DEFAULT_SEED = 20_261_204;

/** Tables a request writes while it is answered; a refusal must leave every count as it was. */
export const WATCHED_TABLES = [
  "auth_user", "user_session", "api_tokens", "invitations", "projects", "designs", "design_revisions", "builds", "build_photos", "tweaks",
  "runs", "upload_slots", "follows", "api_idempotency_keys",
] as const;

export type Snapshot = Record<(typeof WATCHED_TABLES)[number] | "objects", number>;

const ROLES: Role[] = ["viewer", "technician", "engineer", "admin"];
/** Accounts per role, used in turn, so the write limit per account and minute (600) is never what answers. */
const ACCOUNTS_PER_ROLE = 4;
const FUZZ_PASSWORD = "fuzz campaign passphrase 2026";

interface Account {
  id: string;
  email: string;
  token: string;
  cookie: string;
}

export interface Fixture {
  ids: FixtureIds;
  accounts: Record<Role, Account[]>;
}

export interface Failure {
  index: number;
  class: InputClass;
  input: string;
  status: number;
  answer: string;
  why: string;
}

export interface CampaignReport {
  seed: number;
  inputs: number;
  durationMs: number;
  /** class → status → count ("0" is no answer). */
  statuses: Record<InputClass, Record<string, number>>;
  perClass: Record<InputClass, number>;
  refused: number;
  accepted: number;
  serverErrors: Failure[];
  noAnswer: Failure[];
  notProblemJson: Failure[];
  storedOnRefusal: Failure[];
  /** Refusals whose storage check could not run (the snapshot after them failed five tries in a row). */
  uncheckedRefusals: Failure[];
  health: { samples: number; failures: number; p50Ms: number; p95Ms: number; maxMs: number };
  /** At the end: the objects as the S3 API lists them and as the per-input check counted them; they must agree. */
  objects: { listed: number | null; counted: number | null };
}

const agent = new http.Agent({ keepAlive: true, maxSockets: 2 });

interface Answer {
  status: number;
  contentType: string;
  body: string;
  headers: http.IncomingHttpHeaders;
}

/** One request with node:http, which sends any header value without CR/LF and any path of printable bytes. */
function send(baseUrl: string, method: string, path: string, headers: Record<string, string>, body?: Buffer, timeoutMs = 30_000): Promise<Answer> {
  const url = new URL(baseUrl);
  return new Promise((resolve) => {
    let settled = false;
    const finish = (a: Answer) => {
      if (!settled) {
        settled = true;
        resolve(a);
      }
    };
    let req: http.ClientRequest;
    try {
      req = http.request({ host: url.hostname, port: url.port, method, path, headers: { ...headers, ...(body ? { "content-length": String(body.length) } : {}) }, agent, timeout: timeoutMs }, (res) => {
        const chunks: Buffer[] = [];
        let kept = 0;
        res.on("data", (c: Buffer) => {
          // Keep the start of the answer only: a CSV export or a capture can be large.
          if (kept < 64 * 1024) {
            chunks.push(c);
            kept += c.length;
          }
        });
        res.on("end", () => finish({ status: res.statusCode ?? 0, contentType: String(res.headers["content-type"] ?? ""), body: Buffer.concat(chunks).toString("utf8"), headers: res.headers }));
        res.on("error", () => finish({ status: res.statusCode ?? 0, contentType: String(res.headers["content-type"] ?? ""), body: Buffer.concat(chunks).toString("utf8"), headers: res.headers }));
      });
    } catch (err) {
      // node:http refused to send it (a header it will not write): not an answer from the server.
      return finish({ status: -1, contentType: "", body: err instanceof Error ? err.message : String(err), headers: {} });
    }
    req.on("timeout", () => req.destroy(new Error(`no answer within ${timeoutMs} ms`)));
    req.on("error", (err) => finish({ status: 0, contentType: "", body: err.message, headers: {} }));
    req.end(body);
  });
}

async function json(baseUrl: string, method: string, path: string, token: string, payload: unknown): Promise<{ status: number; body: Record<string, unknown> }> {
  const a = await send(baseUrl, method, path, { authorization: `Bearer ${token}`, "content-type": "application/json" }, Buffer.from(JSON.stringify(payload)));
  return { status: a.status, body: a.body ? JSON.parse(a.body) : {} };
}

function expectStatus(what: string, got: { status: number; body: unknown }, want: number): void {
  if (got.status !== want) throw new Error(`fuzz fixture: ${what} answered ${got.status}: ${JSON.stringify(got.body).slice(0, 300)}`);
}

/**
 * Accounts of every role (made in the database, as an admin would invite them), each signed in over
 * POST /api/v1/session for a session cookie and given an API token; then a project, design, build, tweak and an
 * analysed run made through the API, so generated requests reach real rows as well as unknown ones.
 */
export async function createFixture(baseUrl: string, label = "fuzz"): Promise<Fixture> {
  const passwordHash = await hashPassword(FUZZ_PASSWORD);
  const accounts = {} as Record<Role, Account[]>;
  let n = 0;
  for (const role of ROLES) {
    accounts[role] = [];
    for (let i = 0; i < ACCOUNTS_PER_ROLE; i++) {
      const email = `${label}-${role}-${i}-${generateIdFromEntropySize(5)}@fuzz.test`;
      const user = await createUser({ id: generateIdFromEntropySize(10), email, name: `Fuzz ${role} ${i}`, role, passwordHash });
      const { token } = await createApiToken({ userId: user.id, name: `fuzz campaign ${role} ${i}` });
      // A sign-in from its own documentation address (RFC 5737), so the per-address limit never answers.
      n += 1;
      const signIn = await send(baseUrl, "POST", "/api/v1/session", { "content-type": "application/json", "x-forwarded-for": `192.0.2.${n}` }, Buffer.from(JSON.stringify({ email, password: FUZZ_PASSWORD })));
      if (signIn.status !== 201) throw new Error(`fuzz fixture: sign-in of ${email} answered ${signIn.status}: ${signIn.body.slice(0, 200)}`);
      const cookie = ([] as string[]).concat(signIn.headers["set-cookie"] ?? []).map((c) => c.split(";")[0]).find((c) => /=./.test(c));
      if (!cookie) throw new Error("fuzz fixture: the sign-in set no session cookie");
      accounts[role].push({ id: user.id, email, token, cookie });
    }
  }
  const engineer = accounts.engineer[0].token;
  const technician = accounts.technician[0].token;
  const project = await json(baseUrl, "POST", "/api/v1/projects", engineer, { name: `${label} project ${generateIdFromEntropySize(5)}`, purpose: "fuzz campaign" });
  expectStatus("project", project, 201);
  const design = await json(baseUrl, "POST", `/api/v1/projects/${project.body.id}/designs`, engineer, {
    name: "Colpitts 411k",
    topology: "colpitts",
    parts: { L: { value: "100u", tolerance: "5%" }, C1: { value: "2.2n", tolerance: "5%", tempco: "C0G" }, C2: { value: "4.7n", tolerance: "5%", tempco: "C0G" } },
    spec: { targetHz: "411k", toleranceValue: 2, toleranceUnit: "percent", maxHarmonicDbc: -30, maxThdPercent: 5 },
  });
  expectStatus("design", design, 201);
  const build = await json(baseUrl, "POST", `/api/v1/designs/${design.body.id}/builds`, technician, { label: `${label} BB ${generateIdFromEntropySize(5)}`, kind: "breadboard" });
  expectStatus("build", build, 201);
  const tweak = await json(baseUrl, "POST", `/api/v1/builds/${build.body.id}/tweaks`, technician, { partRef: "C1", toValue: "2.7n", note: "fuzz fixture", planned: true });
  expectStatus("tweak", tweak, 201);
  const boundary = "----fuzzfixture";
  const csv = synthCaptureCsv({ frequencyHz: 405e3, sampleRateHz: 20e6, samples: 4096, amplitudeV: 1, noiseVrms: 0.001, seed: 4242 });
  const upload = await send(
    baseUrl,
    "POST",
    `/api/v1/builds/${build.body.id}/runs`,
    { authorization: `Bearer ${technician}`, "content-type": `multipart/form-data; boundary=${boundary}` },
    Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="fixture.csv"\r\nContent-Type: text/csv\r\n\r\n${csv}\r\n--${boundary}--\r\n`),
  );
  if (upload.status !== 201) throw new Error(`fuzz fixture: upload answered ${upload.status}: ${upload.body.slice(0, 300)}`);
  return {
    ids: { projectId: String(project.body.id), designId: String(design.body.id), buildId: String(build.body.id), runId: String(JSON.parse(upload.body).id), tweakId: String(tweak.body.id) },
    accounts,
  };
}

/** Every object in the bucket, counted through the S3 API (a listing, page by page). */
export async function listedObjectCount(): Promise<number> {
  return (await listObjectKeys()).length;
}

// s3rver keeps each object as "<key>._S3rver_object" (beside its metadata) under <directory>/<bucket>.
const S3RVER_OBJECT_SUFFIX = "._S3rver_object";

/**
 * Every object in the bucket, counted from the fake S3's own folder when the test stack says where it is
 * (FAKE_S3_DIR). A listing through the API reads every object's metadata, so after a few thousand uploads it
 * took over a second and, done after every refusal, made the end of a 10,000-input campaign twenty times slower
 * than its start; counting the files takes milliseconds. The campaign checks once, at its end, that both counts agree.
 */
export async function objectCount(): Promise<number> {
  const dir = process.env.FAKE_S3_DIR;
  if (!dir) return listedObjectCount();
  const names = await readdir(path.join(dir, env().S3_BUCKET), { recursive: true });
  return names.filter((n) => n.endsWith(S3RVER_OBJECT_SUFFIX)).length;
}

/** Row counts of the watched tables (one query) and the number of objects in the bucket. */
export async function snapshot(): Promise<Snapshot> {
  const select = WATCHED_TABLES.map((t) => `(select count(*) from ${t})::int as ${t}`).join(", ");
  const [rows, objects] = await Promise.all([db().raw(`select ${select}`), objectCount()]);
  return { ...(rows.rows[0] as Record<(typeof WATCHED_TABLES)[number], number>), objects };
}

/**
 * `read`, tried again when it throws: s3rver answers InternalError now and then when a file changes under it
 * mid-listing, and a counted folder can lose a file between readdir and the count. Null when all tries failed.
 */
async function withRetries<T>(read: () => Promise<T>, tries = 5): Promise<T | null> {
  for (let attempt = 0; attempt < tries; attempt++) {
    try {
      return await read();
    } catch {
      await new Promise((r) => setTimeout(r, 250 * (attempt + 1)));
    }
  }
  return null;
}

/** A snapshot, or null when it could not be taken, so one flaky listing cannot end the campaign. */
const trySnapshot = (): Promise<Snapshot | null> => withRetries(snapshot);

function differences(before: Snapshot, after: Snapshot): string {
  return (Object.keys(after) as (keyof Snapshot)[])
    .filter((k) => after[k] !== before[k])
    .map((k) => `${k} ${before[k]} → ${after[k]}`)
    .join(", ");
}

export function closeCampaignClients(): void {
  closeStorage();
  agent.destroy();
}

function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return Number.NaN;
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
}

/** GET /api/health every `everyMs` on its own connection until stopped. */
function watchHealth(baseUrl: string, everyMs: number): { stop: () => Promise<CampaignReport["health"]> } {
  const times: number[] = [];
  let failures = 0;
  let running = true;
  const healthAgent = new http.Agent({ keepAlive: true, maxSockets: 1 });
  const loop = (async () => {
    while (running) {
      const started = performance.now();
      const a = await new Promise<number>((resolve) => {
        const req = http.get(`${baseUrl}/api/health`, { agent: healthAgent, timeout: 10_000 }, (res) => {
          res.resume();
          res.on("end", () => resolve(res.statusCode ?? 0));
        });
        req.on("timeout", () => req.destroy());
        req.on("error", () => resolve(0));
      });
      times.push(performance.now() - started);
      if (a !== 200) failures += 1;
      await new Promise((r) => setTimeout(r, everyMs));
    }
  })();
  return {
    stop: async () => {
      running = false;
      await loop;
      healthAgent.destroy();
      const sorted = [...times].sort((x, y) => x - y);
      return { samples: times.length, failures, p50Ms: percentile(sorted, 50), p95Ms: percentile(sorted, 95), maxMs: sorted.at(-1) ?? Number.NaN };
    },
  };
}

/** The headers that make `caller` who it is; cookie callers send the app's own Origin, as a browser does. */
function callerHeaders(baseUrl: string, fx: Fixture, who: CallerRef, turn: number): Record<string, string> {
  if (who.auth === "none") return {};
  const accounts = fx.accounts[who.role];
  const account = accounts[turn % accounts.length];
  return who.auth === "token" ? { authorization: `Bearer ${account.token}` } : { cookie: account.cookie, origin: new URL(baseUrl).origin };
}

function failure(input: FuzzInput, answer: Answer, why: string): Failure {
  return { index: input.index, class: input.class, input: input.summary, status: answer.status, answer: answer.body.slice(0, 300), why };
}

export interface CampaignOptions {
  baseUrl: string;
  seed: number;
  inputs: number;
  fixture: Fixture;
  /** Called every `progressEvery` inputs with a one-line progress note. */
  progress?: (line: string) => void;
  progressEvery?: number;
}

/** Runs the campaign and returns every figure and every broken answer; it never throws for a broken answer. */
export async function runCampaign(options: CampaignOptions): Promise<CampaignReport> {
  const { baseUrl, seed, fixture } = options;
  const random = new Random(seed);
  const statuses = Object.fromEntries(INPUT_CLASSES.map((c) => [c, {}])) as CampaignReport["statuses"];
  const perClass = Object.fromEntries(INPUT_CLASSES.map((c) => [c, 0])) as Record<InputClass, number>;
  const report: Omit<CampaignReport, "durationMs" | "health" | "objects"> = { seed, inputs: options.inputs, statuses, perClass, refused: 0, accepted: 0, serverErrors: [], noAnswer: [], notProblemJson: [], storedOnRefusal: [], uncheckedRefusals: [] };
  const started = performance.now();
  const health = watchHealth(baseUrl, 250);
  let before: Snapshot | null = await snapshot();
  let healthFigures: CampaignReport["health"];
  try {
    for (let index = 0; index < options.inputs; index++) {
      // Each input draws from its own stream, so a change to one class's generator leaves the others' inputs alone.
      const input = inputAt(random.fork(), fixture.ids, index);
      // The client address is a documentation address per input (TRUST_PROXY trusts the test client), so the
      // per-address sign-in limit answers for the input that earned it, not for the whole campaign.
      const forwarded = { "x-forwarded-for": `198.18.${(index >> 8) & 255}.${index & 255}` };
      const headers = { ...forwarded, ...callerHeaders(baseUrl, fixture, input.caller, index), ...input.headers };
      const answer = await send(baseUrl, input.method, input.path, headers, input.body);
      perClass[input.class] += 1;
      statuses[input.class][String(answer.status)] = (statuses[input.class][String(answer.status)] ?? 0) + 1;
      if (answer.status === -1) continue; // never sent (see send); counted under "-1"
      if (answer.status === 0) report.noAnswer.push(failure(input, answer, "no answer"));
      else if (answer.status >= 500) report.serverErrors.push(failure(input, answer, "5xx"));
      const refused = answer.status >= 400 || answer.status === 0;
      if (refused) {
        report.refused += 1;
        const isApi = input.path.startsWith("/api/");
        if (isApi && answer.status >= 400 && answer.status < 500 && !/^application\/problem\+json/.test(answer.contentType)) {
          report.notProblemJson.push(failure(input, answer, `content-type ${answer.contentType || "none"}`));
        }
        const after = await trySnapshot();
        if (!after) {
          report.uncheckedRefusals.push(failure(input, answer, "the snapshot after it could not be taken"));
        } else {
          const changed = before ? differences(before, after) : "";
          if (changed) report.storedOnRefusal.push(failure(input, answer, changed));
          // Without a snapshot before it, this refusal could not be checked either.
          if (!before) report.uncheckedRefusals.push(failure(input, answer, "no snapshot before it"));
        }
        before = after;
      } else {
        report.accepted += 1;
        before = await trySnapshot();
      }
      if (options.progress && options.progressEvery && (index + 1) % options.progressEvery === 0) {
        options.progress(`${index + 1}/${options.inputs} inputs, ${report.serverErrors.length} 5xx, ${report.storedOnRefusal.length} refusals that stored, ${((performance.now() - started) / 1000).toFixed(0)} s`);
      }
    }
  } finally {
    // The report is only complete with the health figures, so they are gathered even when a snapshot throws.
    healthFigures = await health.stop();
  }
  const durationMs = performance.now() - started;
  // Analyses still running only read the bucket, so counting one way after the other compares like with like.
  const listed = await withRetries(listedObjectCount, 10);
  const counted = await withRetries(objectCount, 10);
  return { ...report, durationMs, health: healthFigures, objects: { listed, counted } };
}

/** The report as printed: counts per class and status, the contract's figures, and every broken answer. */
export function formatReport(r: CampaignReport): string {
  const allStatuses = [...new Set(INPUT_CLASSES.flatMap((c) => Object.keys(r.statuses[c])))].sort((a, b) => Number(a) - Number(b));
  const pad = (s: string | number, n: number) => String(s).padStart(n);
  const lines = [
    `fuzz campaign: seed ${r.seed}, ${r.inputs} inputs in ${(r.durationMs / 1000).toFixed(1)} s (${r.accepted} accepted, ${r.refused} refused)`,
    `${"class".padEnd(10)}${pad("inputs", 8)}${allStatuses.map((s) => pad(s, 6)).join("")}`,
    ...INPUT_CLASSES.map((c) => `${c.padEnd(10)}${pad(r.perClass[c], 8)}${allStatuses.map((s) => pad(r.statuses[c][s] ?? 0, 6)).join("")}`),
    `5xx answers: ${r.serverErrors.length}; no answer: ${r.noAnswer.length}; /api refusals not problem+json: ${r.notProblemJson.length}; refusals that stored something: ${r.storedOnRefusal.length}; refusals left unchecked (no snapshot): ${r.uncheckedRefusals.length}`,
    `objects at the end: ${r.objects.listed ?? "(the listing failed)"} listed through the S3 API, ${r.objects.counted ?? "(the count failed)"} counted by the per-input check`,
    `/api/health during the campaign: ${r.health.samples} checks, ${r.health.failures} failed, p50 ${r.health.p50Ms.toFixed(1)} ms, p95 ${r.health.p95Ms.toFixed(1)} ms, max ${r.health.maxMs.toFixed(1)} ms`,
  ];
  for (const [title, list] of [["5xx", r.serverErrors], ["no answer", r.noAnswer], ["not problem+json", r.notProblemJson], ["stored on refusal", r.storedOnRefusal], ["unchecked", r.uncheckedRefusals]] as const) {
    for (const f of list.slice(0, 50)) lines.push(`  ${title} #${f.index} [${f.class}] ${f.status} ${f.why}: ${f.input} → ${f.answer.replace(/\s+/g, " ").slice(0, 200)}`);
    if (list.length > 50) lines.push(`  … and ${list.length - 50} more ${title}`);
  }
  return lines.join("\n");
}
