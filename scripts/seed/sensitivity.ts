// Demo step of `scripts/seed.ts`: a second PCB of the demo Colpitts (PCB-A2) characterised on the bench — runs at
// several supply voltages and temperatures whose frequency follows a planted pushing and tempco, repeats at one
// condition before and after a note-only tweak, and one power-up capture — so the build page's Sensitivity card and
// the run page's Stability card are filled. It adds to the demo and changes nothing already there; a second run
// changes nothing (it stops when the build exists).
import { listBuilds } from "../../db/queries/builds";
import { getDesign, listDesigns } from "../../db/queries/designs";
import { getProjectByName } from "../../db/queries/projects";
import type { User } from "../../db/queries/users";
import type { Role } from "../../lib/auth/permissions";
import { stopSender } from "../../lib/jobs/queue";
import { createBuild } from "../../lib/logbook/builds";
import { logTweak } from "../../lib/logbook/tweaks";
import { ensureBucket } from "../../lib/storage";
import { asCurrentUser } from "./logbook";
import { plantedHz, plantedVpk, startUpCapture, steadyCapture } from "./sensitivity-captures";
import { storeSeedCapture } from "./store-capture";

export interface SensitivitySeedContext {
  accounts: Record<Role, User>;
  log: (line: string) => void;
}

export const SENSITIVITY_BUILD_LABEL = "PCB-A2";
const DEMO_PROJECT = "Bench clock reference";
const DEMO_DESIGN = "Colpitts 370 kHz";
const STEP_MS = 40 * 60 * 1000;

type Step =
  | { tweak: string }
  | { file: string; supplyV: number; temperatureC: number; offsetPpm?: number; startUp?: true; note?: string };

// Oldest first. The power-up capture comes first, so the build's latest run (its verdict) is a steady one.
const STEPS: Step[] = [
  { file: "pcba2-power-up.csv", supplyV: 12, temperatureC: 23, startUp: true, note: "triggered on the supply switch: start-up" },
  { file: "pcba2-12v-a.csv", supplyV: 12, temperatureC: 23, note: "repeat 1 at 12 V, 23 °C" },
  { file: "pcba2-12v-b.csv", supplyV: 12, temperatureC: 23, note: "repeat 2" },
  { file: "pcba2-12v-c.csv", supplyV: 12, temperatureC: 23, note: "repeat 3" },
  { file: "pcba2-9v.csv", supplyV: 9, temperatureC: 23, offsetPpm: 0.6, note: "supply sweep" },
  { file: "pcba2-10v5.csv", supplyV: 10.5, temperatureC: 23, offsetPpm: -0.8 },
  { file: "pcba2-13v5.csv", supplyV: 13.5, temperatureC: 23, offsetPpm: 0.4 },
  { file: "pcba2-15v.csv", supplyV: 15, temperatureC: 23, offsetPpm: -0.5 },
  { file: "pcba2-15c.csv", supplyV: 12, temperatureC: 15, offsetPpm: -1, note: "board in the cold box" },
  { file: "pcba2-31c.csv", supplyV: 12, temperatureC: 31, offsetPpm: 1.2, note: "warm air, thermocouple on the coil" },
  { file: "pcba2-39c.csv", supplyV: 12, temperatureC: 39, offsetPpm: -0.7 },
  { file: "pcba2-47c.csv", supplyV: 12, temperatureC: 47, offsetPpm: 0.9 },
  { tweak: "moved the board to the other bench and re-seated the probe" },
  // After the move the repeats wander by several ppm: more than the captures' own uncertainty explains.
  { file: "pcba2-moved-a.csv", supplyV: 12, temperatureC: 23, offsetPpm: 4, note: "after the move" },
  { file: "pcba2-moved-b.csv", supplyV: 12, temperatureC: 23, offsetPpm: -3 },
  { file: "pcba2-moved-c.csv", supplyV: 12, temperatureC: 23, offsetPpm: 6 },
];

/**
 * Adds the characterised build to a design and queues its captures for analysis.
 * @param designId - the design to build (the demo's Colpitts 370 kHz, or a test's copy of it)
 * @param startAt - the time of the first step; the others follow 40 minutes apart
 * @returns the build id and the number of captures queued
 */
export async function seedSensitivityBuild(ctx: SensitivitySeedContext, designId: string, startAt: Date): Promise<{ buildId: string; runs: number }> {
  const technician = { user: asCurrentUser(ctx.accounts.technician) };
  await ensureBucket();
  let clock = startAt.getTime() - STEP_MS;
  const tick = () => new Date((clock += STEP_MS));
  const build = await createBuild(technician, designId, { label: SENSITIVITY_BUILD_LABEL, kind: "pcb", kindRevision: "rev A" }, { at: tick() });
  let seed = 700;
  let runs = 0;
  let lastTweakId: string | null = null;
  let followsTweak = false;
  for (const step of STEPS) {
    if ("tweak" in step) {
      lastTweakId = (await logTweak(technician, build.id, { note: step.tweak }, { at: tick() })).id;
      followsTweak = true;
      continue;
    }
    seed += 1;
    const hz = plantedHz(step.supplyV, step.temperatureC, step.offsetPpm ?? 0);
    const body = step.startUp ? startUpCapture(hz, plantedVpk(step.supplyV), seed) : steadyCapture(hz, plantedVpk(step.supplyV), seed);
    await storeSeedCapture(technician, {
      buildId: build.id,
      filename: step.file,
      body,
      meta: {
        probe: "1",
        supplyV: String(step.supplyV),
        temperatureC: String(step.temperatureC),
        note: step.note ?? "",
        tweakId: followsTweak ? lastTweakId : undefined,
      },
      createdAt: tick(),
    });
    followsTweak = false;
    runs++;
  }
  return { buildId: build.id, runs };
}

/** The seed step: the characterised build on the demo Colpitts, once. Needs the demo logbook step before it. */
export async function seedSensitivityDemo(ctx: SensitivitySeedContext): Promise<void> {
  const started = Date.now();
  const project = await getProjectByName(DEMO_PROJECT);
  if (!project) {
    ctx.log("sensitivity demo: the demo logbook is not there; skipped");
    return;
  }
  const design = (await listDesigns(project.id, { limit: 50 })).items.find((d) => d.name === DEMO_DESIGN);
  if (!design || !(await getDesign(design.id))) {
    ctx.log(`sensitivity demo: no design “${DEMO_DESIGN}”; skipped`);
    return;
  }
  const builds = await listBuilds(design.id, { limit: 100 });
  if (builds.items.some((b) => b.label === SENSITIVITY_BUILD_LABEL)) {
    ctx.log("sensitivity demo already there");
    return;
  }
  try {
    // The last day and a half of the log, after the rest of the demo's history.
    const { runs } = await seedSensitivityBuild(ctx, design.id, new Date(Date.now() - 36 * 3600 * 1000));
    ctx.log(`sensitivity demo: ${SENSITIVITY_BUILD_LABEL} with ${runs} captures queued for analysis (${((Date.now() - started) / 1000).toFixed(1)} s)`);
  } finally {
    await stopSender();
  }
}
