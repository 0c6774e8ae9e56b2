import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { captureCsv, uploadCapture, waitForRun } from "../../integration/api/helpers";
import { launchBrowser } from "../../helpers/browser";
import { appUrl } from "../../helpers/stack";
import { checkFinalPage, freshPage, journeyPerson, scene, signIn, tabTo, type JourneyPerson, type Scene } from "./helpers";

// A viewer reads the logbook: the pages show no upload, tweak, edit or sign-off controls, and what the viewer
// posts anyway from the signed-in browser is refused with a sentence naming the role needed.

let browser: Browser;
let viewer: JourneyPerson;
let world: Scene;
let runId: string;

beforeAll(async () => {
  viewer = await journeyPerson("viewer", "journey-viewer");
  const engineer = await journeyPerson("engineer", "journey-viewer-eng");
  const technician = await journeyPerson("technician", "journey-viewer-tech");
  world = await scene(engineer, technician, "Viewer journey");
  const run = await uploadCapture(world.buildId, technician, captureCsv(410e3, 8301));
  expect(run.status, run.text).toBe(201);
  runId = run.body.id;
  await waitForRun(runId, technician);
  browser = await launchBrowser();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await closeDb();
  await closeLucia();
});

describe("viewer journey", () => {
  it("sees no upload or edit controls, and is refused when posting anyway", async () => {
    const { page, context, errors } = await freshPage(browser);
    await signIn(page, viewer);

    await page.goto(`${appUrl()}/projects`);
    expect(await page.getByRole("button", { name: /New project/ }).count()).toBe(0);
    await page.goto(`${appUrl()}/projects/${world.projectId}/designs/${world.designId}`);
    await page.getByRole("heading", { level: 1 }).waitFor();
    expect(await page.getByRole("link", { name: "Edit design" }).count()).toBe(0);
    await page.goto(`${appUrl()}/runs/${runId}`);
    await page.getByText("Spec verdict").waitFor({ timeout: 30_000 });
    expect(await page.getByRole("button", { name: /Re-analyse/ }).count()).toBe(0);

    await page.goto(`${appUrl()}/builds/${world.buildId}`);
    await page.getByRole("heading", { level: 1 }).waitFor();
    for (const name of ["Upload a capture", "Log a tweak", "Sign off this build"]) expect(await page.getByRole("form", { name }).count(), name).toBe(0);
    expect(await page.locator('input[type="file"]').count()).toBe(0);
    // The run on the build can still be opened by keyboard.
    await tabTo(page, (el) => el.tag === "a" && el.href.startsWith("/runs/"), "the link to the run", 80);

    // Posting anyway, from the page, with the viewer's own session cookie.
    const refused = await page.evaluate(async (buildId) => {
      const form = new FormData();
      form.append("file", new Blob(["Time (s),Out (V)\n0,0.1\n1e-8,0.2\n"], { type: "text/csv" }), "viewer.csv");
      const upload = await fetch(`/api/v1/builds/${buildId}/runs`, { method: "POST", body: form });
      const slot = await fetch("/api/v1/uploads", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ buildId, filename: "viewer.csv", sizeBytes: 30 }) });
      const tweak = await fetch(`/api/v1/builds/${buildId}/tweaks`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ note: "a viewer's note" }) });
      return Promise.all([upload, slot, tweak].map(async (r) => ({ status: r.status, type: r.headers.get("content-type"), detail: (await r.json()).detail as string })));
    }, world.buildId);
    for (const r of refused) {
      expect(r.status).toBe(403);
      expect(r.type).toMatch(/problem\+json/);
      expect(r.detail).toMatch(/technician role or above; you are signed in as a viewer/);
    }
    expect(await db()("runs").where({ build_id: world.buildId }).count<{ count: string }[]>("* as count").then((c) => Number(c[0].count))).toBe(1);
    expect(await db()("tweaks").where({ build_id: world.buildId }).count<{ count: string }[]>("* as count").then((c) => Number(c[0].count))).toBe(0);

    await checkFinalPage(page, "viewer-build");
    expect(errors).toEqual([]);
    await context.close();
  }, 180_000);
});
