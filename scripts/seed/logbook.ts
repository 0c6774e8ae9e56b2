// Demo step of `scripts/seed.ts`: an invented bench scenario of our own — two projects, a Colpitts, a Hartley
// and a Clapp, builds with tweaks, and a few dozen runs whose captures come from the seeded generator. Every
// capture goes through the real pipeline (stored in object storage, registered with its snapshot, queued), so
// the worker analyses them once it starts. Runs again change nothing: the step stops if its first project exists.
import type { User } from "../../db/queries/users";
import { getProjectByName } from "../../db/queries/projects";
import type { CurrentUser } from "../../lib/auth/current-user-type";
import type { Role } from "../../lib/auth/permissions";
import { stopSender } from "../../lib/jobs/queue";
import { createBuild } from "../../lib/logbook/builds";
import { createDesign } from "../../lib/logbook/designs";
import { createProject } from "../../lib/logbook/projects";
import { logTweak } from "../../lib/logbook/tweaks";
import { ensureBucket } from "../../lib/storage";
import { designInputSchema } from "../../lib/validations/design";
import { synthCaptureCsv, type SynthCaptureOptions } from "../lib/synth-capture";
import { storeSeedCapture } from "./store-capture";

/** What the seed's earlier steps hand over (scripts/seed.ts SeedContext). */
export interface LogbookSeedContext {
  accounts: Record<Role, User>;
  log: (line: string) => void;
}

const FIRST_PROJECT = "Bench clock reference";
const DAY_MS = 24 * 3600 * 1000;

/** A capture as the bench scope would write it: 8-bit samples, a short preamble, some noise. */
function scopeCapture(options: Partial<SynthCaptureOptions> & Pick<SynthCaptureOptions, "frequencyHz" | "seed">): Buffer {
  const sampleRateHz = options.sampleRateHz ?? Math.round(options.frequencyHz * 25);
  return Buffer.from(
    synthCaptureCsv({
      sampleRateHz,
      samples: 20_000,
      amplitudeV: 1.1,
      harmonicsDbc: [-36, -44, -52],
      noiseVrms: 0.004,
      quantizationBits: 8,
      fullScaleV: 2,
      preamble: { Instrument: "bench scope 2", "Record Length": String(options.samples ?? 20_000) },
      ...options,
    }),
    "utf8",
  );
}

type Step =
  | { tweak: Record<string, unknown>; by?: Role }
  | { run: Partial<SynthCaptureOptions> & Pick<SynthCaptureOptions, "frequencyHz">; file: string; note?: string; temperatureC?: number; followsTweak?: boolean };

interface BuildPlan {
  label: string;
  kind: "breadboard" | "perfboard" | "pcb" | "other";
  kindRevision?: string;
  steps: Step[];
}

interface DesignPlan {
  name: string;
  input: Record<string, unknown>;
  builds: BuildPlan[];
}

interface ProjectPlan {
  name: string;
  purpose: string;
  designs: DesignPlan[];
}

/** Frequencies drift a little run to run (temperature, handling): a deterministic wobble of ±0.05 %. */
function wobble(seed: number): number {
  return 1 + 0.0005 * Math.sin(seed * 2.399);
}

