import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { getRun } from "@/db/queries/runs";
import { createApiToken } from "@/lib/auth/api-tokens";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { stopSender } from "@/lib/jobs/queue";
import { createBuild } from "@/lib/logbook/builds";
import { createDesign } from "@/lib/logbook/designs";
import { createProject } from "@/lib/logbook/projects";
import { completeUpload, requestUploadSlot } from "@/lib/logbook/uploads";
import { designInputSchema } from "@/lib/validations/design";
import { runMetadataSchema } from "@/lib/validations/run";
import { synthCaptureCsv } from "../../../scripts/lib/synth-capture";
import { appUrl, startPostgres, stopPostgres } from "../../helpers/stack";
import { scratchUser, useScratchStack, waitFor, type ScratchStack } from "../logbook/scratch-stack";

// PostgreSQL stops while the app and the workers run, then comes back; nothing is restarted but the database.
// Two sides: the running app of `npm test` (APP_URL, its own database and worker) must answer cleanly during the
// outage and normally after; and a worker of this file's own (scratch database, short job timeout, a test hook
// that holds each job 3 s after the analysis) must lose neither the run it held nor the one still queued.
const root = path.resolve(import.meta.dirname, "../../..");
const design = designInputSchema.parse({ name: "Tank", topology: "tank", parts: { L: { value: "10u" }, C: { value: "1n" } } });
let app: { token: string; buildId: string };
let stack: ScratchStack;
let technician: CurrentUser;
let buildId: string;
let worker: ChildProcess;
let workerLog = "";

function capture(seed: number): string {
  return synthCaptureCsv({ frequencyHz: 1.59e6, sampleRateHz: 100e6, samples: 20_000, amplitudeV: 1, noiseVrms: 0.001, seed });
}

/** One technician, token and build in the running app's own database (before this file moves to a scratch one). */
async function appFixtures(): Promise<{ token: string; buildId: string }> {
  const engineer = await scratchUser("engineer");
  const tech = await scratchUser("technician");
  const project = await createProject({ user: engineer }, { name: `PG restart ${Date.now()}`, purpose: "" });
  const d = await createDesign({ user: engineer }, project.id, design);
  const build = await createBuild({ user: tech }, d.id, { label: "PG-APP", kind: "pcb", kindRevision: "" });
  const { token } = await createApiToken({ userId: tech.id, name: "fault test" });
  return { token, buildId: build.id };
}

/** A request to the running app that must answer within 10 s, outage or not. */
async function ask(pathname: string, init: RequestInit = {}): Promise<{ status: number; type: string; body: string; ms: number }> {
  const started = performance.now();
  const response = await fetch(`${appUrl()}${pathname}`, { ...init, signal: AbortSignal.timeout(10_000) });
  const body = await response.text();
  return { status: response.status, type: response.headers.get("content-type") ?? "", body, ms: performance.now() - started };
}

function uploadForm(csv: string, filename: string): FormData {
  const form = new FormData();
  form.set("file", new Blob([csv], { type: "text/csv" }), filename);
  return form;
}

async function register(csv: string, filename: string): Promise<string> {
  const body = Buffer.from(csv);
  const ticket = await requestUploadSlot({ user: technician }, { buildId, filename, sizeBytes: body.length, contentType: "text/csv" });
  expect((await fetch(ticket.url, { method: "PUT", headers: ticket.headers, body })).status).toBe(200);
  const outcome = await completeUpload({ user: technician }, ticket.slotId, runMetadataSchema.parse({}));
  if (outcome.kind !== "created") throw new Error("expected a new run");
  return outcome.run.id;
}

/** The run once it has the wanted status; a query that fails while connections are re-made counts as "not yet". */
function runWith(runId: string, wanted: (status: string) => boolean, timeoutMs: number) {
  return waitFor(`run ${runId}`, async () => {
    const run = await getRun(runId).catch(() => null);
    return run && wanted(run.status) ? run : undefined;
  }, timeoutMs);
}

beforeAll(async () => {
  app = await appFixtures();
  await closeDb();
  stack = await useScratchStack("pgdown");
  const engineer = await scratchUser("engineer");
  technician = await scratchUser("technician");
  const project = await createProject({ user: engineer }, { name: "PG restart", purpose: "" });
  const d = await createDesign({ user: engineer }, project.id, design);
  buildId = (await createBuild({ user: technician }, d.id, { label: "PG-1", kind: "pcb", kindRevision: "" })).id;
});

