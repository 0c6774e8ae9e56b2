import { generateIdFromEntropySize } from "lucia";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { getRun } from "@/db/queries/runs";
import { createUser } from "@/db/queries/users";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { closeLucia } from "@/lib/auth/lucia";
import { hashPassword } from "@/lib/auth/password";
import type { Role } from "@/lib/auth/permissions";
import { stopSender } from "@/lib/jobs/queue";
import { createBuild } from "@/lib/logbook/builds";
import { createDesign } from "@/lib/logbook/designs";
import { createProject } from "@/lib/logbook/projects";
import { completeUpload, requestUploadSlot } from "@/lib/logbook/uploads";
import { designInputSchema } from "@/lib/validations/design";
import { runMetadataSchema } from "@/lib/validations/run";
import { synthCaptureCsv, type SynthCaptureOptions } from "../../scripts/lib/synth-capture";
import { keepScreenshot, launchBrowser, signedInContext, watchErrors } from "../helpers/browser";
import { appUrl } from "../helpers/stack";

// The run page's Stability card in real Chromium against the running app, at a desk's width and a phone's: one steady
// capture (phase noise, jitter and Allan deviation) and one start-up capture (the envelope and its start-up time),
// uploaded through the services the pages use and analysed by the stack's worker.

const PASSWORD = "stability card bench 2026";
const tag = Math.random().toString(16).slice(2, 10);
let browser: Browser;
let engineer: CurrentUser & { password: string };
let buildId: string;
let steadyRun: string;
let startUpRun: string;

async function person(role: Role): Promise<CurrentUser & { password: string }> {
  const email = `stability-${role}-${tag}@stability-tests.test`;
  const user = await createUser({ id: generateIdFromEntropySize(10), email, name: `Stability ${role}`, role, passwordHash: await hashPassword(PASSWORD) });
  return { id: user.id, email, name: user.name, role, password: PASSWORD };
}

async function upload(user: CurrentUser, capture: SynthCaptureOptions, filename: string): Promise<string> {
  const body = Buffer.from(synthCaptureCsv(capture), "utf8");
  const ticket = await requestUploadSlot({ user }, { buildId, filename, sizeBytes: body.length, contentType: "text/csv" });
  const put = await fetch(ticket.url, { method: "PUT", headers: ticket.headers, body });
  expect(put.status).toBe(200);
  const outcome = await completeUpload({ user }, ticket.slotId, runMetadataSchema.parse({ probe: "1", note: "stability card test" }));
  if (outcome.kind !== "created") throw new Error(`upload of ${filename} was not created: ${outcome.kind}`);
  return outcome.run.id;
}

async function waitAnalysed(runId: string, timeoutMs = 60_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const run = await getRun(runId);
    if (run?.status === "done") return;
    if (run?.status === "failed") throw new Error(`run ${runId} failed: ${run.error}`);
    if (Date.now() > until) throw new Error(`run ${runId} still ${run?.status} after ${timeoutMs} ms: is the stack's worker running?`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

beforeAll(async () => {
  engineer = await person("engineer");
  const technician = await person("technician");
  const project = await createProject({ user: engineer }, { name: `Stability bench ${tag}`, purpose: "browser test of the stability card" });
  const design = await createDesign(
    { user: engineer },
    project.id,
    designInputSchema.parse({
      name: `Colpitts 370k ${tag}`,
      topology: "colpitts",
      parts: { L: { value: "100u", tolerance: "5%" }, C1: { value: "2n2", tolerance: "5%" }, C2: { value: "12n", tolerance: "5%" } },
      spec: { targetHz: "370k", toleranceValue: "2", toleranceUnit: "percent" },
    }),
  );
  const build = await createBuild({ user: technician }, design.id, { label: `ST-${tag}`, kind: "breadboard", kindRevision: "" });
  buildId = build.id;
  const base = { frequencyHz: 388_000, sampleRateHz: 388_000 * 25, amplitudeV: 1.1, harmonicsDbc: [-38, -46], noiseVrms: 0.003 };
  steadyRun = await upload(technician, { ...base, samples: 40_000, seed: 31 }, "steady.csv");
  // 1600 periods, the envelope rising as 1 − e^(−t/τ) with τ an eighth of the record.
  startUpRun = await upload(technician, { ...base, samples: 40_000, seed: 32, startupTauS: 40_000 / (388_000 * 25) / 8 }, "start-up.csv");
  await waitAnalysed(steadyRun);
  await waitAnalysed(startUpRun);
  browser = await launchBrowser();
}, 180_000);

afterAll(async () => {
  await browser?.close();
  await stopSender();
  await closeDb();
  await closeLucia();
});

async function openRun(runId: string, width: number) {
  const context = await signedInContext(browser, engineer, width);
  const page = await context.newPage();
  const errors = watchErrors(page);
  await page.goto(`${appUrl()}/runs/${runId}`, { waitUntil: "networkidle" });
  const card = page.getByTestId("stability-card");
  await card.waitFor();
  return { context, page, errors, card };
}

describe("the run page's Stability card", () => {
  for (const width of [1280, 390]) {
    it(`renders_phase_noise_jitter_and_allan_for_a_steady_run_at_${width}px`, async () => {
      const { context, page, errors, card } = await openRun(steadyRun, width);
      await expect(card.getByRole("heading", { name: "Stability" }).isVisible()).resolves.toBe(true);
      await expect(card.getByText("rms phase jitter").first().isVisible()).resolves.toBe(true);
      await expect(card.getByText("Period jitter (rms)").isVisible()).resolves.toBe(true);
      // Both charts drew: phase noise and Allan deviation.
      await card.locator(".tb-uplot canvas").first().waitFor();
      expect(await card.locator(".tb-uplot canvas").count()).toBeGreaterThanOrEqual(2);
      await expect(card.getByText(/Floor set by the capture/).isVisible()).resolves.toBe(true);
      // Nothing pushes the page sideways on a phone.
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
      expect(overflow).toBeLessThanOrEqual(0);
      // A steady record has no transient: nothing is drawn over its waveform.
      await expect(page.getByText(/fitted envelope/).count()).resolves.toBe(0);
      await keepScreenshot(page, `stability-steady-${width}`);
      expect(errors).toEqual([]);
      await context.close();
    });
  }

  it("shows_the_start_up_time_and_the_envelope_of_a_start_up_capture", async () => {
    const { context, page, errors, card } = await openRun(startUpRun, 1280);
    await expect(card.getByText("Start-up (to 90 %)").isVisible()).resolves.toBe(true);
    await expect(card.getByText(/Envelope of the fundamental \(start-up\)/).isVisible()).resolves.toBe(true);
    // The transient is not read as phase noise: those figures say why they are missing.
    await expect(card.getByText(/not measured/).first().isVisible()).resolves.toBe(true);
    await expect(page.getByText(/Start-up measured: 90 % of the settled/).first().isVisible()).resolves.toBe(true);
    // The waveform itself carries the fitted envelope, so the figure can be checked against the trace.
    await expect(page.getByText(/dashed lines are the start-up's fitted envelope/).isVisible()).resolves.toBe(true);
    await keepScreenshot(page, "stability-start-up-1280");
    expect(errors).toEqual([]);
    await context.close();
  });
});
