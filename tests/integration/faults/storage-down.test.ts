import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { Readable } from "node:stream";
import { ListObjectsV2Command, S3Client } from "@aws-sdk/client-s3";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { getUploadSlot } from "@/db/queries/uploads";
import { getRun } from "@/db/queries/runs";
import { stateFromError } from "@/lib/auth/action-state";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { problemFromError } from "@/lib/http/problem";
import { stopSender } from "@/lib/jobs/queue";
import { startAnalysisWorker, type AnalysisWorker } from "@/lib/jobs/worker";
import { createBuild } from "@/lib/logbook/builds";
import { createDesign } from "@/lib/logbook/designs";
import { createProject } from "@/lib/logbook/projects";
import { uploadRunFromStream } from "@/lib/logbook/runs";
import { completeUpload, requestUploadSlot } from "@/lib/logbook/uploads";
import { checkStorage, headObject } from "@/lib/storage";
import { designInputSchema } from "@/lib/validations/design";
import { runMetadataSchema } from "@/lib/validations/run";
import { synthCaptureCsv } from "../../../scripts/lib/synth-capture";
import { scratchUser, useScratchStack, waitFor, type ScratchStack } from "../logbook/scratch-stack";
import { freePort, startFakeS3Process, type FakeS3Process } from "./fake-s3-process";

// Object storage dies while captures are on their way. This file runs its own fake S3 in a child process (a
// crash is SIGKILL, a return is a restart on the same port and folder) and points the in-process services at it.
let s3: FakeS3Process;
let s3Dir: string;
let stack: ScratchStack;
let worker: AnalysisWorker;
let technician: CurrentUser;
let buildId: string;
const previousEndpoint = process.env.S3_ENDPOINT;

function capture(seed: number, samples = 20_000): string {
  return synthCaptureCsv({ frequencyHz: 372_000, sampleRateHz: 50e6, samples, amplitudeV: 1.2, harmonicsDbc: [-40], noiseVrms: 0.002, seed });
}

/** A body that arrives in 256 KiB pieces, calling `afterBytes` once when that many have been handed out. */
function slowStream(body: Buffer, afterBytes: number, onThreshold: () => Promise<void>): Readable {
  let offset = 0;
  let fired = false;
  return new Readable({
    read() {
      if (offset >= body.length) return void this.push(null);
      const piece = body.subarray(offset, offset + 256 * 1024);
      offset += piece.length;
      if (!fired && offset >= afterBytes) {
        fired = true;
        void onThreshold().then(() => this.push(piece));
        return;
      }
      setTimeout(() => this.push(piece), 2);
    },
  });
}

async function storedKeys(): Promise<string[]> {
  const client = new S3Client({
    region: "us-east-1",
    endpoint: s3.endpoint,
    forcePathStyle: true,
    credentials: { accessKeyId: "S3RVER", secretAccessKey: "S3RVER" },
  });
  try {
    const listed = await client.send(new ListObjectsV2Command({ Bucket: stack.bucket }));
    return (listed.Contents ?? []).map((o) => o.Key!);
  } finally {
    client.destroy();
  }
}

async function runsOfBuild(): Promise<number> {
  const [{ n }] = await db()("runs").where({ build_id: buildId }).count<{ n: string }[]>({ n: "*" });
  return Number(n);
}

function expectClearStorageError(err: unknown) {
  const response = problemFromError(err);
  expect(response.status).toBe(503);
  expect(response.headers.get("content-type")).toBe("application/problem+json");
  expect(response.headers.get("retry-after")).toMatch(/^\d+$/);
  // The form path (server actions) shows the same plain sentence.
  expect(stateFromError(err).message).toMatch(/storage is not answering/i);
  return response.json() as Promise<{ detail: string; type: string }>;
}

beforeAll(async () => {
  s3Dir = await mkdtemp(path.join(os.tmpdir(), "tankbook-faults-s3-"));
  s3 = await startFakeS3Process(await freePort(), s3Dir, "faults-placeholder");
  // Before the scratch stack: it creates its bucket through lib/storage, which reads the endpoint once.
  process.env.S3_ENDPOINT = s3.endpoint;
  stack = await useScratchStack("storage");
  const engineer = await scratchUser("engineer");
  technician = await scratchUser("technician");
  worker = await startAnalysisWorker({ threads: 1 });
  const project = await createProject({ user: engineer }, { name: "Storage faults", purpose: "" });
  const design = await createDesign(
    { user: engineer },
    project.id,
    designInputSchema.parse({ name: "Colpitts", topology: "colpitts", parts: { L: { value: "100u" }, C1: { value: "2.2n" }, C2: { value: "4.7n" } } }),
  );
  buildId = (await createBuild({ user: technician }, design.id, { label: "S3-1", kind: "pcb", kindRevision: "" })).id;
});

