import { mkdirSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { api, captureCsv, sendJson, uploadCapture, waitForRun } from "../../integration/api/helpers";
import { launchBrowser } from "../../helpers/browser";
import { appUrl } from "../../helpers/stack";
import { expectNoHorizontalOverflow, freshPage, journeyPerson, scene, signIn, type JourneyPerson, type Scene } from "./helpers";

// Two things a first-time user found broken: a planned tweak had no control that applies it, and the People
// page's role select kept showing the old role after "Role saved." (a second Save then sent the old role back).

let browser: Browser;
let admin: JourneyPerson;
let engineer: JourneyPerson;
let technician: JourneyPerson;
let world: Scene;

beforeAll(async () => {
  admin = await journeyPerson("admin", "fix-admin");
  engineer = await journeyPerson("engineer", "fix-eng");
  technician = await journeyPerson("technician", "fix-tech");
  world = await scene(engineer, technician, "Bench fixes");
  browser = await launchBrowser();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await closeDb();
  await closeLucia();
});

describe("the bench workflow fixes", () => {
  it("a technician applies a planned tweak from the build page once the part is fitted", async () => {
    const planned = await sendJson("post", `/api/v1/builds/${world.buildId}/tweaks`, technician, { partRef: "C2", toValue: "5n6", planned: true, note: "retune" });
    expect(planned.status, planned.text).toBe(201);

    const { page, context, errors } = await freshPage(browser);
    await signIn(page, technician);
    await page.goto(`${appUrl()}/builds/${world.buildId}`);
    const apply = page.getByRole("button", { name: /^Apply the planned tweak C2/ });
    await apply.waitFor({ timeout: 30_000 });
    await apply.click();
    // The page re-renders with the tweak applied: its row reads "Tweak:" and has no apply control left.
    await page.getByRole("button", { name: /^Apply the planned tweak C2/ }).waitFor({ state: "detached", timeout: 30_000 });
    expect(await page.getByText("Planned tweak:").count()).toBe(0);
    await page.getByRole("row").filter({ hasText: "Tweak: " }).filter({ hasText: "C2" }).first().waitFor();

    const build = await api("get", `/api/v1/builds/${world.buildId}`, technician);
    expect(build.body.asBuilt.C2.valueSi).toBeCloseTo(5.6e-9, 20);
    const tweaks = await api("get", `/api/v1/builds/${world.buildId}/tweaks`, technician);
    expect(tweaks.body.items.find((t: { id: string }) => t.id === planned.body.id)).toMatchObject({ planned: false });
    expect(errors).toEqual([]);
    await context.close();
  }, 120_000);

  it("a viewer sees no apply control", async () => {
    const viewer = await journeyPerson("viewer", "fix-viewer");
    const planned = await sendJson("post", `/api/v1/builds/${world.buildId}/tweaks`, technician, { partRef: "C1", toValue: "2n7", planned: true });
    expect(planned.status, planned.text).toBe(201);
    const { page, context } = await freshPage(browser);
    await signIn(page, viewer);
    await page.goto(`${appUrl()}/builds/${world.buildId}`);
    await page.getByText("Planned tweak:").first().waitFor({ timeout: 30_000 });
    expect(await page.getByRole("button", { name: /^Apply the planned tweak/ }).count()).toBe(0);
    await context.close();
  }, 120_000);

  it("the role select shows the saved role after 'Role saved.' and a second Save keeps it", async () => {
    const person = await journeyPerson("viewer", "fix-role");
    const { page, context, errors } = await freshPage(browser);
    await signIn(page, admin);
    await page.goto(`${appUrl()}/people`);
    const select = page.getByLabel(`Role of ${person.name}`, { exact: true });
    const save = page.getByRole("button", { name: `Save the role of ${person.name}` });
    await select.selectOption("engineer");
    await save.click();
    const row = page.getByRole("row").filter({ has: select });
    await row.getByText("Role saved.").waitFor({ timeout: 30_000 });
    expect(await page.getByLabel(`Role of ${person.name}`, { exact: true }).inputValue()).toBe("engineer");
    expect((await db()("auth_user").where({ id: person.id }).first()).role).toBe("engineer");

    // The second Save posts the action again; its answer, not the message already on screen, ends the wait.
    await Promise.all([
      page.waitForResponse((r) => r.request().method() === "POST" && new URL(r.url()).pathname === "/people", { timeout: 30_000 }),
      page.getByRole("button", { name: `Save the role of ${person.name}` }).click(),
    ]);
    await row.getByText("Role saved.").waitFor({ timeout: 30_000 });
    await expect.poll(async () => (await db()("auth_user").where({ id: person.id }).first()).role, { timeout: 10_000 }).toBe("engineer");
    expect(await page.getByLabel(`Role of ${person.name}`, { exact: true }).inputValue()).toBe("engineer");
    await page.reload();
    expect(await page.getByLabel(`Role of ${person.name}`, { exact: true }).inputValue()).toBe("engineer");
    expect(errors).toEqual([]);
    await context.close();
  }, 120_000);

  it("a deep zoom of the waveform draws the stored samples", async () => {
    // 20 000 samples at 50 MS/s: four halvings of the view leave 1250 samples, under the 4000 that fetch them.
    const res = await uploadCapture(world.buildId, technician, captureCsv(411e3, 4242));
    expect(res.status, res.text).toBe(201);
    expect((await waitForRun(res.body.id, technician)).status).toBe("done");
    const { page, context, errors } = await freshPage(browser);
    await signIn(page, engineer);
    await page.goto(`${appUrl()}/runs/${res.body.id}`);
    const chart = page.getByRole("img", { name: /^Waveform of/ });
    await chart.waitFor({ timeout: 60_000 });
    await chart.focus();
    const excerpt = page.waitForResponse((r) => new URL(r.url()).pathname === `/api/v1/runs/${res.body.id}/excerpt`, { timeout: 30_000 });
    for (let i = 0; i < 4; i++) await page.keyboard.press("+");
    expect((await excerpt).status()).toBe(200);
    const samples = page.getByTestId("waveform-samples");
    await samples.waitFor({ timeout: 30_000 });
    expect(Number(/^(\d+) samples/.exec((await samples.textContent()) ?? "")?.[1])).toBeGreaterThan(1000);
    await page.getByRole("button", { name: "Back to the whole record" }).click();
    await page.getByRole("img", { name: /^Waveform of/ }).waitFor();
    expect(errors).toEqual([]);
    await context.close();
  }, 120_000);

  it("the upload form refuses a PNG and a file without a clock before uploading", async () => {
    const dir = path.join(os.tmpdir(), `bench-fixes-${process.pid}`);
    const png = path.join(dir, "scope.png");
    const zeit = path.join(dir, "zeit.csv");
    rmSync(dir, { recursive: true, force: true });
    mkdirSync(dir, { recursive: true });
    writeFileSync(png, Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]));
    writeFileSync(zeit, "Zeit (s);Kanal 1 (V)\n" + Array.from({ length: 100 }, (_, i) => `${i};0,${i % 10}`).join("\n") + "\n");
    const { page, context, errors } = await freshPage(browser);
    await signIn(page, technician);
    await page.goto(`${appUrl()}/builds/${world.buildId}`);
    const form = page.getByRole("form", { name: "Upload a capture" });
    await form.locator('input[type="file"]').setInputFiles(png);
    await form.getByRole("alert").filter({ hasText: /binary/ }).waitFor({ timeout: 30_000 });
    expect(await form.getByRole("button", { name: "Upload and analyse" }).isDisabled()).toBe(true);
    await form.locator('input[type="file"]').setInputFiles(zeit);
    await form.getByRole("alert").filter({ hasText: /No time column/ }).waitFor({ timeout: 30_000 });
    expect(await form.getByRole("button", { name: "Upload and analyse" }).isDisabled()).toBe(true);
    rmSync(dir, { recursive: true, force: true });
    expect(errors).toEqual([]);
    await context.close();
  }, 60_000);

  it("the compare page at 390 px shows the verdicts, the target, B − A and the judgement without sideways scrolling", async () => {
    const first = await uploadCapture(world.buildId, technician, captureCsv(400e3, 5151));
    const second = await uploadCapture(world.buildId, technician, captureCsv(410e3, 5152));
    for (const res of [first, second]) {
      expect(res.status, res.text).toBe(201);
      expect((await waitForRun(res.body.id, technician)).status).toBe("done");
    }
    const { page, context, errors } = await freshPage(browser, 390);
    await signIn(page, engineer);
    await page.goto(`${appUrl()}/runs/compare?a=${first.body.id}&b=${second.body.id}`);
    const list = page.locator("dl", { has: page.getByText("Target frequency") });
    await list.waitFor({ timeout: 30_000 });
    await list.getByText("Verdict", { exact: true }).waitFor();
    // 400 kHz is outside 411 kHz ± 2 % (402.78..419.22 kHz) and 410 kHz inside: B is on target, whatever moved.
    const measured = list.locator(":scope > div").filter({ has: page.getByText("Measured frequency", { exact: true }) });
    await measured.getByText("B on target, A off target").waitFor();
    expect(await measured.getByText("B − A").isVisible()).toBe(true);
    await expectNoHorizontalOverflow(page, "compare at 390 px");
    expect(errors).toEqual([]);
    await context.close();
  }, 180_000);
});
