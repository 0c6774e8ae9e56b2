import { writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { synthCaptureCsv } from "../../../scripts/lib/synth-capture";
import { launchBrowser } from "../../helpers/browser";
import { appUrl } from "../../helpers/stack";
import { checkFinalPage, freshPage, journeyPerson, scene, signIn, tabTo, type JourneyPerson, type Scene } from "./helpers";

// A technician signs in, opens a build through the project, uploads a capture from the bench with the progress
// bar showing, watches it analyse, and reads the verdict: 409 kHz against 411 kHz ± 2 % is a pass.

let browser: Browser;
let technician: JourneyPerson;
let world: Scene;
let capturePath: string;

beforeAll(async () => {
  const engineer = await journeyPerson("engineer", "journey-tech-eng");
  technician = await journeyPerson("technician", "journey-tech");
  world = await scene(engineer, technician, "Tech journey");
  // About 2 MB: long enough on a throttled link for the progress bar to be seen moving.
  capturePath = path.join(os.tmpdir(), `journey-capture-${process.pid}.csv`);
  writeFileSync(capturePath, synthCaptureCsv({ frequencyHz: 409e3, sampleRateHz: 20e6, samples: 80_000, amplitudeV: 1.1, harmonicsDbc: [-36, -48], noiseVrms: 0.002, seed: 8101 }));
  browser = await launchBrowser();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await closeDb();
  await closeLucia();
});

describe("technician journey", () => {
  it("opens a build, uploads a capture with the progress bar, watches it analyse and reads a pass", async () => {
    const { context, page, errors } = await freshPage(browser);
    await signIn(page, technician);

    await page.getByRole("link", { name: "Projects", exact: true }).first().click();
    await page.getByRole("link", { name: world.projectName }).click();
    await page.waitForURL(new RegExp(`/projects/${world.projectId}$`));
    await page.getByRole("link", { name: world.buildLabel }).first().click();
    await page.waitForURL(new RegExp(`/builds/${world.buildId}$`));

    const form = page.getByRole("form", { name: "Upload a capture" });
    await form.waitFor();
    await form.locator('input[type="file"]').setInputFiles(capturePath);
    await form.getByText(path.basename(capturePath)).waitFor();

    // The submit button is reached and pressed from the keyboard.
    await form.locator('input[type="file"]').focus();
    await tabTo(page, (el) => el.tag === "button" && el.text === "Upload and analyse", "the upload button");
    await page.keyboard.press("Enter");
    await page.waitForURL(/\/runs\/[0-9a-f-]{36}$/, { timeout: 60_000 });

    // Queued or analysing first, then the verdict.
    await page.getByText("Spec verdict").waitFor({ timeout: 90_000 });
    const header = page.locator("main").first();
    await header.getByText(/^\W*Pass$/).first().waitFor();
    await page.getByText(/409[.,]\d+ kHz/).first().waitFor();
    await checkFinalPage(page, "technician-run");
    expect(errors).toEqual([]);
    await context.close();
  }, 180_000);

  it("shows the upload's progress while the bytes go out", async () => {
    const { context, page, errors } = await freshPage(browser);
    await signIn(page, technician);
    await page.goto(`${appUrl()}/builds/${world.buildId}`);
    const form = page.getByRole("form", { name: "Upload a capture" });
    const second = capturePath.replace(/\.csv$/, "-2.csv");
    writeFileSync(second, synthCaptureCsv({ frequencyHz: 409.2e3, sampleRateHz: 20e6, samples: 80_000, amplitudeV: 1.1, harmonicsDbc: [-36, -48], noiseVrms: 0.002, seed: 8102 }));
    await form.locator('input[type="file"]').setInputFiles(second);
    const cdp = await context.newCDPSession(page);
    await cdp.send("Network.enable");
    await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: 500_000 });
    await form.getByRole("button", { name: "Upload and analyse" }).click();
    const bar = page.getByRole("progressbar", { name: "Upload progress" });
    await bar.waitFor({ timeout: 20_000 });
    const values: number[] = [];
    for (let i = 0; i < 40 && (await bar.count()) > 0; i++) {
      // The bar can go between count() and getAttribute (the upload finished): null then, which is not a reading of 0.
      const raw = await bar.getAttribute("aria-valuenow", { timeout: 1_000 }).catch(() => null);
      const now = raw === null ? Number.NaN : Number(raw);
      if (Number.isFinite(now) && values[values.length - 1] !== now) values.push(now);
      await page.waitForTimeout(150);
    }
    expect(values.length, `progress values seen: ${values.join(", ")}`).toBeGreaterThanOrEqual(2);
    expect(values.every((v, i) => i === 0 || v >= values[i - 1]), `progress values seen: ${values.join(", ")}`).toBe(true);
    await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });
    await page.waitForURL(/\/runs\/[0-9a-f-]{36}$/, { timeout: 60_000 });
    expect(errors).toEqual([]);
    await context.close();
  }, 120_000);
});