afterAll(async () => {
  startPostgres();
  if (worker && worker.exitCode === null && worker.signalCode === null) worker.kill("SIGKILL");
  await stopSender();
  await closeDb();
  await stack?.drop();
});

describe("PostgreSQL restarted while the app runs", () => {
  it("answers_cleanly_during_the_outage_recovers_without_a_restart_and_loses_no_queued_analysis", async () => {
    expect((await ask(`/api/v1/builds/${app.buildId}/runs`, { headers: { authorization: `Bearer ${app.token}` } })).status).toBe(200);

    const held = await register(capture(21), "held.csv");
    const queued = await register(capture(22), "queued.csv");
    worker = spawn(process.execPath, ["--import", "tsx", "scripts/worker.ts"], {
      cwd: root,
      env: { ...process.env, NODE_ENV: "test", ANALYSIS_THREADS: "1", TANKBOOK_TEST_ANALYSIS_DELAY_MS: "3000" },
      stdio: ["ignore", "pipe", "pipe"],
    });
    worker.stdout?.on("data", (c: Buffer) => (workerLog += c.toString()));
    worker.stderr?.on("data", (c: Buffer) => (workerLog += c.toString()));
    // The worker takes one run and holds it; the other waits in the queue behind it.
    await runWith(held, (s) => s === "running", 30_000);
    expect((await getRun(queued))?.status).toBe("queued");

    stopPostgres();
    try {
      const health = await ask("/api/health");
      expect(health.status).toBe(503);
      expect(JSON.parse(health.body)).toMatchObject({ ok: false, db: expect.stringMatching(/PostgreSQL is not answering/), storage: "ok" });
      const list = await ask(`/api/v1/builds/${app.buildId}/runs`, { headers: { authorization: `Bearer ${app.token}` } });
      expect(list.status).toBe(503);
      expect(list.type).toBe("application/problem+json");
      expect(JSON.parse(list.body).detail).toMatch(/database is not answering/);
      const upload = await ask(`/api/v1/builds/${app.buildId}/runs`, {
        method: "POST",
        headers: { authorization: `Bearer ${app.token}` },
        body: uploadForm(capture(23), "during-outage.csv"),
      });
      expect(upload.status).toBe(503);
      expect(upload.type).toBe("application/problem+json");
      // Past the worker's 3 s hold, so it tries to store the held run's result while the database is gone.
      await new Promise((r) => setTimeout(r, 3500));
      expect(worker.exitCode, workerLog).toBeNull();
    } finally {
      startPostgres();
    }

    // The same app process, its pools re-made: a few requests may still meet a dropped connection.
    const back = await waitFor("the app to answer again", async () => {
      const r = await ask(`/api/v1/builds/${app.buildId}/runs`, { headers: { authorization: `Bearer ${app.token}` } });
      return r.status === 200 ? r : undefined;
    }, 20_000, 250);
    expect(JSON.parse(back.body).items).toEqual([]);
    expect((await ask("/api/health")).status).toBe(200);

    // Neither run is lost: the held one's result write, refused during the outage, is retried with backoff and lands
    // once the database is back (unless its job timed out first and the queue's retry finished it); the queued one is
    // simply taken.
    const heldRun = await runWith(held, (s) => s === "done" || s === "failed", 45_000);
    const queuedRun = await runWith(queued, (s) => s === "done" || s === "failed", 45_000);
    expect(heldRun.status, workerLog).toBe("done");
    expect(workerLog).toMatch(new RegExp(`run ${held}: the database is not answering .*; retrying the result write in \\d+ ms`));
    expect(queuedRun.status, workerLog).toBe("done");
    expect(worker.exitCode, workerLog).toBeNull();

    // The app's own worker came through the outage too: an upload through the app is analysed.
    const created = await ask(`/api/v1/builds/${app.buildId}/runs`, {
      method: "POST",
      headers: { authorization: `Bearer ${app.token}` },
      body: uploadForm(capture(24), "after-outage.csv"),
    });
    expect(created.status, created.body).toBe(201);
    const { id } = JSON.parse(created.body) as { id: string };
    const analysed = await waitFor("the app's worker to analyse the upload", async () => {
      const r = await ask(`/api/v1/runs/${id}`, { headers: { authorization: `Bearer ${app.token}` } });
      const run = JSON.parse(r.body) as { status: string };
      return run.status === "done" || run.status === "failed" ? run : undefined;
    }, 30_000, 250);
    expect(analysed.status).toBe("done");

    worker.kill("SIGTERM");
    expect(await new Promise((resolve) => worker.once("exit", (code) => resolve(code)))).toBe(0);
  }, 150_000);
});