afterAll(async () => {
  await worker?.stop();
  await stopSender();
  await closeDb();
  await stack?.drop();
  await s3?.stop();
  if (previousEndpoint === undefined) delete process.env.S3_ENDPOINT;
  else process.env.S3_ENDPOINT = previousEndpoint;
  await rm(s3Dir, { recursive: true, force: true });
});

describe("object storage down during an upload", () => {
  it("refuses_an_api_upload_with_a_clear_503_and_stores_no_run_or_idempotency_key", async () => {
    await s3.crash();
    expect(await checkStorage()).toMatchObject({ ok: false, error: expect.stringMatching(/unreachable/) });
    const err = await uploadRunFromStream(
      { user: technician },
      {
        buildId,
        filename: "down.csv",
        contentType: "text/csv",
        stream: Readable.from([Buffer.from(capture(1))]),
        meta: runMetadataSchema.parse({}),
        idempotencyKey: "storage-down-1",
      },
    ).then(
      () => null,
      (e: unknown) => e,
    );
    expect(err).not.toBeNull();
    const body = await expectClearStorageError(err);
    expect(body.detail).toMatch(/nothing was stored/i);
    expect(await runsOfBuild()).toBe(0);
    expect(await db()("api_idempotency_keys").where({ user_id: technician.id })).toHaveLength(0);
  });

  it("refuses_to_register_a_presigned_upload_while_storage_is_down_and_leaves_the_slot_open", async () => {
    const body = Buffer.from(capture(2));
    // Signing is local, so the slot is handed out; the browser's PUT is what fails.
    const ticket = await requestUploadSlot({ user: technician }, { buildId, filename: "slot.csv", sizeBytes: body.length, contentType: "text/csv" });
    await expect(fetch(ticket.url, { method: "PUT", headers: ticket.headers, body })).rejects.toThrow();
    const err = await completeUpload({ user: technician }, ticket.slotId, runMetadataSchema.parse({})).then(
      () => null,
      (e: unknown) => e,
    );
    await expectClearStorageError(err);
    expect(await getRun(ticket.runId)).toBeNull();
    // The slot stays for a retry (and the worker's sweep removes it once it expires).
    expect((await getUploadSlot(ticket.slotId))?.completedAt).toBeNull();
    expect(await runsOfBuild()).toBe(0);
  });

  it("leaves_no_run_and_no_object_when_storage_dies_half_way_through_a_multipart_upload", async () => {
    await s3.restart();
    // Over two 8 MiB parts, so the first part is in storage when it dies.
    const body = Buffer.from(capture(3, 700_000));
    expect(body.length).toBeGreaterThan(12 * 1024 * 1024);
    const stream = slowStream(body, 10 * 1024 * 1024, () => s3.crash());
    const err = await uploadRunFromStream(
      { user: technician },
      { buildId, filename: "half.csv", contentType: "text/csv", stream, meta: runMetadataSchema.parse({}) },
    ).then(
      () => null,
      (e: unknown) => e,
    );
    await expectClearStorageError(err);
    expect(await runsOfBuild()).toBe(0);
    await s3.restart();
    expect(await storedKeys()).toEqual([]);
  }, 60_000);

  it("takes_the_same_upload_once_storage_is_back_and_analyses_it", async () => {
    expect(await checkStorage()).toEqual({ ok: true });
    const csv = capture(4);
    const outcome = await uploadRunFromStream(
      { user: technician },
      {
        buildId,
        filename: "back.csv",
        contentType: "text/csv",
        stream: Readable.from([Buffer.from(csv)]),
        meta: runMetadataSchema.parse({}),
        idempotencyKey: "storage-down-1",
      },
    );
    expect(outcome.kind).toBe("created");
    if (outcome.kind !== "created") return;
    const run = await waitFor("the run to be analysed", async () => {
      const r = await getRun(outcome.run.id);
      return r && (r.status === "done" || r.status === "failed") ? r : undefined;
    });
    expect(run.status).toBe("done");
    expect(run.measuredHz! / 372_000 - 1).toBeLessThan(1e-6);
    expect(await headObject(run.objectKey)).toMatchObject({ sizeBytes: Buffer.byteLength(csv) });
    expect(await storedKeys()).toEqual([run.objectKey]);
    expect(await runsOfBuild()).toBe(1);
  });
});
