// Shared by the browser journeys: people of each role made through the accounts services (the test database
// has no demo seed), a project/design/build to work on made through the API, signing in through the real form,
// and the checks every final page gets: no horizontal overflow at 1280 and 390 px, a screenshot, and axe-core's
// rules for names, labels and contrast run in the page.
import { createRequire } from "node:module";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { expect } from "vitest";
import { createApiToken } from "@/lib/auth/api-tokens";
import type { Role } from "@/lib/auth/permissions";
import { COLPITTS_PARTS, sendJson, unique } from "../../integration/api/helpers";
import { createPerson, type TestPerson } from "../../integration/auth/helpers";
import { keepScreenshot } from "../../helpers/browser";
import { appUrl } from "../../helpers/stack";

export interface JourneyPerson extends TestPerson {
  token: string;
}

/** A person of `role` with a password (for the sign-in form) and an API token (for setting the scene). */
export async function journeyPerson(role: Role, label: string): Promise<JourneyPerson> {
  const person = await createPerson(role, label);
  const { token } = await createApiToken({ userId: person.id, name: `journey ${label}` });
  return { ...person, token };
}

export interface Scene {
  projectId: string;
  designId: string;
  buildId: string;
  buildLabel: string;
  projectName: string;
}

/** A project with a Colpitts design (411 kHz ± 2 %, harmonics ≤ −30 dBc) and a breadboard build. */
export async function scene(engineer: JourneyPerson, technician: JourneyPerson, label: string): Promise<Scene> {
  const projectName = unique(`${label} project`);
  const project = await sendJson("post", "/api/v1/projects", engineer, { name: projectName, purpose: "browser journey" });
  expect(project.status, project.text).toBe(201);
  const design = await sendJson("post", `/api/v1/projects/${project.body.id}/designs`, engineer, {
    name: "Colpitts 411k",
    topology: "colpitts",
    parts: COLPITTS_PARTS,
    spec: { targetHz: "411k", toleranceValue: 2, toleranceUnit: "percent", maxHarmonicDbc: -30 },
  });
  expect(design.status, design.text).toBe(201);
  const buildLabel = unique("BB");
  const build = await sendJson("post", `/api/v1/designs/${design.body.id}/builds`, technician, { label: buildLabel, kind: "breadboard" });
  expect(build.status, build.text).toBe(201);
  return { projectId: project.body.id, designId: design.body.id, buildId: build.body.id, buildLabel, projectName };
}

/** A fresh browser context (its own cookies) with page errors collected. */
export async function freshPage(browser: Browser, width = 1280): Promise<{ context: BrowserContext; page: Page; errors: string[] }> {
  const context = await browser.newContext({ viewport: { width, height: 900 } });
  const page = await context.newPage();
  const errors: string[] = [];
  page.on("pageerror", (e) => errors.push(`pageerror: ${e.message}`));
  page.on("dialog", (d) => {
    errors.push(`dialog: ${d.message()}`);
    void d.dismiss();
  });
  return { context, page, errors };
}

/** Signs in through the sign-in page with the keyboard only, and waits for the dashboard. */
export async function signIn(page: Page, person: { email: string; password: string }): Promise<void> {
  await page.goto(`${appUrl()}/sign-in`);
  await page.getByLabel("E-mail").focus();
  await page.keyboard.type(person.email);
  await page.keyboard.press("Tab");
  expect(await page.evaluate(() => document.activeElement?.id)).toBe("password");
  await page.keyboard.type(person.password);
  await page.keyboard.press("Enter");
  await page.waitForURL(/\/dashboard/, { timeout: 20_000 });
}

/** The page body is no wider than the window. */
export async function expectNoHorizontalOverflow(page: Page, label: string): Promise<void> {
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
  expect(overflow, `${label}: the page is ${overflow} px wider than the window`).toBeLessThanOrEqual(0);
}

