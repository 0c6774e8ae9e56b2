import { writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { synthCaptureCsv } from "../../../scripts/lib/synth-capture";
import { captureCsv, uploadCapture, waitForRun } from "../../integration/api/helpers";
import { launchBrowser } from "../../helpers/browser";
import { appUrl } from "../../helpers/stack";
import { checkFinalPage, freshPage, journeyPerson, scene, signIn, type JourneyPerson, type Scene } from "./helpers";

// An engineer tightens a design's spec so the board's 409 kHz falls outside it, sees the next analysed capture
// fail where the earlier one passed, re-analyses the earlier one and sees its verdict change to fail against the
// new spec, and accepts the build with the reason a flagged build needs.

let browser: Browser;
let engineer: JourneyPerson;
let world: Scene;
let firstRunId: string;

beforeAll(async () => {
  engineer = await journeyPerson("engineer", "journey-eng");
  const technician = await journeyPerson("technician", "journey-eng-tech");
  world = await scene(engineer, technician, "Eng journey");
  const first = await uploadCapture(world.buildId, technician, captureCsv(409e3, 8201));
  expect(first.status, first.text).toBe(201);
  firstRunId = first.body.id;
  expect((await waitForRun(firstRunId, technician)).verdict).toBe("pass");
  browser = await launchBrowser();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await closeDb();
  await closeLucia();
});

describe("engineer journey", () => {
  it("edits the spec, sees the next capture fail against it, re-analyses, and accepts the build with a reason", async () => {
    const { page, context, errors } = await freshPage(browser);
    await signIn(page, engineer);

    // Edit the spec: 400 kHz ± 1 % leaves 409 kHz 2.25 % high.
    await page.goto(`${appUrl()}/projects/${world.projectId}/designs/${world.designId}`);
    await page.getByRole("link", { name: "Edit design" }).click();
    await page.waitForURL(/\/edit$/);
    await page.getByLabel("Target frequency").fill("400k");
    await page.getByLabel("Frequency tolerance ±").fill("1");
    const note = page.getByLabel("What changed, and why");
    if (await note.count()) await note.fill("Tighter band for the product board");
    await page.getByRole("button", { name: "Save as a new revision" }).click();
    await page.waitForURL(new RegExp(`/designs/${world.designId}$`), { timeout: 20_000 });
    const design = await db()("designs").where({ id: world.designId }).first();
    expect(design.current_revision).toBe(2);

    // The next capture of the same board is judged against revision 2, and fails.
    await page.goto(`${appUrl()}/builds/${world.buildId}`);
    const file = path.join(os.tmpdir(), `journey-eng-${process.pid}.csv`);
    writeFileSync(file, synthCaptureCsv({ frequencyHz: 409e3, sampleRateHz: 50e6, samples: 20_000, amplitudeV: 1.2, harmonicsDbc: [-32, -45], noiseVrms: 0.002, seed: 8202 }));
    const form = page.getByRole("form", { name: "Upload a capture" });
    await form.locator('input[type="file"]').setInputFiles(file);
    await form.getByRole("button", { name: "Upload and analyse" }).click();
    await page.waitForURL(/\/runs\/[0-9a-f-]{36}$/, { timeout: 60_000 });
    await page.getByText("Spec verdict").waitFor({ timeout: 90_000 });
    await page.locator("main").getByText(/^\W*Fail$/).first().waitFor();
    await page.getByText(/spec of design revision 2/).waitFor();

    // The earlier run passed under revision 1; re-analysed, it is judged by revision 2 and its verdict changes.
    await page.goto(`${appUrl()}/runs/${firstRunId}`);
    await page.getByText(/spec of design revision 1, as it was when the capture was logged/).waitFor();
    await page.getByRole("button", { name: /Re-analyse/ }).click();
    await page.getByText(/spec of design revision 2, as it was at the last re-analysis/).waitFor({ timeout: 90_000 });
    await page.getByText("Spec verdict").waitFor({ timeout: 90_000 });
    await page.locator("main").getByText(/^\W*Fail$/).first().waitFor();
    for (let i = 0; i < 40 && (await db()("runs").where({ id: firstRunId }).first()).verdict !== "fail"; i++) await page.waitForTimeout(250);
    const rejudged = await db()("runs").where({ id: firstRunId }).first();
    expect(rejudged.verdict).toBe("fail");
    expect(rejudged.snapshot.designRevision).toBe(1); // parts and prediction stay as logged
    expect(rejudged.snapshot.specRevision).toBe(2);

    // Accept the build: its latest run is flagged, so the form asks for the reason.
    await page.goto(`${appUrl()}/builds/${world.buildId}`);
    const signOff = page.getByRole("form", { name: "Sign off this build" });
    await signOff.waitFor();
    await signOff.getByLabel(/Reason for accepting a flagged build/).fill("The product board pulls it into the band with its trimmer.");
    await signOff.getByRole("button", { name: /Accept/ }).click();
    await page.getByText(/Accepted/).first().waitFor({ timeout: 20_000 });
    for (let i = 0; i < 20 && (await db()("builds").where({ id: world.buildId }).first()).status !== "accepted"; i++) await page.waitForTimeout(250);
    expect((await db()("builds").where({ id: world.buildId }).first()).status).toBe("accepted");
    await page.reload();
    await checkFinalPage(page, "engineer-build-accepted");
    expect(errors).toEqual([]);
    await context.close();
  }, 240_000);
});
