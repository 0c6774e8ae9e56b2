import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { useApiTokenWith } from "@/db/queries/api-tokens";
import { buildDetailRead } from "@/db/queries/builds";
import { replaceRunFlags } from "@/db/queries/flags";
import { runJoinedRead } from "@/db/queries/joined-read";
import { getRunWithContext, listRuns, runsListRead, runWithContextRead } from "@/db/queries/runs";
import { createApiToken } from "@/lib/auth/api-tokens";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { hashSecretToken } from "@/lib/auth/secret-token";
import { stopSender } from "@/lib/jobs/queue";
import { createBuild, getBuildView } from "@/lib/logbook/builds";
import { createDesign } from "@/lib/logbook/designs";
import { createProject } from "@/lib/logbook/projects";
import { logTweak } from "@/lib/logbook/tweaks";
import { completeUpload, requestUploadSlot } from "@/lib/logbook/uploads";
import { designInputSchema } from "@/lib/validations/design";
import { runMetadataSchema } from "@/lib/validations/run";
import { synthCaptureCsv } from "../../../scripts/lib/synth-capture";
import { scratchUser, useScratchStack, type ScratchStack } from "../logbook/scratch-stack";

// The runs list, run detail and build detail API reads ride in the statement that looks up the caller's API token
// (db/queries/joined-read.ts): they must give exactly what the separate queries give, read nothing for a token that
// does not let anyone in, and cost one statement per request once the token's use of the minute is recorded.
let stack: ScratchStack;
let viewer: CurrentUser;
let technician: CurrentUser;
let tokenHash: string;
let buildId: string;
let emptyBuildId: string;
const runIds: string[] = [];

async function register(seed: number): Promise<string> {
  const body = Buffer.from(synthCaptureCsv({ frequencyHz: 1.59e6, sampleRateHz: 100e6, samples: 2000, amplitudeV: 1, noiseVrms: 0.001, seed }));
  const ticket = await requestUploadSlot({ user: technician }, { buildId, filename: `c${seed}.csv`, sizeBytes: body.length, contentType: "text/csv" });
  expect((await fetch(ticket.url, { method: "PUT", headers: ticket.headers, body })).status).toBe(200);
  const outcome = await completeUpload({ user: technician }, ticket.slotId, runMetadataSchema.parse({}));
  if (outcome.kind !== "created") throw new Error("expected a new run");
  return outcome.run.id;
}

/** How many statements `work` sends through the app's Knex pool. */
async function statements(work: () => Promise<unknown>): Promise<number> {
  let count = 0;
  const onQuery = () => count++;
  db().on("query", onQuery);
  try {
    await work();
  } finally {
    db().off("query", onQuery);
  }
  return count;
}

beforeAll(async () => {
  stack = await useScratchStack("joined");
  const engineer = await scratchUser("engineer");
  technician = await scratchUser("technician");
  viewer = await scratchUser("viewer");
  tokenHash = hashSecretToken((await createApiToken({ userId: viewer.id, name: "joined reads" })).token);
  const project = await createProject({ user: engineer }, { name: "Joined", purpose: "" });
  const design = await createDesign({ user: engineer }, project.id, designInputSchema.parse({ name: "Tank", topology: "tank", parts: { L: { value: "10u" }, C: { value: "1n" } } }));
  buildId = (await createBuild({ user: technician }, design.id, { label: "J-1", kind: "pcb", kindRevision: "" })).id;
  emptyBuildId = (await createBuild({ user: technician }, design.id, { label: "J-2", kind: "pcb", kindRevision: "" })).id;
  await logTweak({ user: technician }, buildId, { partRef: "C", toValue: "820p", note: "one step down" });
  for (let seed = 1; seed <= 5; seed++) runIds.push(await register(seed));
  await replaceRunFlags(runIds[0], buildId, [
    { rule: "frequency", measured: 1.6e6, limit: 1.59e6, margin: -1e4, unit: "Hz", message: "above the limit" },
    { rule: "harmonic-2", measured: -30.5, limit: -35, margin: -4.5, unit: "dBc", message: "second harmonic too high" },
  ]);
  await db()("flags").where({ run_id: runIds[0], rule: "harmonic-2" }).update({ acknowledged_by: engineer.id, acknowledged_at: db().fn.now() });
}, 60_000);

