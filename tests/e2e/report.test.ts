import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
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
import { logTweak } from "@/lib/logbook/tweaks";
import { completeUpload, requestUploadSlot } from "@/lib/logbook/uploads";
import { designInputSchema } from "@/lib/validations/design";
import { runMetadataSchema } from "@/lib/validations/run";
import { synthCaptureCsv } from "../../scripts/lib/synth-capture";
import { keepScreenshot, launchBrowser, signedInContext, watchErrors } from "../helpers/browser";
import { appUrl } from "../helpers/stack";

// The build report in real Chromium against the running app. The data is made through the services the pages use:
// a project, a Colpitts design, a build with two analysed captures and a part tweak between them (the stack's
// worker analyses them), then an engineer signs in over the JSON session route.

const PASSWORD = "report test bench 2026";
const tag = Math.random().toString(16).slice(2, 10);
let browser: Browser;
let engineer: CurrentUser & { password: string };
let buildId: string;
let buildLabel: string;

async function person(role: Role): Promise<CurrentUser & { password: string }> {
  const email = `report-${role}-${tag}@report-tests.test`;
  const user = await createUser({ id: generateIdFromEntropySize(10), email, name: `Report ${role}`, role, passwordHash: await hashPassword(PASSWORD) });
  return { id: user.id, email, name: user.name, role, password: PASSWORD };
}

async function upload(user: CurrentUser, frequencyHz: number, seed: number, filename: string, tweakId?: string): Promise<string> {
  // An invented capture: 20 000 samples of a slightly distorted sine at 25 samples per cycle.
  const body = Buffer.from(
    synthCaptureCsv({ frequencyHz, sampleRateHz: frequencyHz * 25, samples: 20_000, amplitudeV: 1.1, harmonicsDbc: [-38, -46], noiseVrms: 0.003, seed }),
    "utf8",
  );
  const ticket = await requestUploadSlot({ user }, { buildId, filename, sizeBytes: body.length, contentType: "text/csv" });
  const put = await fetch(ticket.url, { method: "PUT", headers: ticket.headers, body });
  expect(put.status).toBe(200);
  const outcome = await completeUpload({ user }, ticket.slotId, runMetadataSchema.parse({ probe: "10", note: "report test", ...(tweakId ? { tweakId } : {}) }));
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
  const project = await createProject({ user: engineer }, { name: `Report bench ${tag}`, purpose: "browser test of the build report" });
  const input = designInputSchema.parse({
    name: `Colpitts 370k ${tag}`,
    topology: "colpitts",
    parts: { L: { value: "100u", tolerance: "5%" }, C1: { value: "2n2", tolerance: "5%" }, C2: { value: "12n", tolerance: "5%" } },
    spec: { targetHz: "370k", toleranceValue: "2", toleranceUnit: "percent", maxHarmonicDbc: "-35", maxThdPercent: "5" },
  });
  const design = await createDesign({ user: engineer }, project.id, input);
  buildLabel = `BB-${tag}`;
  const build = await createBuild({ user: technician }, design.id, { label: buildLabel, kind: "breadboard", kindRevision: "" });
  buildId = build.id;
  const first = await upload(technician, 388_000, 21, "report-first.csv");
  await waitAnalysed(first);
  const tweak = await logTweak({ user: technician }, buildId, { partRef: "C2", toValue: "15n", note: "pull it down" });
  const second = await upload(technician, 381_500, 22, "report-c2-15n.csv", tweak.id);
  await waitAnalysed(second);
  browser = await launchBrowser();
}, 180_000);

afterAll(async () => {
  await browser?.close();
  await stopSender();
  await closeDb();
  await closeLucia();
});

describe("build report in Chromium", () => {
  it("renders_the_report_prints_without_navigation_and_saves_a_pdf", async () => {
    const context = await signedInContext(browser, engineer);
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto(`${appUrl()}/builds/${buildId}/report`, { waitUntil: "networkidle" });

    await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toContain(buildLabel);
    for (const title of ["Design and spec", "As built", "Prediction and bands", "Drift over tweaks", "Runs", "Flags", "Sign-off"]) {
      await expect(page.getByRole("heading", { level: 2, name: new RegExp(title) }).count()).resolves.toBeGreaterThan(0);
    }
    // Both charts drew on their canvases, and the tweak between the runs is marked.
    await page.waitForSelector(".tb-uplot canvas");
    expect(await page.locator(".tb-uplot canvas").count()).toBeGreaterThanOrEqual(2);
    await expect(page.getByText("C2 12 nF → 15 nF").first().isVisible()).resolves.toBe(true);
    await expect(page.getByRole("table", { name: /Runs of this build/ }).locator("tbody tr").count()).resolves.toBe(2);
    await keepScreenshot(page, "build-report");

    const nav = page.getByRole("navigation", { name: "Primary" });
    await expect(nav.isVisible()).resolves.toBe(true);
    await page.emulateMedia({ media: "print" });
    await expect(nav.isVisible()).resolves.toBe(false);
    await expect(page.getByRole("button", { name: /Print or save as PDF/ }).isVisible()).resolves.toBe(false);
    await expect(page.getByRole("heading", { level: 1 }).isVisible()).resolves.toBe(true);

    const pdf = await page.pdf({ format: "A4", printBackground: true });
    expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    expect(pdf.length).toBeGreaterThan(20_000);
    const dir = path.join(process.cwd(), "test-artifacts");
    mkdirSync(dir, { recursive: true });
    writeFileSync(path.join(dir, "build-report.pdf"), pdf);

    expect(errors).toEqual([]);
    await context.close();
  });
});
