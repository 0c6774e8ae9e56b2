import { generateIdFromEntropySize } from "lucia";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { createUser } from "@/db/queries/users";
import { closeLucia } from "@/lib/auth/lucia";
import { hashPassword } from "@/lib/auth/password";
import { keepScreenshot, launchBrowser, signedInContext, watchErrors } from "../helpers/browser";
import { appUrl } from "../helpers/stack";
import { logSegments, makeDesign, makeLayoutBuild, makePerson, tag } from "../integration/layouts/fixtures";

// The new-design form's "start from a target" step and the new-build form's two predictions, in Chromium, signed
// in as an engineer. The lab's figure comes from three steady PCBs of a revision of their own (stored straight
// through db/queries, no worker).

const PASSWORD = "proposal page test 2026";
let browser: Browser;
let email: string;
let projectId: string;
let designId: string;
let revision: string;

beforeAll(async () => {
  email = `proposal-engineer-${tag()}@layouts-tests.test`;
  await createUser({ id: generateIdFromEntropySize(10), email, name: "Proposal engineer", role: "engineer", passwordHash: await hashPassword(PASSWORD) });
  const engineer = await makePerson("engineer");
  const design = await makeDesign(engineer);
  projectId = design.projectId;
  designId = design.id;
  revision = `rev ${tag()}`;
  for (const v of [20, 22, 24]) {
    const fx = await makeLayoutBuild({ owner: engineer, design, revision });
    await logSegments(fx, engineer, [[v], [v]]);
  }
  browser = await launchBrowser();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await closeDb();
  await closeLucia();
});

describe("proposing values and predicting a new build in Chromium", () => {
  it.each([1280, 390])("proposes_accepts_and_predicts_at_%i_px", { timeout: 60_000 }, async (width) => {
    const context = await signedInContext(browser, { email, password: PASSWORD }, width);
    const page = await context.newPage();
    const errors = watchErrors(page);

    await page.goto(`${appUrl()}/projects/${projectId}/designs/new`, { waitUntil: "networkidle" });
    const step = page.getByRole("region", { name: "Start from a target" });
    await step.getByLabel("Target frequency").fill("1M");
    await step.getByLabel("Series").selectOption("E12");
    // From the keyboard: the button takes Enter.
    await step.getByRole("button", { name: "Propose values" }).press("Enter");
    const use = step.getByRole("button", { name: /^Use L / });
    await use.first().waitFor({ timeout: 15_000 });
    await expect(use.count()).resolves.toBe(3);
    const label = (await use.first().getAttribute("aria-label"))!;
    const l = /L ([^,]+),/.exec(label)![1];
    await use.first().press("Enter");
    await expect(page.locator("#part-L-value").inputValue()).resolves.toBe(l);
    await expect(page.locator("#part-C1-value").inputValue()).resolves.not.toBe("");
    // The values stay editable.
    await page.locator("#part-C1-value").fill("1n");
    await expect(page.locator("#part-C1-value").inputValue()).resolves.toBe("1n");
    await keepScreenshot(page, `design-proposal-${width}`);

    // The new-build form: picking the PCB revision shows both predictions with the lab's 22 pF median.
    await page.goto(`${appUrl()}/projects/${projectId}/designs/${designId}`, { waitUntil: "networkidle" });
    await page.getByRole("button", { name: /New build/ }).click();
    await page.locator("#build-kind").selectOption("pcb");
    await page.locator("#build-kind-revision").fill(revision.toUpperCase());
    const prediction = page.getByRole("region", { name: /Predicted for PCB/ });
    await expect(prediction.getByText("As designed").first().isVisible()).resolves.toBe(true);
    await expect(prediction.getByText(/As it will likely measure on PCB/).isVisible()).resolves.toBe(true);
    await expect(prediction.getByText("+22.0 pF").first().isVisible()).resolves.toBe(true);
    await page.locator("#build-kind").selectOption("perfboard");
    await expect(page.getByRole("region", { name: /Predicted for Perfboard/ }).getByText(/only the prediction as\s+designed is known/).isVisible()).resolves.toBe(true);
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    expect(errors).toEqual([]);
    await context.close();
  });
});
