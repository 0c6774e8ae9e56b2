import { Readable } from "node:stream";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { synthCaptureCsv } from "../../../scripts/lib/synth-capture";
import { scratchUser, useScratchStack, waitFor, type ScratchStack } from "../logbook/scratch-stack";

// The whole path with the real worker: a capture whose second harmonic breaks the spec is uploaded, the worker
// analyses it, stores its flags and e-mails the build's followers — once per rule until a capture passes it.
// Own scratch database and bucket (as the logbook's pipeline test), so only this file's worker takes these jobs.

let stack: ScratchStack;
let stopAll: () => Promise<void>;
let technician: CurrentUser;
let follower: CurrentUser;
let buildId: string;

const parts = { L: { value: "100u", tolerance: "5%" }, C1: { value: "2.2n", tolerance: "5%" }, C2: { value: "4.7n", tolerance: "5%" } };

// Predicted f0 for these parts ≈ 4.09e5 Hz (lib/oscillator); the spec below only limits harmonics, so the frequency is free.
function capture(seed: number, harmonicsDbc: number[]): string {
  return synthCaptureCsv({ frequencyHz: 410_000, sampleRateHz: 50e6, samples: 20_000, amplitudeV: 1.2, harmonicsDbc, noiseVrms: 0.002, seed });
}

beforeAll(async () => {
  stack = await useScratchStack("alerts");
  const { startAnalysisWorker } = await import("@/lib/jobs/worker");
  const { stopSender } = await import("@/lib/jobs/queue");
  const { closeDb } = await import("@/db/index");
  const { createProject } = await import("@/lib/logbook/projects");
  const { createDesign } = await import("@/lib/logbook/designs");
  const { createBuild } = await import("@/lib/logbook/builds");
  const { followProject } = await import("@/lib/logbook/review");
  const { designInputSchema } = await import("@/lib/validations/design");
  const worker = await startAnalysisWorker({ threads: 1 });
  stopAll = async () => {
    await worker.stop();
    await stopSender();
    await closeDb();
  };
  const engineer = await scratchUser("engineer");
  technician = await scratchUser("technician");
  follower = await scratchUser("viewer");
  const project = await createProject({ user: engineer }, { name: "Alert bench", purpose: "integration" });
  const design = await createDesign(
    { user: engineer },
    project.id,
    designInputSchema.parse({ name: "Colpitts 410k", topology: "colpitts", parts, spec: { maxHarmonicDbc: "-40" } }),
  );
  buildId = (await createBuild({ user: technician }, design.id, { label: "BB-alert", kind: "breadboard", kindRevision: "" })).id;
  await followProject(follower, { projectId: project.id }, { ip: null });
});

afterAll(async () => {
  await stopAll?.();
  await stack?.drop();
});

async function upload(csv: string, name: string): Promise<string> {
  const { uploadRunFromStream } = await import("@/lib/logbook/runs");
  const { runMetadataSchema } = await import("@/lib/validations/run");
  const outcome = await uploadRunFromStream(
    { user: technician },
    { buildId, filename: name, contentType: "text/csv", stream: Readable.from([Buffer.from(csv)]), meta: runMetadataSchema.parse({ probe: "10x" }) },
  );
  if (outcome.kind !== "created") throw new Error(`upload of ${name} was ${outcome.kind}`);
  return outcome.run.id;
}

async function runDone(runId: string) {
  const { getRun } = await import("@/db/queries/runs");
  return waitFor(`run ${runId} analysed`, async () => {
    const run = await getRun(runId);
    return run?.status === "done" ? run : run?.status === "failed" ? Promise.reject(new Error(run.error ?? "failed")) : undefined;
  });
}

async function mailCount(email: string): Promise<number> {
  const { listHeldMessages } = await import("@/lib/mail/outbox");
  return (await listHeldMessages({ to: email })).length;
}

async function alertRules(): Promise<string[]> {
  const { listAlertState } = await import("@/db/queries/alerts");
  return (await listAlertState(buildId)).map((a) => a.rule);
}

describe("alerts through the analysis worker", () => {
  it("a_failing_capture_emails_the_builder_and_project_follower_once_until_the_rule_passes", async () => {
    // H2 at −32 dBc against a −40 dBc limit: fails harmonic-2 by 8 dB.
    const first = await runDone(await upload(capture(1, [-32, -50]), "first.csv"));
    expect(first.verdict).toBe("fail");
    await waitFor("the first alert", async () => ((await mailCount(technician.email)) === 1 && (await mailCount(follower.email)) === 1 ? true : undefined));
    expect(await alertRules()).toEqual(["harmonic-2"]);
    const { listHeldMessages } = await import("@/lib/mail/outbox");
    const [mail] = await listHeldMessages({ to: technician.email });
    expect(mail.subject).toBe("Spec flag on BB-alert (Colpitts 410k): harmonic 2");
    expect(mail.text).toContain(`/runs/${first.id}`);

    // Still failing: nothing new. Then a clean capture (one job at a time on this worker, so once its pass has
    // cleared the rule the second run's alert step is certainly over).
    const second = await runDone(await upload(capture(2, [-33, -50]), "second.csv"));
    expect(second.verdict).toBe("fail");
    const third = await runDone(await upload(capture(3, [-55, -60]), "third.csv"));
    expect(third.verdict).toBe("pass");
    await waitFor("the rule to clear", async () => ((await alertRules()).length === 0 ? true : undefined));
    expect(await mailCount(technician.email)).toBe(1);
    expect(await mailCount(follower.email)).toBe(1);

    // Failing again after a pass: a new e-mail.
    await runDone(await upload(capture(4, [-30, -50]), "fourth.csv"));
    await waitFor("the second alert", async () => ((await mailCount(technician.email)) === 2 && (await mailCount(follower.email)) === 2 ? true : undefined));
  }, 120_000);
});
