import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import type { User } from "@/db/queries/users";
import type { Role } from "@/lib/auth/permissions";
import { startAnalysisWorker, type AnalysisWorker } from "@/lib/jobs/worker";
import { stopSender } from "@/lib/jobs/queue";
import { listLayoutFigures } from "@/lib/logbook/layouts";
import { seedLayoutSurvey } from "../../../scripts/seed/layouts";
import { scratchUser, useScratchStack, waitFor, type ScratchStack } from "../logbook/scratch-stack";

let stack: ScratchStack;
let worker: AnalysisWorker | undefined;
const lines: string[] = [];
const pF = 1e-12;

beforeAll(async () => {
  stack = await useScratchStack("layoutseed");
});

afterAll(async () => {
  await worker?.stop();
  await stopSender();
  await closeDb();
  await stack?.drop();
});

describe("seedLayoutSurvey", () => {
  it("gives_a_trusted_breadboard_figure_and_a_thin_pcb_one_once_analysed", async () => {
    const accounts = {} as Record<Role, User>;
    for (const role of ["viewer", "technician", "engineer", "admin"] as const) {
      accounts[role] = { ...(await scratchUser(role)), status: "active", createdAt: new Date(), lastSeenAt: null };
    }
    const ctx = { accounts, log: (line: string) => lines.push(line) };
    await seedLayoutSurvey(ctx);
    const runCount = async () => Number((await db()("runs").count<{ n: string }[]>({ n: "*" }))[0].n);
    expect(await runCount()).toBe(24);
    await seedLayoutSurvey(ctx);
    expect(await runCount()).toBe(24);
    expect(lines).toContain("layout survey already there");

    worker = await startAnalysisWorker({ threads: 1 });
    await waitFor("every survey run to be analysed", async () => {
      const [{ n }] = await db()("runs").whereIn("status", ["queued", "running"]).count<{ n: string }[]>({ n: "*" });
      return Number(n) === 0 ? true : undefined;
    }, 120_000, 500);

    const figures = await listLayoutFigures({ id: accounts.viewer.id, email: accounts.viewer.email, name: accounts.viewer.name, role: "viewer" });
    const breadboard = figures.find((f) => f.constructionKey === "breadboard" && f.topology === "colpitts")!;
    const pcb = figures.find((f) => f.constructionKey === "pcb:rev c" && f.topology === "colpitts")!;
    expect(breadboard.strength).toBe("trusted");
    expect(breadboard.capacitanceF.count).toBe(6);
    // The survey's invented breadboards add 10.5 to 13.6 pF; their typical values' median is about 12 pF.
    expect(Math.abs(breadboard.capacitanceF.median! - 12 * pF)).toBeLessThan(0.6 * pF);
    expect(pcb.strength).toBe("thin");
    expect(pcb.capacitanceF.count).toBe(2);
    expect(Math.abs(pcb.capacitanceF.median! - 2.9 * pF)).toBeLessThan(0.6 * pF);
  });
});
