import { randomUUID } from "node:crypto";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { synthCaptureCsv } from "../../../scripts/lib/synth-capture";
import { uploadCapture, waitForRun } from "../../integration/api/helpers";
import { launchBrowser } from "../../helpers/browser";
import { appUrl } from "../../helpers/stack";
import { checkFinalPage, freshPage, journeyPerson, scene, signIn, type JourneyPerson, type Scene } from "./helpers";

// Captures a misbehaving bench produces, through the real pipeline: a 4th harmonic above half the sample rate
// must fail the −30 dBc rule (it used to be dropped, and the run passed), and a capture sampled at exactly four
// times the tone, where harmonics fold onto the fundamental, DC and Nyquist, must read "cannot judge" with advice.

let browser: Browser;
let engineer: JourneyPerson;
let technician: JourneyPerson;
let world: Scene;

beforeAll(async () => {
  engineer = await journeyPerson("engineer", "judge-eng");
  technician = await journeyPerson("technician", "judge-tech");
  world = await scene(engineer, technician, "Judge journey");
  browser = await launchBrowser();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await closeDb();
  await closeLucia();
});

const tone = 411e3;

describe("captures the spec cannot pass", () => {
  it("a folded 4th harmonic at −25 dBc fails the −30 dBc rule", async () => {
    // 0.131 fs: the 4th harmonic is at 0.524 fs and shows at 0.476 fs.
    const csv = synthCaptureCsv({ frequencyHz: tone, sampleRateHz: tone / 0.131, samples: 20_000, amplitudeV: 1, harmonicsDbc: [-45, -50, -25], noiseVrms: 0.001, seed: 1201 });
    const res = await uploadCapture(world.buildId, technician, csv);
    expect(res.status, res.text).toBe(201);
    const run = await waitForRun(res.body.id, technician);
    expect(run.verdict).toBe("fail");
    const fourth = (run.results as { harmonics: { order: number; folded: boolean; dBc: number }[] }).harmonics.find((h) => h.order === 4);
    expect(fourth?.folded).toBe(true);
    expect(fourth?.dBc).toBeCloseTo(-25, 0);
  });

  it("a capture at exactly 4 samples a period reads 'cannot judge' with the sample rate to use, on the API and the run page", async () => {
    const csv = synthCaptureCsv({ frequencyHz: tone, sampleRateHz: 4 * tone, samples: 8000, amplitudeV: 1, harmonicsDbc: [-40, -45], noiseVrms: 0.001, seed: 1202 });
    const res = await uploadCapture(world.buildId, technician, csv);
    expect(res.status, res.text).toBe(201);
    const run = await waitForRun(res.body.id, technician);
    expect(run.verdict).toBe("inconclusive");

    const { page, context, errors } = await freshPage(browser);
    await signIn(page, engineer);
    await page.goto(`${appUrl()}/runs/${res.body.id}`);
    await page.getByText("Spec verdict").waitFor({ timeout: 30_000 });
    const verdicts = page.getByRole("list", { name: "Spec checks" });
    await verdicts.getByText("Cannot judge").first().waitFor();
    // 2.1 × 10 × 411 kHz = 8.63 MS/s, rounded up to two digits.
    await verdicts.getByText(/To judge it: sample at ≥ 8\.7 MS\/s to see every harmonic/).first().waitFor();
    await page.getByText("not measured").first().waitFor();
    await checkFinalPage(page, "run-cannot-judge");
    expect(errors).toEqual([]);
    await context.close();
  }, 120_000);

  it("a missing build or run page answers 404, not 200", async () => {
    const { page, context } = await freshPage(browser);
    await signIn(page, engineer);
    for (const path of [`/builds/${randomUUID()}`, `/runs/${randomUUID()}`, "/runs/not-a-run"]) {
      const response = await page.goto(`${appUrl()}${path}`);
      expect(response?.status(), path).toBe(404);
    }
    const existing = await page.goto(`${appUrl()}/builds/${world.buildId}`);
    expect(existing?.status()).toBe(200);
    await context.close();
  }, 60_000);
});
