import { generateIdFromEntropySize } from "lucia";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { createUser } from "@/db/queries/users";
import { closeLucia } from "@/lib/auth/lucia";
import { hashPassword } from "@/lib/auth/password";
import { logSegments, makeDesign, makeLayoutBuild, makePerson, tag } from "../integration/layouts/fixtures";
import { keepScreenshot, launchBrowser, signedInContext, watchErrors } from "../helpers/browser";
import { appUrl } from "../helpers/stack";

// The Layouts page in real Chromium at a desk's width and a phone's. The figure's builds are stored straight
// through db/queries with analysed runs (no worker needed): five steady PCBs of a revision of their own.

const PASSWORD = "layouts page test 2026";
let browser: Browser;
let email: string;
let revision: string;
let firstBuildId: string;

beforeAll(async () => {
  email = `layouts-viewer-${tag()}@layouts-tests.test`;
  await createUser({ id: generateIdFromEntropySize(10), email, name: "Layouts viewer", role: "viewer", passwordHash: await hashPassword(PASSWORD) });
  const engineer = await makePerson("engineer");
  const design = await makeDesign(engineer);
  revision = `rev ${tag()}`;
  for (const [i, v] of [6, 7, 8, 9, 10].entries()) {
    const fx = await makeLayoutBuild({ owner: engineer, design, revision, label: `E2E-${i + 1}` });
    if (i === 0) firstBuildId = fx.buildId;
    await logSegments(fx, engineer, [[v, v], [v]]);
  }
  browser = await launchBrowser();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await closeDb();
  await closeLucia();
});

describe("Layouts page in Chromium", () => {
  it.each([1280, 390])("shows_the_figure_and_its_builds_at_%i_px", async (width) => {
    const context = await signedInContext(browser, { email, password: PASSWORD }, width);
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto(`${appUrl()}/layouts?kind=pcb&topology=tank`, { waitUntil: "networkidle" });

    await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toBe("Layouts");
    const card = page.getByRole("region", { name: new RegExp(`PCB ${revision}`) });
    await expect(card.count()).resolves.toBe(1);
    await expect(card.getByText("Trusted").first().isVisible()).resolves.toBe(true);
    // Hand: builds at 6, 7, 8, 9, 10 pF → median +8.0 pF.
    await expect(card.getByText("+8.0 pF").first().isVisible()).resolves.toBe(true);
    await expect(card.getByRole("table").locator("tbody tr").count()).resolves.toBe(5);
    // The page itself never scrolls sideways; a wide table scrolls inside its own box.
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    await keepScreenshot(page, `layouts-${width}`);

    await card.getByRole("link", { name: "Compare these builds" }).click();
    await page.waitForURL("**/builds/compare?ids=*");
    const table = page.getByRole("table", { name: /Builds compared/ });
    // A client-side navigation changes the URL before the page's data has streamed in.
    await table.waitFor({ timeout: 15_000 });
    await expect(table.locator("thead th").count()).resolves.toBe(6);
    await expect(table.getByText("Steady").first().isVisible()).resolves.toBe(true);
    await page.goBack({ waitUntil: "networkidle" });

    await card.getByRole("link", { name: "E2E-1" }).click();
    await page.waitForURL(`**/builds/${firstBuildId}`);
    expect(errors).toEqual([]);
    await context.close();
  });
});
