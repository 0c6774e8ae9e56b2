// Demo step of `scripts/seed.ts`: an invented layout survey of our own, so the Layouts page has something to say —
// six breadboards of one Colpitts, each adding a steady 10–14 pF (a trusted figure), and two PCBs of one revision
// adding about 3 pF (a thin one). Each build has two captures, a note-only tweak, and one more capture, all through
// the real pipeline (stored, registered with a snapshot, queued for the worker). Runs again change nothing.
import { getProjectByName } from "../../db/queries/projects";
import { stopSender } from "../../lib/jobs/queue";
import { createBuild } from "../../lib/logbook/builds";
import { createDesign } from "../../lib/logbook/designs";
import { createProject } from "../../lib/logbook/projects";
import { logTweak } from "../../lib/logbook/tweaks";
import { predictOscillator } from "../../lib/oscillator";
import { ensureBucket } from "../../lib/storage";
import { designInputSchema } from "../../lib/validations/design";
import { synthCaptureCsv } from "../lib/synth-capture";
import { asCurrentUser, type LogbookSeedContext } from "./logbook";
import { storeSeedCapture } from "./store-capture";

const PROJECT = "Layout survey";
const DAY_MS = 24 * 3600 * 1000;
const pF = 1e-12;

const DESIGN_INPUT = {
  name: "Colpitts 1 MHz survey",
  topology: "colpitts",
  parts: { L: { value: "47u", tolerance: "5%" }, C1: { value: "680p", tolerance: "2%", tempco: "C0G" }, C2: { value: "2n2", tolerance: "2%", tempco: "C0G" } },
  spec: { targetHz: "1M", toleranceValue: "3", toleranceUnit: "percent", maxThdPercent: "5", maxHarmonicDbc: "-30" },
};

/** Builds and the extra capacitance each one's layout adds (invented), pF: before the tweak, after it. */
const SURVEY: { label: string; kind: "breadboard" | "pcb"; kindRevision: string; addsPf: [number, number, number] }[] = [
  { label: "SV-BB-1", kind: "breadboard", kindRevision: "", addsPf: [12.0, 12.2, 12.1] },
  { label: "SV-BB-2", kind: "breadboard", kindRevision: "", addsPf: [10.4, 10.5, 10.7] },
  { label: "SV-BB-3", kind: "breadboard", kindRevision: "", addsPf: [13.6, 13.5, 13.8] },
  { label: "SV-BB-4", kind: "breadboard", kindRevision: "", addsPf: [11.8, 11.9, 11.6] },
  { label: "SV-BB-5", kind: "breadboard", kindRevision: "", addsPf: [12.9, 12.7, 12.8] },
  { label: "SV-BB-6", kind: "breadboard", kindRevision: "", addsPf: [11.1, 11.3, 11.2] },
  { label: "SV-PCB-1", kind: "pcb", kindRevision: "rev C", addsPf: [3.1, 3.2, 3.0] },
  { label: "SV-PCB-2", kind: "pcb", kindRevision: "rev C", addsPf: [2.6, 2.7, 2.8] },
];

/**
 * Loads the layout survey. Needs the demo accounts (engineer and technician) from the first seed step.
 */
export async function seedLayoutSurvey(ctx: LogbookSeedContext): Promise<void> {
  if (await getProjectByName(PROJECT)) {
    ctx.log("layout survey already there");
    return;
  }
  const engineer = { user: asCurrentUser(ctx.accounts.engineer) };
  const technician = { user: asCurrentUser(ctx.accounts.technician) };
  await ensureBucket();
  const steps = SURVEY.length * 5 + 2;
  let clock = Date.now() - 14 * DAY_MS;
  const tick = () => new Date((clock += (12 * DAY_MS) / steps));
  let seed = 700;
  try {
    const project = await createProject(
      engineer,
      { name: PROJECT, purpose: "The same Colpitts built on breadboards and on the first PCBs, to learn what each construction adds. Demo data." },
      { at: tick() },
    );
    const input = designInputSchema.parse(DESIGN_INPUT);
    const design = await createDesign(engineer, project.id, input, { at: tick() });
    const model = predictOscillator({ topology: "colpitts", parts: input.parts });
    for (const plan of SURVEY) {
      const build = await createBuild(technician, design.id, { label: plan.label, kind: plan.kind, kindRevision: plan.kindRevision }, { at: tick() });
      let tweakId: string | undefined;
      for (const [i, addsPf] of plan.addsPf.entries()) {
        if (i === 2) tweakId = (await logTweak(technician, build.id, { note: "re-seated the transistor and shortened its leads" }, { at: tick() })).id;
        // The frequency a layout adding this much across C_eff gives: f0·√(C_eff/(C_eff + C_x)).
        const frequencyHz = model.predictedHz * Math.sqrt(model.cEffF / (model.cEffF + addsPf * pF));
        seed += 1;
        const body = Buffer.from(
          synthCaptureCsv({
            frequencyHz,
            seed,
            sampleRateHz: Math.round(frequencyHz * 25),
            samples: 20_000,
            amplitudeV: 1.1,
            harmonicsDbc: plan.kind === "pcb" ? [-42, -50, -57] : [-35, -43, -51],
            noiseVrms: 0.004,
            quantizationBits: 8,
            fullScaleV: 2,
          }),
          "utf8",
        );
        await storeSeedCapture(technician, {
          buildId: build.id,
          filename: `${plan.label.toLowerCase()}-${i + 1}.csv`,
          body,
          meta: { probe: "1", supplyV: "12", temperatureC: "23", note: "", tweakId: i === 2 ? tweakId : undefined },
          createdAt: tick(),
        });
      }
    }
    ctx.log(`layout survey: ${SURVEY.length} builds, ${SURVEY.length * 3} captures queued for analysis`);
  } finally {
    await stopSender();
  }
}