const plans: ProjectPlan[] = [
  {
    name: FIRST_PROJECT,
    purpose: "A low-frequency clock source for the lab's counter calibration jig. Demo data.",
    designs: [
      {
        name: "Colpitts 370 kHz",
        input: {
          topology: "colpitts",
          parts: { L: { value: "100u", tolerance: "10%" }, C1: { value: "2n2", tolerance: "5%", tempco: "C0G" }, C2: { value: "12n", tolerance: "5%", tempco: "C0G" } },
          spec: { targetHz: "370k", toleranceValue: "2", toleranceUnit: "percent", maxThdPercent: "5", maxHarmonicDbc: "-30", minFundamentalVpk: "0.5", maxDriftPpm: "200" },
        },
        builds: [
          {
            label: "BB-1",
            kind: "breadboard",
            steps: [
              // A breadboarded Colpitts calculated near 370 kHz reads near 390 kHz (common practice: layout parasitics).
              { run: { frequencyHz: 390_400, startupTauS: 4e-4 }, file: "bb1-power-up.csv", note: "caught it at power-up" },
              { run: { frequencyHz: 390_200 }, file: "bb1-first.csv", note: "first steady capture" },
              { run: { frequencyHz: 390_100 }, file: "bb1-second.csv" },
              { tweak: { note: "shortened the leads on C1 and C2" } },
              { run: { frequencyHz: 388_300 }, file: "bb1-short-leads.csv", followsTweak: true },
              { tweak: { partRef: "C2", toValue: "15n", note: "more feedback capacitance to pull it down" } },
              { run: { frequencyHz: 382_600 }, file: "bb1-c2-15n.csv", followsTweak: true },
              { run: { frequencyHz: 382_500, amplitudeV: 1.6, clipV: 1.25 }, file: "bb1-overdriven.csv", note: "supply turned up; tops look flat" },
              { tweak: { note: "moved the probe ground to the tank's cold end" } },
              { run: { frequencyHz: 381_900 }, file: "bb1-probe-ground.csv", followsTweak: true },
              { run: { frequencyHz: 381_950 }, file: "bb1-warm.csv", temperatureC: 31, note: "after 20 minutes warm-up" },
            ],
          },
          {
            label: "PCB-A",
            kind: "pcb",
            kindRevision: "rev A",
            steps: [
              // On the PCB the stray shrinks: about +1.5 % over the calculation instead of +5 %.
              { run: { frequencyHz: 374_900, harmonicsDbc: [-41, -48, -55] }, file: "pcba-first.csv" },
              { run: { frequencyHz: 374_800, harmonicsDbc: [-41, -49, -55] }, file: "pcba-second.csv" },
              { tweak: { partRef: "C2", toValue: "15n", note: "C2 up to pull it onto 370 kHz" } },
              { run: { frequencyHz: 368_900, harmonicsDbc: [-42, -49, -56] }, file: "pcba-c2-15n.csv", followsTweak: true },
              { run: { frequencyHz: 368_950, harmonicsDbc: [-42, -49, -56] }, file: "pcba-repeat.csv", temperatureC: 27 },
            ],
          },
        ],
      },
    ],
  },
  {
    name: "Receiver front end",
    purpose: "Local oscillators for the lab's demonstration receiver: a tunable VFO and a beat oscillator. Demo data.",
    designs: [
      {
        name: "Hartley BFO 455 kHz",
        input: {
          topology: "hartley",
          parts: { L1: { value: "100u", tolerance: "5%" }, L2: { value: "22u", tolerance: "5%" }, k: { value: "0.3" }, C: { value: "820p", tolerance: "2%", tempco: "N750" } },
          spec: { targetHz: "455k", toleranceValue: "1", toleranceUnit: "percent", maxThdPercent: "2", maxHarmonicDbc: "-40" },
        },
        builds: [
          {
            label: "PF-1",
            kind: "perfboard",
            steps: [
              { run: { frequencyHz: 447_300, harmonicsDbc: [-34, -41, -50] }, file: "pf1-first.csv", note: "harmonics look high" },
              { run: { frequencyHz: 447_250, harmonicsDbc: [-34, -41, -50] }, file: "pf1-second.csv" },
              { tweak: { note: "added a 100 Ω emitter resistor to soften the drive" } },
              { run: { frequencyHz: 447_100, harmonicsDbc: [-38, -45, -52] }, file: "pf1-emitter-r.csv", followsTweak: true },
              { tweak: { partRef: "C", toValue: "800p", note: "trimmed C towards 455 kHz" } },
              { run: { frequencyHz: 452_900, harmonicsDbc: [-38, -45, -52] }, file: "pf1-c-800p.csv", followsTweak: true },
              { run: { frequencyHz: 452_850, harmonicsDbc: [-38, -45, -52], driftHz: 400 }, file: "pf1-drifting.csv", temperatureC: 35, note: "heat gun near the coil" },
              { tweak: { note: "swapped to a 2.2 kΩ emitter resistor" } },
              { run: { frequencyHz: 452_950, harmonicsDbc: [-43, -48, -55] }, file: "pf1-softer.csv", followsTweak: true },
            ],
          },
        ],
      },
      {
        name: "Clapp VFO 3.58 MHz",
        input: {
          topology: "clapp",
          parts: { L: { value: "4u7", tolerance: "5%" }, C1: { value: "2n2", tolerance: "5%" }, C2: { value: "2n2", tolerance: "5%" }, C3: { value: "680p", tolerance: "2%", tempco: "C0G" } },
          spec: { targetHz: "3.58M", toleranceValue: "5000", toleranceUnit: "ppm", maxThdPercent: "3", maxHarmonicDbc: "-35", minFundamentalVpk: "0.3" },
        },
        builds: [
          {
            label: "PCB-B1",
            kind: "pcb",
            kindRevision: "rev B",
            steps: [
              { run: { frequencyHz: 3_566_000, sampleRateHz: 100e6, harmonicsDbc: [-42, -50] }, file: "b1-first.csv" },
              { run: { frequencyHz: 3_565_600, sampleRateHz: 100e6, harmonicsDbc: [-42, -50] }, file: "b1-second.csv" },
              { tweak: { partRef: "C3", toValue: "560p", note: "C3 down to move up towards 3.58 MHz" } },
              { run: { frequencyHz: 3_795_000, sampleRateHz: 100e6, harmonicsDbc: [-41, -50] }, file: "b1-c3-560p.csv", followsTweak: true, note: "overshot" },
              { tweak: { partRef: "C3", toValue: "680p", note: "back to 680p; a trimmer would do better" } },
              { run: { frequencyHz: 3_566_200, sampleRateHz: 100e6, harmonicsDbc: [-42, -50] }, file: "b1-c3-680p.csv", followsTweak: true },
              { run: { frequencyHz: 3_566_400, sampleRateHz: 100e6, harmonicsDbc: [-42, -51] }, file: "b1-final.csv", note: "steady after warm-up" },
            ],
          },
          {
            label: "BB-2",
            kind: "breadboard",
            steps: [
              { run: { frequencyHz: 3_402_000, sampleRateHz: 100e6, harmonicsDbc: [-33, -40] }, file: "bb2-first.csv", note: "breadboard: a long way low" },
              { run: { frequencyHz: 3_401_500, sampleRateHz: 100e6, harmonicsDbc: [-33, -40], amplitudeV: 0.25 }, file: "bb2-weak.csv", note: "weak output with the 9 V battery" },
              { tweak: { note: "shorter ground wire to the scope probe" } },
              { run: { frequencyHz: 3_409_000, sampleRateHz: 100e6, harmonicsDbc: [-34, -41] }, file: "bb2-ground.csv", followsTweak: true },
              { run: { frequencyHz: 3_409_300, sampleRateHz: 100e6, harmonicsDbc: [-34, -41] }, file: "bb2-repeat.csv" },
            ],
          },
        ],
      },
    ],
  },
];

