import { randomBytes } from "node:crypto";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { listHeldMessages } from "@/lib/mail/outbox";
import { launchBrowser } from "../../helpers/browser";
import { captureCsv, COLPITTS_PARTS, createRoleTeam, sendJson, uploadCapture, waitForRun, type ApiPerson, type Role } from "../api/helpers";
import { appUrl, createPerson, getPage, signedInCookie, submitForm, uniqueEmail, waitForMail } from "../auth/helpers";
import { liveMarkup, XSS_IMG, XSS_SCRIPT } from "./helpers";

// Stored text with markup in it (names, labels, notes, comments, file names) is shown as text on every page
// that shows it, in the printed report, and in the e-mails: checked in the HTML as served and in Chromium
// after the client has rendered (no dialog opens, no injected element exists).

const tag = randomBytes(3).toString("hex");
let team: Record<Role, ApiPerson>;
let adminCookie: string;
let ids: { projectId: string; designId: string; buildId: string; runId: string; failingRunId: string };
let browser: Browser;

beforeAll(async () => {
  team = await createRoleTeam(`xss-${tag}`);
  await db()("auth_user").where({ id: team.technician.id }).update({ name: `${XSS_IMG} Tech` });
  const project = await sendJson("post", "/api/v1/projects", team.engineer, { name: `${XSS_SCRIPT} P-${tag}`, purpose: `${XSS_IMG} purpose` });
  expect(project.status, project.text).toBe(201);
  const design = await sendJson("post", `/api/v1/projects/${project.body.id}/designs`, team.engineer, {
    name: `${XSS_IMG} D`,
    topology: "colpitts",
    parts: COLPITTS_PARTS,
    spec: { targetHz: "411k", toleranceValue: 2, toleranceUnit: "percent", maxHarmonicDbc: -30 },
  });
  expect(design.status, design.text).toBe(201);
  const revised = await sendJson("patch", `/api/v1/designs/${design.body.id}`, team.engineer, { changeNote: `${XSS_SCRIPT} change` });
  expect(revised.status, revised.text).toBe(200);
  const build = await sendJson("post", `/api/v1/designs/${design.body.id}/builds`, team.technician, { label: `${XSS_SCRIPT}B-${tag}`, kind: "breadboard", kindRevision: XSS_IMG });
  expect(build.status, build.text).toBe(201);
  const tweak = await sendJson("post", `/api/v1/builds/${build.body.id}/tweaks`, team.technician, { note: `${XSS_IMG} ${XSS_SCRIPT} tweak` });
  expect(tweak.status, tweak.text).toBe(201);
  const run = await uploadCapture(build.body.id, team.technician, captureCsv(409e3, 4401), { note: `${XSS_SCRIPT} run note` }, { filename: `${XSS_IMG}.csv` });
  expect(run.status, run.text).toBe(201);
  // Far below the 411 kHz ± 2 % target: flagged, so the build's maker is e-mailed about it.
  const failing = await uploadCapture(build.body.id, team.technician, captureCsv(300e3, 4402), { note: XSS_IMG }, { filename: `${XSS_SCRIPT}.csv` });
  expect(failing.status, failing.text).toBe(201);
  await waitForRun(run.body.id, team.viewer);
  await waitForRun(failing.body.id, team.viewer);
  const review = await sendJson("post", `/api/v1/builds/${build.body.id}/review`, team.engineer, { decision: "reject", comment: `${XSS_IMG} rejected` });
  expect(review.status, review.text).toBe(200);
  ids = { projectId: project.body.id, designId: design.body.id, buildId: build.body.id, runId: run.body.id, failingRunId: failing.body.id };
  const admin = await createPerson("admin", `xss-admin-${tag}`);
  adminCookie = await signedInCookie(admin);
  browser = await launchBrowser();
}, 180_000);

afterAll(async () => {
  await browser?.close();
  await closeDb();
  await closeLucia();
});

