// Debian's Chromium driven by playwright-core: the real browser of the browser tests.
import { mkdirSync } from "node:fs";
import path from "node:path";
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";
import { appUrl } from "./stack";

// Without the background-networking flags Chromium keeps dialling out, and this machine's closed network refuses it.
const launchArgs = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
];

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium", headless: true, args: launchArgs });
}

export const artifactsDir = path.join(process.cwd(), "test-artifacts", "screenshots");

/** Keeps a full-page screenshot as a test artifact (test-artifacts/screenshots/<name>.png). */
export async function keepScreenshot(page: Page, name: string): Promise<string> {
  mkdirSync(artifactsDir, { recursive: true });
  const file = path.join(artifactsDir, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

/** Collects uncaught page errors and console errors so a test can assert there were none. */
export function watchErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on("pageerror", (e) => errors.push(`pageerror: ${e.message}`));
  page.on("console", (m) => {
    if (m.type() === "error") errors.push(`console: ${m.text()}`);
  });
  return errors;
}

/**
 * A browser context of the given width signed in over POST /api/v1/session (the session cookie lands in the
 * context), for tests that start on a signed-in page rather than test the sign-in form.
 * @throws Error naming the status when the sign-in is refused
 */
export async function signedInContext(browser: Browser, person: { email: string; password: string }, width = 1280, height = 900): Promise<BrowserContext> {
  const context = await browser.newContext({ viewport: { width, height } });
  const session = await context.request.post(`${appUrl()}/api/v1/session`, { data: { email: person.email, password: person.password } });
  if (session.status() !== 201) {
    await context.close();
    throw new Error(`signing in ${person.email} answered ${session.status()}: ${(await session.text()).slice(0, 200)}`);
  }
  return context;
}
