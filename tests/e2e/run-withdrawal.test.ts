import { generateIdFromEntropySize } from "lucia";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { createUser } from "@/db/queries/users";
import { closeLucia } from "@/lib/auth/lucia";
import { hashPassword } from "@/lib/auth/password";
import { keepScreenshot, launchBrowser, signedInContext, watchErrors } from "../helpers/browser";
import { appUrl } from "../helpers/stack";
import { logAnalysedRun, logSegments, makeDesign, makeLayoutBuild, makePerson, pF, tag } from "../integration/layouts/fixtures";

// Withdrawing a run on its page and comparing builds with a chosen run, in real Chromium at a desk's width and a
// phone's, signed in as a technician. The runs are stored analysed straight through db/queries (no worker needed):
// a breadboard and a PCB of one design.

const PASSWORD = "withdraw page test 2026";
let browser: Browser;
let email: string;
let bbBuildId: string;
let pcbBuildId: string;
/** The breadboard's newest run (the one withdrawn) and the one before it (the default after the withdrawal). */
let newest: string;
let before: string;

beforeAll(async () => {
  email = `withdraw-tech-${tag()}@layouts-tests.test`;
  await createUser({ id: generateIdFromEntropySize(10), email, name: "Withdraw technician", role: "technician", passwordHash: await hashPassword(PASSWORD) });
  const engineer = await makePerson("engineer");
  const design = await makeDesign(engineer);
  const bb = await makeLayoutBuild({ owner: engineer, design, kind: "breadboard", revision: "", label: `BB-${tag()}` });
  const pcb = await makeLayoutBuild({ owner: engineer, design, revision: `rev ${tag()}`, label: `PCB-${tag()}` });
  bbBuildId = bb.buildId;
  pcbBuildId = pcb.buildId;
  await logSegments(pcb, engineer, [[4, 4.1], [4]]);
  await logSegments(bb, engineer, [[15, 15.2]]);
  before = await logAnalysedRun(bb, engineer, 15.1 * pF);
  newest = await logAnalysedRun(bb, engineer, 60 * pF, { thdPercent: 9.5 });
  browser = await launchBrowser();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await closeDb();
  await closeLucia();
});

describe("withdrawing a run and comparing a chosen run in Chromium", () => {
  it.each([1280, 390])("withdraws_restores_and_compares_at_%i_px", { timeout: 60_000 }, async (width) => {
    const context = await signedInContext(browser, { email, password: PASSWORD }, width);
    const page = await context.newPage();
    const errors = watchErrors(page);

    // Withdraw from the keyboard: the reason, Enter to go on, then the confirmation.
    await page.goto(`${appUrl()}/runs/${newest}`, { waitUntil: "networkidle" });
    await page.getByRole("button", { name: "Withdraw…" }).click();
    const reason = page.getByLabel("Why is this run withdrawn?");
    await expect(reason.evaluate((el) => el === document.activeElement)).resolves.toBe(true);
    await page.keyboard.type(`Probe on x1 at ${width} px`);
    await page.getByRole("button", { name: "Continue" }).press("Enter");
    const confirm = page.getByRole("button", { name: "Yes, withdraw the run" });
    await expect(confirm.evaluate((el) => el === document.activeElement)).resolves.toBe(true);
    await page.keyboard.press("Enter");
    const notice = page.getByTestId("run-withdrawn");
    await notice.waitFor({ timeout: 15_000 });
    await expect(notice.getByText(`Probe on x1 at ${width} px`).isVisible()).resolves.toBe(true);
    await keepScreenshot(page, `run-withdrawn-${width}`);

    // The build's list keeps the run, marked withdrawn.
    await page.goto(`${appUrl()}/builds/${bbBuildId}`, { waitUntil: "networkidle" });
    const marked = page.locator('[data-withdrawn="true"]');
    await expect(marked.count()).resolves.toBe(1);
    await expect(marked.first().textContent()).resolves.toContain(`Probe on x1 at ${width} px`);

    // The comparison defaults to the newest run that counts; choosing the withdrawn one shows it marked.
    await page.goto(`${appUrl()}/builds/compare?ids=${bbBuildId},${pcbBuildId}`, { waitUntil: "networkidle" });
    const table = page.getByRole("table", { name: /Builds compared/ });
    await expect(table.locator(`a[href="/runs/${before}"]`).count()).resolves.toBe(1);
    await expect(table.locator(`a[href="/runs/${newest}"]`).count()).resolves.toBe(0);
    await expect(page.locator("canvas").count()).resolves.toBeGreaterThan(0);
    const picker = page.locator(`#compare-run-${bbBuildId}`);
    await picker.selectOption(newest);
    await page.getByRole("button", { name: "Compare these runs" }).click();
    await page.waitForURL(`**/builds/compare?**runs=${newest}**`);
    await table.locator(`a[href="/runs/${newest}"]`).waitFor({ timeout: 15_000 });
    await expect(table.locator('[data-withdrawn="true"]').count()).resolves.toBe(1);
    await expect(table.getByText("chosen").first().isVisible()).resolves.toBe(true);
    await expect(page.getByRole("region", { name: "Harmonics overlaid" }).locator("canvas").count()).resolves.toBeGreaterThan(0);
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    await keepScreenshot(page, `compare-chosen-run-${width}`);

    // Restore, so the next width starts from the same logbook.
    await page.goto(`${appUrl()}/runs/${newest}`, { waitUntil: "networkidle" });
    await page.getByRole("button", { name: /Restore the run/ }).click();
    await page.getByRole("button", { name: "Withdraw…" }).waitFor({ timeout: 15_000 });
    expect(errors).toEqual([]);
    await context.close();
  });
});
