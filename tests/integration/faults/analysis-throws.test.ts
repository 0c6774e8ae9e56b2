import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { getRun } from "@/db/queries/runs";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { stopSender } from "@/lib/jobs/queue";
import { startAnalysisWorker, type AnalysisWorker } from "@/lib/jobs/worker";
import { createBuild } from "@/lib/logbook/builds";
import { createDesign } from "@/lib/logbook/designs";
import { createProject } from "@/lib/logbook/projects";
import { completeUpload, requestUploadSlot } from "@/lib/logbook/uploads";
import { designInputSchema } from "@/lib/validations/design";
import { runMetadataSchema } from "@/lib/validations/run";
import { synthCaptureCsv } from "../../../scripts/lib/synth-capture";
import { scratchUser, useScratchStack, waitFor, type ScratchStack } from "../logbook/scratch-stack";

// Two runs that cannot be analysed, queued between good ones, on one thread. One is a capture the importer
// refuses (a time column stepping by 1e-310 s, a subnormal double whose sample rate would overflow to Infinity);
// the other makes the engine itself throw (not a CSV import error): its stored probe attenuation is 0.5, which
// upload validation never writes but the engine refuses with a RangeError. Each run must end failed with its
// message, without retries (a pure computation throws the same again), and the runs queued beside them must be
// analysed as usual.
let stack: ScratchStack;
let worker: AnalysisWorker;
let technician: CurrentUser;
let buildId: string;

function subnormalTimeStepCsv(): string {
  const rows = Array.from({ length: 4096 }, (_, i) => `${(i * 1e-310).toExponential(6)},${Math.sin(i / 5).toFixed(6)}`);
  return `Time (s),Out (V)\n${rows.join("\n")}\n`;
}

function goodCsv(seed: number): string {
  return synthCaptureCsv({ frequencyHz: 1.59e6, sampleRateHz: 100e6, samples: 20_000, amplitudeV: 1, noiseVrms: 0.001, seed });
}

async function register(csv: string, filename: string): Promise<string> {
  const body = Buffer.from(csv);
  const ticket = await requestUploadSlot({ user: technician }, { buildId, filename, sizeBytes: body.length, contentType: "text/csv" });
  expect((await fetch(ticket.url, { method: "PUT", headers: ticket.headers, body })).status).toBe(200);
  const outcome = await completeUpload({ user: technician }, ticket.slotId, runMetadataSchema.parse({}));
  if (outcome.kind !== "created") throw new Error("expected a new run");
  return outcome.run.id;
}

function finished(runId: string) {
  return waitFor(`run ${runId} to finish`, async () => {
    const run = await getRun(runId);
    return run && (run.status === "done" || run.status === "failed") ? run : undefined;
  }, 45_000);
}

beforeAll(async () => {
  stack = await useScratchStack("throws");
  const engineer = await scratchUser("engineer");
  technician = await scratchUser("technician");
  const project = await createProject({ user: engineer }, { name: "Engine faults", purpose: "" });
  const design = await createDesign(
    { user: engineer },
    project.id,
    designInputSchema.parse({ name: "Tank", topology: "tank", parts: { L: { value: "10u" }, C: { value: "1n" } } }),
  );
  buildId = (await createBuild({ user: technician }, design.id, { label: "ENG-1", kind: "pcb", kindRevision: "" })).id;
});

afterAll(async () => {
  await worker?.stop();
  await stopSender();
  await closeDb();
  await stack?.drop();
});

describe("a capture that makes the analysis throw", () => {
  it("ends_each_bad_run_failed_with_its_message_at_once_and_analyses_the_runs_around_them", async () => {
    // Queued before the worker starts, one thread: the bad capture sits between two good ones.
    const before = await register(goodCsv(5), "before.csv");
    const bad = await register(subnormalTimeStepCsv(), "subnormal-step.csv");
    const between = await register(goodCsv(7), "between.csv");
    const throws = await register(goodCsv(8), "engine-throws.csv");
    await db()("runs").where({ id: throws }).update({ probe_attenuation: 0.5 });
    const after = await register(goodCsv(6), "after.csv");
    worker = await startAnalysisWorker({ threads: 1 });

    const messages: Record<string, RegExp> = {
      [bad]: /^line 3: sample interval 1e-310 s is too small to give a finite sample rate$/,
      [throws]: /^The analysis engine could not handle this capture \(probe attenuation must be a finite number of at least 1, got 0\.5\)/,
    };
    for (const [id, message] of Object.entries(messages)) {
      const failed = await finished(id);
      expect(failed.status).toBe("failed");
      expect(failed.error).toMatch(message);
      expect(failed.results).toBeNull();
      expect(failed.verdict).toBeNull();
      // Not retried: the queue's backoff would only delay the same answer.
      expect(failed.attempts).toBe(1);
      expect(await db()("flags").where({ run_id: id })).toHaveLength(0);
    }

    for (const id of [before, between, after]) {
      const run = await finished(id);
      expect(run.status).toBe("done");
      expect(run.measuredHz! / 1.59e6 - 1).toBeLessThan(1e-6);
    }
  }, 60_000);
});
