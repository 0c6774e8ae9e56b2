import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { getRun } from "@/db/queries/runs";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { ANALYSIS_QUEUE, QUEUE_SCHEMA, stopSender } from "@/lib/jobs/queue";
import { createBuild } from "@/lib/logbook/builds";
import { createDesign } from "@/lib/logbook/designs";
import { createProject } from "@/lib/logbook/projects";
import { completeUpload, requestUploadSlot } from "@/lib/logbook/uploads";
import { designInputSchema } from "@/lib/validations/design";
import { runMetadataSchema } from "@/lib/validations/run";
import { synthCaptureCsv } from "../../../scripts/lib/synth-capture";
import { scratchUser, useScratchStack, waitFor, type ScratchStack } from "./scratch-stack";

// The queue must survive a worker dying mid-job: a standalone worker (scripts/worker.ts) is killed with SIGKILL
// while it holds the job, a second one is started, and the job is retried and completed exactly once.
const root = path.resolve(import.meta.dirname, "../../..");
let stack: ScratchStack;
let technician: CurrentUser;
let buildId: string;
const children: ChildProcess[] = [];

function startWorker(extraEnv: Record<string, string>): ChildProcess {
  const child = spawn(process.execPath, ["--import", "tsx", "scripts/worker.ts"], {
    cwd: root,
    env: { ...process.env, NODE_ENV: "test", ...extraEnv },
    stdio: ["ignore", "pipe", "pipe"],
  });
  child.stdout?.resume();
  child.stderr?.resume();
  children.push(child);
  return child;
}

function exited(child: ChildProcess): Promise<number | null> {
  return child.exitCode !== null || child.signalCode !== null
    ? Promise.resolve(child.exitCode)
    : new Promise((resolve) => child.once("exit", (code) => resolve(code)));
}

beforeAll(async () => {
  stack = await useScratchStack("crash");
  const engineer = await scratchUser("engineer");
  technician = await scratchUser("technician");
  const project = await createProject({ user: engineer }, { name: "Crash bench", purpose: "" });
  const design = await createDesign(
    { user: engineer },
    project.id,
    designInputSchema.parse({ name: "Tank", topology: "tank", parts: { L: { value: "10u" }, C: { value: "1n" } } }),
  );
  buildId = (await createBuild({ user: technician }, design.id, { label: "PCB-A", kind: "pcb", kindRevision: "rev A" })).id;
});

afterAll(async () => {
  for (const child of children) if (child.exitCode === null && child.signalCode === null) child.kill("SIGKILL");
  await stopSender();
  await closeDb();
  await stack?.drop();
});

describe("analysis queue", () => {
  it("retries_a_job_whose_worker_was_killed_and_completes_it_once", async () => {
    const body = Buffer.from(synthCaptureCsv({ frequencyHz: 1.59e6, sampleRateHz: 100e6, samples: 20_000, amplitudeV: 1, noiseVrms: 0.001, seed: 3 }));
    const ticket = await requestUploadSlot({ user: technician }, { buildId, filename: "long.csv", sizeBytes: body.length, contentType: "text/csv" });
    expect((await fetch(ticket.url, { method: "PUT", headers: ticket.headers, body })).status).toBe(200);
    const outcome = await completeUpload({ user: technician }, ticket.slotId, runMetadataSchema.parse({}));
    if (outcome.kind !== "created") throw new Error("expected a new run");
    const runId = outcome.run.id;

    // The first worker holds every job for a minute (test hook), long past the 4 s job timeout set for this file.
    const first = startWorker({ TANKBOOK_TEST_ANALYSIS_DELAY_MS: "60000" });
    await waitFor("the first worker to claim the run", async () => ((await getRun(runId))?.status === "running" ? true : undefined));
    first.kill("SIGKILL");
    expect(await exited(first)).toBeNull();
    expect((await getRun(runId))?.status).toBe("running");

    const second = startWorker({});
    const done = await waitFor("the retry to finish the run", async () => {
      const run = await getRun(runId);
      return run?.status === "done" ? run : undefined;
    }, 45_000);
    expect(done.attempts).toBe(2);
    expect(done.measuredHz! / 1.59e6 - 1).toBeLessThan(1e-6);

    const jobs = await db()
      .withSchema(QUEUE_SCHEMA)
      .from("job")
      .where({ name: ANALYSIS_QUEUE, singleton_key: runId })
      .select("state", "retry_count");
    const archived = await db().withSchema(QUEUE_SCHEMA).from("archive").where({ name: ANALYSIS_QUEUE, singleton_key: runId }).select("state", "retry_count");
    const all = [...jobs, ...archived];
    // One job, retried once and completed: not lost, and not run to completion twice.
    expect(all).toHaveLength(1);
    await waitFor("the job to be marked completed", async () => {
      const row = await db().withSchema(QUEUE_SCHEMA).from("job").where({ name: ANALYSIS_QUEUE, singleton_key: runId }).first("state", "retry_count");
      return row?.state === "completed" ? row : undefined;
    });
    const row = await db().withSchema(QUEUE_SCHEMA).from("job").where({ name: ANALYSIS_QUEUE, singleton_key: runId }).first("retry_count");
    expect(row.retry_count).toBe(1);

    second.kill("SIGTERM");
    expect(await exited(second)).toBe(0);
  }, 90_000);
});
