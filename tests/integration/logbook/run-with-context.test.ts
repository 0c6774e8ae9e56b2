import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { getBuild } from "@/db/queries/builds";
import { listRunFlags, replaceRunFlags } from "@/db/queries/flags";
import { getRun, getRunWithContext } from "@/db/queries/runs";
import { getTweak } from "@/db/queries/tweaks";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { stopSender } from "@/lib/jobs/queue";
import { createBuild } from "@/lib/logbook/builds";
import { createDesign } from "@/lib/logbook/designs";
import { createProject } from "@/lib/logbook/projects";
import { logTweak } from "@/lib/logbook/tweaks";
import { completeUpload, requestUploadSlot } from "@/lib/logbook/uploads";
import { designInputSchema } from "@/lib/validations/design";
import { runMetadataSchema } from "@/lib/validations/run";
import { synthCaptureCsv } from "../../../scripts/lib/synth-capture";
import { scratchUser, useScratchStack, type ScratchStack } from "./scratch-stack";

// getRunWithContext reads a run's build names, flags and tweak in the one query the run's detail makes; it must give
// exactly what the separate queries give (flags and the tweak come through JSON, so their times must come back as Dates).
let stack: ScratchStack;
let engineer: CurrentUser;
let technician: CurrentUser;
let buildId: string;

beforeAll(async () => {
  stack = await useScratchStack("runctx");
  engineer = await scratchUser("engineer");
  technician = await scratchUser("technician");
  const project = await createProject({ user: engineer }, { name: "Context", purpose: "" });
  const design = await createDesign(
    { user: engineer },
    project.id,
    designInputSchema.parse({ name: "Tank", topology: "tank", parts: { L: { value: "10u" }, C: { value: "1n" } } }),
  );
  buildId = (await createBuild({ user: technician }, design.id, { label: "CTX-1", kind: "pcb", kindRevision: "" })).id;
});

afterAll(async () => {
  await stopSender();
  await closeDb();
  await stack?.drop();
});

async function register(tweakId?: string): Promise<string> {
  const body = Buffer.from(synthCaptureCsv({ frequencyHz: 1.59e6, sampleRateHz: 100e6, samples: 2000, amplitudeV: 1, noiseVrms: 0.001, seed: tweakId ? 2 : 1 }));
  const ticket = await requestUploadSlot({ user: technician }, { buildId, filename: "c.csv", sizeBytes: body.length, contentType: "text/csv" });
  expect((await fetch(ticket.url, { method: "PUT", headers: ticket.headers, body })).status).toBe(200);
  const outcome = await completeUpload({ user: technician }, ticket.slotId, runMetadataSchema.parse(tweakId ? { tweakId } : {}));
  if (outcome.kind !== "created") throw new Error("expected a new run");
  return outcome.run.id;
}

describe("getRunWithContext", () => {
  it("gives the run, its build's names, its flags in order with the acknowledgement and its tweak, as the separate queries do", async () => {
    const tweak = await logTweak({ user: technician }, buildId, { partRef: "C", toValue: "820p", note: "one step down" });
    const runId = await register(tweak.id);
    await replaceRunFlags(runId, buildId, [
      { rule: "frequency", measured: 1.6e6, limit: 1.59e6, margin: -1e4, unit: "Hz", message: "above the limit" },
      { rule: "harmonic-2", measured: -30.5, limit: -35, margin: -4.5, unit: "dBc", message: "second harmonic too high" },
    ]);
    await db()("flags").where({ run_id: runId, rule: "harmonic-2" }).update({ acknowledged_by: engineer.id, acknowledged_at: db().fn.now() });

    const found = await getRunWithContext(runId);
    expect(found).not.toBeNull();
    expect(found!.run).toEqual(await getRun(runId));
    const flags = await listRunFlags(runId);
    expect(flags.map((f) => f.rule)).toEqual(["frequency", "harmonic-2"]);
    expect(flags[1].acknowledgedAt).toBeInstanceOf(Date);
    expect(found!.flags).toEqual(flags);
    expect(found!.tweak).toEqual(await getTweak(tweak.id));
    const build = (await getBuild(buildId))!;
    expect(found!.build).toEqual({ id: build.id, label: build.label, designId: build.designId, designName: build.designName, projectId: build.projectId, projectName: build.projectName });
  });

  it("gives no flags and no tweak for a run without them, and null for an unknown run", async () => {
    const runId = await register();
    const found = await getRunWithContext(runId);
    expect(found?.flags).toEqual([]);
    expect(found?.tweak).toBeNull();
    expect(await getRunWithContext("00000000-0000-4000-8000-000000000000")).toBeNull();
  });
});
