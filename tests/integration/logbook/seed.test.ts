import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import type { User } from "@/db/queries/users";
import type { Role } from "@/lib/auth/permissions";
import { startAnalysisWorker, type AnalysisWorker } from "@/lib/jobs/worker";
import { stopSender } from "@/lib/jobs/queue";
import { seedDemoLogbook } from "../../../scripts/seed/logbook";
import { scratchUser, useScratchStack, waitFor, type ScratchStack } from "./scratch-stack";

let stack: ScratchStack;
let worker: AnalysisWorker | undefined;
const lines: string[] = [];

async function accounts(): Promise<Record<Role, User>> {
  const out = {} as Record<Role, User>;
  for (const role of ["viewer", "technician", "engineer", "admin"] as const) {
    const u = await scratchUser(role);
    out[role] = { ...u, status: "active", createdAt: new Date(), lastSeenAt: null };
  }
  return out;
}

beforeAll(async () => {
  stack = await useScratchStack("seed");
});

afterAll(async () => {
  await worker?.stop();
  await stopSender();
  await closeDb();
  await stack?.drop();
});

describe("seedDemoLogbook", () => {
  it("loads_the_demo_through_the_pipeline_once_and_changes_nothing_the_second_time", async () => {
    const ctx = { accounts: await accounts(), log: (line: string) => lines.push(line) };
    await seedDemoLogbook(ctx);
    const count = async (table: string) => Number((await db()(table).count<{ n: string }[]>({ n: "*" }))[0].n);
    const before = { projects: await count("projects"), designs: await count("designs"), builds: await count("builds"), tweaks: await count("tweaks"), runs: await count("runs") };
    expect(before).toMatchObject({ projects: 2, designs: 3, builds: 5 });
    expect(before.runs).toBeGreaterThanOrEqual(24);
    expect(before.tweaks).toBeGreaterThanOrEqual(10);
    const topologies = (await db()("designs").select("topology")).map((r) => r.topology).sort();
    expect(topologies).toEqual(["clapp", "colpitts", "hartley"]);

    await seedDemoLogbook(ctx);
    expect(await count("runs")).toBe(before.runs);
    expect(lines).toContain("demo logbook already there");

    worker = await startAnalysisWorker({ threads: 1 });
    await waitFor("every demo run to be analysed", async () => {
      const [{ n }] = await db()("runs").whereIn("status", ["queued", "running"]).count<{ n: string }[]>({ n: "*" });
      return Number(n) === 0 ? true : undefined;
    }, 120_000, 500);
    const runs = await db()("runs").select("status", "verdict", "results", "drift_ppm", "original_filename");
    expect(runs.every((r) => r.status === "done")).toBe(true);
    const warnings = new Set(runs.flatMap((r) => (r.results.warnings as { code: string }[]).map((w) => w.code)));
    expect(warnings.has("clipping")).toBe(true);
    expect(warnings.has("not-steady")).toBe(true);
    expect(runs.some((r) => r.verdict === "fail")).toBe(true);
    expect(runs.some((r) => r.verdict === "pass")).toBe(true);
    // The breadboarded Colpitts calculated near 370 kHz measures near 390 kHz (common practice: about +5 %).
    const breadboard = runs.find((r) => r.original_filename === "bb1-first.csv")!;
    expect(breadboard.drift_ppm).toBeGreaterThan(40_000);
    expect(breadboard.drift_ppm).toBeLessThan(70_000);
  }, 180_000);
});
