import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { captureCsv, uploadCapture, waitForRun } from "../../integration/api/helpers";
import { launchBrowser } from "../../helpers/browser";
import { appUrl } from "../../helpers/stack";
import { expectAccessible, expectNoHorizontalOverflow, freshPage, journeyPerson, scene, signIn, type JourneyPerson, type Scene } from "./helpers";

// Every page of the signed-in shell, as an admin (who sees every control), loaded at 1280 px and at 390 px:
// no horizontal overflow and no serious axe finding on names, labels or contrast.

let browser: Browser;
let admin: JourneyPerson;
let world: Scene;
let runIds: string[];

beforeAll(async () => {
  admin = await journeyPerson("admin", "journey-sweep");
  const technician = await journeyPerson("technician", "journey-sweep-tech");
  world = await scene(admin, technician, "Sweep");
  runIds = [];
  for (const [hz, seed] of [[409e3, 8401], [395e3, 8402]] as const) {
    const res = await uploadCapture(world.buildId, technician, captureCsv(hz, seed));
    expect(res.status, res.text).toBe(201);
    runIds.push(res.body.id);
    await waitForRun(res.body.id, technician);
  }
  browser = await launchBrowser();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await closeDb();
  await closeLucia();
});

function pages(): string[] {
  const design = `/projects/${world.projectId}/designs/${world.designId}`;
  return [
    "/dashboard",
    "/projects",
    `/projects/${world.projectId}`,
    `/projects/${world.projectId}/designs/new`,
    design,
    `${design}/edit`,
    `/builds/${world.buildId}`,
    `/builds/${world.buildId}/report`,
    `/runs/${runIds[0]}`,
    `/runs/${runIds[1]}`,
    `/runs/compare?a=${runIds[0]}&b=${runIds[1]}`,
    "/people",
    "/audit",
    "/profile",
    "/api-docs",
  ];
}

describe("every signed-in page", () => {
  for (const width of [1280, 390]) {
    it(`fits a ${width} px window and names its controls`, async () => {
      const { page, context, errors } = await freshPage(browser, width);
      await signIn(page, admin);
      for (const path of pages()) {
        await page.goto(`${appUrl()}${path}`, { waitUntil: "networkidle" });
        await expectNoHorizontalOverflow(page, `${path} at ${width} px`);
        await expectAccessible(page, `${path} at ${width} px`);
      }
      expect(errors).toEqual([]);
      await context.close();
    }, 180_000);
  }
});
