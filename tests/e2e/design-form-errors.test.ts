import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { launchBrowser } from "../helpers/browser";
import { appUrl } from "../helpers/stack";
import { freshPage, journeyPerson, scene, signIn, type JourneyPerson, type Scene } from "./journeys/helpers";

// Issue 15: the design form shows every problem at once on submit, moves focus to a summary that links to each
// field, and prints values in engineering notation with the unit; nothing absurd is stored.

let browser: Browser;
let engineer: JourneyPerson;
let world: Scene;

beforeAll(async () => {
  engineer = await journeyPerson("engineer", "design-errors-eng");
  const technician = await journeyPerson("technician", "design-errors-tech");
  world = await scene(engineer, technician, "Design errors");
  browser = await launchBrowser();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await closeDb();
  await closeLucia();
});

describe("design form error summary", () => {
  it("lists every problem, takes focus, links to each field and saves nothing", async () => {
    const { page, context, errors } = await freshPage(browser);
    await signIn(page, engineer);
    await page.goto(`${appUrl()}/projects/${world.projectId}/designs/${world.designId}/edit`);

    await page.getByLabel("Name").fill("");
    await page.locator("#part-L-value").fill("1e30");
    await page.locator("#part-C1-value").fill("banana");
    await page.getByLabel("Target frequency").fill("1e30");
    await page.getByRole("button", { name: "Save as a new revision" }).click();

    const summary = page.locator('[aria-labelledby="design-error-summary-title"]');
    await summary.waitFor({ timeout: 10_000 });
    await page.waitForFunction(() => document.activeElement?.getAttribute("aria-labelledby") === "design-error-summary-title");
    const text = (await summary.innerText()).replace(/\s+/g, " ");
    expect(text).toMatch(/4 things to fix before saving/);
    expect(text).toMatch(/Name: Give the design a name\./);
    expect(text).toMatch(/L value: Part L \(tank inductor\) must be from 1 nH to 10 H; got 1e30 H\./);
    expect(text).toMatch(/C1 value: "banana" is not a value/);
    expect(text).toMatch(/Target frequency: The target frequency must be from 100 mHz to 20 GHz; got 1e30 Hz\./);

    await summary.getByRole("link", { name: /^L value:/ }).click();
    expect(await page.evaluate(() => document.activeElement?.id)).toBe("part-L-value");
    await summary.getByRole("link", { name: /^Target frequency:/ }).click();
    expect(await page.evaluate(() => document.activeElement?.id)).toBe("spec-targetHz");

    // The inline messages say the same beside each field.
    expect(await page.locator("#part-L-value-error").innerText()).toMatch(/got 1e30 H/);

    const design = await db()("designs").where({ id: world.designId }).first();
    expect(design.current_revision).toBe(1);
    expect(errors).toEqual([]);
    await context.close();
  }, 90_000);
});