function pages(): string[] {
  return [
    "/dashboard",
    "/projects",
    `/projects?q=${encodeURIComponent("P-" + tag)}`,
    `/projects/${ids.projectId}`,
    `/projects/${ids.projectId}/designs/${ids.designId}`,
    `/projects/${ids.projectId}/designs/${ids.designId}/edit`,
    `/builds/${ids.buildId}`,
    `/builds/${ids.buildId}/report`,
    `/runs/${ids.runId}`,
    `/runs/${ids.failingRunId}`,
    "/audit",
  ];
}

describe("stored text on the pages", () => {
  it("is served escaped: no page holds the markup as markup, and the logbook pages show it as text", async () => {
    const shownAsText = "&lt;script&gt;alert(1)&lt;/script&gt;";
    for (const page of pages()) {
      const res = await getPage(page, adminCookie);
      expect(res.status, page).toBe(200);
      expect(liveMarkup(res.text), page).toEqual([]);
    }
    for (const page of [`/projects/${ids.projectId}`, `/builds/${ids.buildId}`, `/builds/${ids.buildId}/report`]) {
      expect((await getPage(page, adminCookie)).text, `${page} renders the stored text`).toContain(shownAsText);
    }
  });

  it("stays text after the client renders: no dialog opens and no injected element exists, at 1280 px and 390 px", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const [name, value] = adminCookie.split("=");
    await context.addCookies([{ name, value, url: appUrl() }]);
    const page = await context.newPage();
    const dialogs: string[] = [];
    page.on("dialog", (d) => {
      dialogs.push(`${page.url()}: ${d.message()}`);
      void d.dismiss();
    });
    for (const width of [1280, 390]) {
      await page.setViewportSize({ width, height: 900 });
      for (const path of pages()) {
        await page.goto(`${appUrl()}${path}`, { waitUntil: "networkidle" });
        const injected = await page.evaluate(() => document.querySelectorAll('img[src="x"], [onerror]').length);
        expect(injected, `${path} at ${width}px`).toBe(0);
      }
    }
    expect(dialogs).toEqual([]);
    await context.close();
  }, 120_000);
});

describe("stored text in the e-mails", () => {
  it("the invitation from an admin with markup in the name is escaped in its HTML part", async () => {
    const admin = await createPerson("admin", `xss-inviter-${tag}`);
    await db()("auth_user").where({ id: admin.id }).update({ name: `${XSS_SCRIPT} ${XSS_IMG} Ada` });
    const cookie = await signedInCookie(admin);
    const email = uniqueEmail("xss-invitee");
    const sent = await submitForm("/people", (f) => f.includes('id="invite-email"'), { email, role: "viewer" }, { cookie });
    expect(sent.status).toBe(200);
    const mail = await waitForMail(email, /invitation/i);
    expect(mail.html.length).toBeGreaterThan(100);
    expect(liveMarkup(mail.html)).toEqual([]);
    expect(mail.html).toContain("&lt;script&gt;alert(1)&lt;/script&gt;");
    expect(mail.text).toContain(XSS_SCRIPT);
    expect(mail.subject).not.toMatch(/[\r\n]/);
  });

  it("the flag alert about a build with markup in its label and notes is escaped in its HTML part", async () => {
    let alert;
    for (let i = 0; i < 60 && !alert; i++) {
      alert = (await listHeldMessages({ to: team.technician.email })).find((m) => /Spec flag/i.test(m.subject));
      if (!alert) await new Promise((r) => setTimeout(r, 250));
    }
    expect(alert, "the maker got the flag e-mail").toBeDefined();
    expect(liveMarkup(alert!.html)).toEqual([]);
    expect(alert!.html).toContain("&lt;script&gt;alert(1)&lt;/script&gt;");
    expect(alert!.subject).toContain(`B-${tag}`);
    expect(alert!.subject).not.toMatch(/[\r\n]/);
  });
});
