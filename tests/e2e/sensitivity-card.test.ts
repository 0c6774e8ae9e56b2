import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import type { User } from "@/db/queries/users";
import { closeLucia } from "@/lib/auth/lucia";
import type { Role } from "@/lib/auth/permissions";
import { stopSender } from "@/lib/jobs/queue";
import { createDesign } from "@/lib/logbook/designs";
import { createProject } from "@/lib/logbook/projects";
import { designInputSchema } from "@/lib/validations/design";
import { seedSensitivityBuild } from "../../scripts/seed/sensitivity";
import { launchBrowser } from "../helpers/browser";
import { appUrl } from "../helpers/stack";
import { checkFinalPage, freshPage, journeyPerson, signIn, type JourneyPerson } from "./journeys/helpers";

// The build page's Sensitivity card in Chromium with the demo's characterised build: the test database has no demo
// seed, so the demo step's own generator (scripts/seed/sensitivity.ts) adds PCB-A2 to a copy of the demo's Colpitts
// 370 kHz design, the stack's worker analyses its captures, and a viewer reads the card at 1280 and 390 px.

const tag = Math.random().toString(16).slice(2, 8);
let browser: Browser;
let viewer: JourneyPerson;
let buildId: string;
let seedSeconds = 0;

function asUser(p: JourneyPerson): User {
  return { id: p.id, email: p.email, name: p.name, role: p.role, status: "active", createdAt: new Date(), lastSeenAt: null };
}

beforeAll(async () => {
  const [engineer, technician] = await Promise.all([journeyPerson("engineer", `sens-eng-${tag}`), journeyPerson("technician", `sens-tech-${tag}`)]);
  viewer = await journeyPerson("viewer", `sens-view-${tag}`);
  const project = await createProject({ user: asUser(engineer) }, { name: `Sensitivity bench ${tag}`, purpose: "browser test of the Sensitivity card" });
  // The demo's Colpitts 370 kHz (scripts/seed/logbook.ts): C0G capacitors, an inductor with no tempco entered.
  const input = designInputSchema.parse({
    name: `Colpitts 370 kHz ${tag}`,
    topology: "colpitts",
    parts: { L: { value: "100u", tolerance: "10%" }, C1: { value: "2n2", tolerance: "5%", tempco: "C0G" }, C2: { value: "12n", tolerance: "5%", tempco: "C0G" } },
    spec: { targetHz: "370k", toleranceValue: "2", toleranceUnit: "percent", maxThdPercent: "5", maxHarmonicDbc: "-30" },
  });
  const design = await createDesign({ user: asUser(engineer) }, project.id, input);
  const started = Date.now();
  const accounts = { technician: asUser(technician) } as Record<Role, User>;
  const seeded = await seedSensitivityBuild({ accounts, log: () => undefined }, design.id, new Date(Date.now() - 12 * 3600 * 1000));
  seedSeconds = (Date.now() - started) / 1000;
  buildId = seeded.buildId;
  const until = Date.now() + 150_000;
  for (;;) {
    const rows: { status: string }[] = await db()("runs").where({ build_id: buildId }).select("status");
    if (rows.length === seeded.runs && rows.every((r) => r.status === "done" || r.status === "failed")) {
      expect(rows.filter((r) => r.status === "failed")).toEqual([]);
      break;
    }
    if (Date.now() > until) throw new Error(`the ${seeded.runs} demo captures were not all analysed in time: is the stack's worker running?`);
    await new Promise((r) => setTimeout(r, 300));
  }
  console.log(`sensitivity demo build: ${seeded.runs} captures stored and queued in ${seedSeconds.toFixed(1)} s, analysed after ${((Date.now() - started) / 1000).toFixed(1)} s`);
  browser = await launchBrowser();
}, 240_000);

afterAll(async () => {
  await browser?.close();
  await stopSender();
  await closeDb();
  await closeLucia();
});

describe("the Sensitivity card with the demo's characterised build", () => {
  it("shows pushing, the tempco against the parts and run-to-run stability, with both charts, at 1280 and 390 px", async () => {
    const { context, page, errors } = await freshPage(browser, 1280);
    await signIn(page, viewer);
    await page.goto(`${appUrl()}/builds/${buildId}`, { waitUntil: "networkidle" });
    const card = page.locator("section#sensitivity");
    await expect(card.getByRole("heading", { name: "Sensitivity" }).isVisible()).resolves.toBe(true);
    const text = (await card.textContent()) ?? "";

    // The planted −12 ppm/V and −45 ppm/K come back (the card rounds to the 1σ's second figure).
    const pushing = /Pushing \(frequency against supply\)([−+-]?\d+\.?\d*) ± (\d+\.?\d*) ppm\/V/.exec(text);
    expect(pushing, text.slice(0, 600)).not.toBeNull();
    expect(Number(pushing![1].replace("−", "-"))).toBeGreaterThan(-14);
    expect(Number(pushing![1].replace("−", "-"))).toBeLessThan(-10);
    const tempco = /measured ([−+-]?\d+\.?\d*) ± (\d+\.?\d*) ppm\/K; the parts predict/.exec(text);
    expect(tempco, text.slice(0, 900)).not.toBeNull();
    expect(Number(tempco![1].replace("−", "-"))).toBeGreaterThan(-47);
    expect(Number(tempco![1].replace("−", "-"))).toBeLessThan(-43);
    expect(text).toContain("L has no tempco entered");
    expect(text).toContain("V/V");

    // Two scatter charts drew; the run-to-run table has the quiet set and the set that wandered after the move.
    expect(await card.locator(".tb-uplot canvas").count()).toBe(2);
    const table = card.getByRole("table", { name: "Run-to-run stability of repeated runs" });
    await expect(table.locator("tbody tr").count()).resolves.toBe(2);
    await expect(table.getByText("Within 1σ").count()).resolves.toBe(1);
    await expect(table.getByText("Unexplained scatter").count()).resolves.toBe(1);
    // The power-up capture is left out of the fits, with its reason.
    await card.getByText(/Runs left out \(1\)/).click();
    await expect(card.getByText(/pcba2-power-up\.csv/).isVisible()).resolves.toBe(true);

    await checkFinalPage(page, "build-sensitivity");
    await page.setViewportSize({ width: 390, height: 900 });
    await expect(card.getByRole("heading", { name: "Sensitivity" }).isVisible()).resolves.toBe(true);
    expect(await card.locator(".tb-uplot canvas").count()).toBe(2);
    // On a phone the repeat sets are a list, not a seven-column table.
    const list = card.getByRole("list", { name: "Run-to-run stability of repeated runs" });
    await expect(list.locator("li").count()).resolves.toBe(2);
    await expect(list.getByText("Unexplained scatter").isVisible()).resolves.toBe(true);
    await expect(table.isVisible()).resolves.toBe(false);
    expect(errors).toEqual([]);
    await context.close();
  });
});