afterAll(async () => {
  await stopSender();
  await closeDb();
  await stack?.drop();
});

describe("reads joined to the API token lookup", () => {
  it("give the runs list page by page as listRuns does, with the owner, alone too", async () => {
    let cursor: string | null = null;
    let pages = 0;
    do {
      const filter = { limit: 2, cursor };
      const joined = await useApiTokenWith(tokenHash, runsListRead(buildId, filter));
      const page = await listRuns(buildId, filter);
      expect(joined?.user).toEqual(viewer);
      expect(joined?.data.page).toEqual(page);
      expect(joined?.data.buildExists).toBe(true);
      expect((await runJoinedRead(runsListRead(buildId, filter))).page).toEqual(page);
      cursor = page.nextCursor;
      pages++;
    } while (cursor);
    expect(pages).toBe(3);
  });

  it("tell an empty build's list from an unknown build's", async () => {
    expect((await useApiTokenWith(tokenHash, runsListRead(emptyBuildId)))?.data).toEqual({ page: { items: [], nextCursor: null }, buildExists: true });
    expect((await useApiTokenWith(tokenHash, runsListRead("00000000-0000-4000-8000-000000000000")))?.data.buildExists).toBe(false);
  });

  it("give the run detail as getRunWithContext does, and null for an unknown run", async () => {
    expect((await useApiTokenWith(tokenHash, runWithContextRead(runIds[0])))?.data).toEqual(await getRunWithContext(runIds[0]));
    expect((await useApiTokenWith(tokenHash, runWithContextRead("00000000-0000-4000-8000-000000000000")))?.data).toBeNull();
  });

  it("give the build detail as the build page's separate queries do", async () => {
    const view = await getBuildView(viewer, buildId);
    const detail = (await useApiTokenWith(tokenHash, buildDetailRead(buildId)))?.data;
    expect(detail?.build).toEqual(view.build);
    expect(detail?.tweaks).toEqual(view.tweaks);
    expect(detail?.openFlags).toEqual(view.flags);
    expect(detail?.openFlags.map((f) => f.rule)).toEqual(["frequency"]);
    expect([detail?.topology, detail?.extraCapacitanceF, detail?.windings]).toEqual([view.design.topology, view.design.revision.extraCapacitanceF, view.design.revision.windings]);
  });

  it("cost one statement per request", async () => {
    await useApiTokenWith(tokenHash, runsListRead(buildId)); // records the token's use of this minute
    expect(await statements(() => useApiTokenWith(tokenHash, runsListRead(buildId)))).toBe(1);
    expect(await statements(() => useApiTokenWith(tokenHash, runWithContextRead(runIds[0])))).toBe(1);
    expect(await statements(() => useApiTokenWith(tokenHash, buildDetailRead(buildId)))).toBe(1);
  });

  it("read nothing for an unknown or revoked token or a disabled owner", async () => {
    expect(await useApiTokenWith(hashSecretToken("tbk_unknown"), runsListRead(buildId))).toBeNull();
    const other = await scratchUser("viewer");
    const hash = hashSecretToken((await createApiToken({ userId: other.id, name: "to revoke" })).token);
    await db()("api_tokens").where({ token_hash: hash }).update({ revoked_at: db().fn.now() });
    expect(await useApiTokenWith(hash, buildDetailRead(buildId))).toBeNull();
    const third = await scratchUser("viewer");
    const thirdHash = hashSecretToken((await createApiToken({ userId: third.id, name: "disabled" })).token);
    await db()("auth_user").where({ id: third.id }).update({ status: "disabled" });
    expect(await useApiTokenWith(thirdHash, runWithContextRead(runIds[0]))).toBeNull();
  });
});