/** Whether the focused element (or the control it sits in) shows a focus indicator: an outline or a ring. */
export async function focusIsVisible(page: Page): Promise<boolean> {
  return page.evaluate(() => {
    const shows = (el: Element | null) => {
      if (!el) return false;
      const s = getComputedStyle(el);
      return (s.outlineStyle !== "none" && parseFloat(s.outlineWidth) > 0) || (s.boxShadow !== "none" && s.boxShadow !== "");
    };
    const active = document.activeElement;
    // A visually hidden input (file, radio) shows its focus on the control around it.
    return shows(active) || shows(active?.closest("label, div[class*='focus-within']") ?? null) || shows(active?.parentElement ?? null);
  });
}

/** Presses Tab until `match` is focused (at most `limit` times), and checks the focus can be seen there. */
export async function tabTo(page: Page, match: (el: { tag: string; text: string; label: string; type: string; href: string }) => boolean, what: string, limit = 60): Promise<void> {
  for (let i = 0; i < limit; i++) {
    await page.keyboard.press("Tab");
    const el = await page.evaluate(() => {
      const a = document.activeElement as HTMLElement | null;
      return {
        tag: a?.tagName.toLowerCase() ?? "",
        text: a?.innerText?.trim() ?? "",
        label: a?.getAttribute("aria-label") ?? (a?.id ? (document.querySelector(`label[for="${a.id}"]`) as HTMLElement | null)?.innerText?.trim() ?? "" : ""),
        type: (a as HTMLInputElement | null)?.type ?? "",
        href: a?.getAttribute("href") ?? "",
      };
    });
    if (match(el)) {
      expect(await focusIsVisible(page), `focus is visible on ${what}`).toBe(true);
      return;
    }
  }
  throw new Error(`${what} was not reached with ${limit} presses of Tab`);
}

const axeSource = (createRequire(import.meta.url)("axe-core") as { source: string }).source;

/** The axe-core rules these checks run: accessible names and labels of controls, and colour contrast. */
export const AXE_RULES = [
  "button-name",
  "link-name",
  "label",
  "select-name",
  "input-button-name",
  "aria-input-field-name",
  "aria-toggle-field-name",
  "aria-progressbar-name",
  "aria-command-name",
  "form-field-multiple-labels",
  "image-alt",
  "svg-img-alt",
  "color-contrast",
  "document-title",
  "html-has-lang",
];

export interface AxeFinding {
  id: string;
  impact: string | null;
  help: string;
  targets: string[];
}

/** Runs axe-core in the page; fails on serious or critical findings, prints the rest. */
export async function expectAccessible(page: Page, label: string): Promise<AxeFinding[]> {
  await page.addScriptTag({ content: axeSource });
  const findings = await page.evaluate(async (rules) => {
    type Node = { target: string[]; failureSummary?: string };
    const axe = (window as unknown as { axe: { run: (ctx: Document, opts: unknown) => Promise<{ violations: { id: string; impact: string | null; help: string; nodes: Node[] }[] }> } }).axe;
    const result = await axe.run(document, { runOnly: { type: "rule", values: rules }, resultTypes: ["violations"] });
    return result.violations.map((v) => ({
      id: v.id,
      impact: v.impact,
      help: v.help,
      targets: v.nodes.map((n) => `${n.target.join(" ")} — ${(n.failureSummary ?? "").replace(/\s+/g, " ").slice(0, 160)}`).slice(0, 6),
    }));
  }, AXE_RULES);
  const serious = findings.filter((f) => f.impact === "serious" || f.impact === "critical");
  const minor = findings.filter((f) => !serious.includes(f));
  if (minor.length) console.log(`axe (${label}), not failing: ${JSON.stringify(minor)}`);
  expect(serious, `axe serious/critical findings on ${label}`).toEqual([]);
  return findings;
}

/**
 * The end of a journey: the page at 1280 px and at 390 px without horizontal overflow, axe at both widths, and
 * a full-page screenshot of each kept as an artifact.
 */
export async function checkFinalPage(page: Page, name: string): Promise<void> {
  for (const width of [1280, 390]) {
    await page.setViewportSize({ width, height: 900 });
    await page.waitForTimeout(150);
    await expectNoHorizontalOverflow(page, `${name} at ${width} px`);
    await expectAccessible(page, `${name} at ${width} px`);
    await keepScreenshot(page, `journey-${name}-${width}`);
  }
  await page.setViewportSize({ width: 1280, height: 900 });
}