/** A seeded account as the services' acting user. */
export function asCurrentUser(user: User): CurrentUser {
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}

/**
 * Loads the demo logbook. Needs the demo accounts (engineer and technician) from the earlier seed step.
 * @returns nothing; logs one line per project
 */
export async function seedDemoLogbook(ctx: LogbookSeedContext): Promise<void> {
  if (await getProjectByName(FIRST_PROJECT)) {
    ctx.log("demo logbook already there");
    return;
  }
  const engineer = { user: asCurrentUser(ctx.accounts.engineer) };
  const technician = { user: asCurrentUser(ctx.accounts.technician) };
  await ensureBucket();
  // History spread over the last three weeks, oldest first, so timelines read like a real bench log.
  const totalSteps = plans.flatMap((p) => p.designs.flatMap((d) => d.builds.flatMap((b) => b.steps))).length + 20;
  let clock = Date.now() - 21 * DAY_MS;
  const tick = () => new Date((clock += (20 * DAY_MS) / totalSteps));
  let seed = 100;
  let runs = 0;
  try {
    for (const plan of plans) {
      const project = await createProject(engineer, { name: plan.name, purpose: plan.purpose }, { at: tick() });
      for (const designPlan of plan.designs) {
        const input = designInputSchema.parse({ name: designPlan.name, ...designPlan.input });
        const design = await createDesign(engineer, project.id, input, { at: tick() });
        for (const buildPlan of designPlan.builds) {
          const build = await createBuild(
            technician,
            design.id,
            { label: buildPlan.label, kind: buildPlan.kind, kindRevision: buildPlan.kindRevision ?? "" },
            { at: tick() },
          );
          let lastTweakId: string | null = null;
          for (const step of buildPlan.steps) {
            if ("tweak" in step) {
              lastTweakId = (await logTweak(technician, build.id, step.tweak, { at: tick() })).id;
              continue;
            }
            seed += 1;
            const body = scopeCapture({ ...step.run, frequencyHz: step.run.frequencyHz * wobble(seed), seed });
            await storeSeedCapture(technician, {
              buildId: build.id,
              filename: step.file,
              body,
              meta: {
                probe: "1", // the scope was told about its 10:1 probe, so the file already holds circuit volts
                supplyV: "12",
                temperatureC: String(step.temperatureC ?? 23),
                note: step.note ?? "",
                tweakId: step.followsTweak ? lastTweakId : undefined,
              },
              createdAt: tick(),
            });
            runs++;
          }
        }
      }
      ctx.log(`demo project “${plan.name}” loaded`);
    }
    ctx.log(`demo logbook: ${runs} captures queued for analysis`);
  } finally {
    await stopSender();
  }
}
