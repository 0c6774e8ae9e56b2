import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { keepScreenshot, launchBrowser, watchErrors } from "../helpers/browser";
import { appUrl } from "../helpers/stack";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("landing page in Chromium", () => {
  for (const width of [1280, 390]) {
    it(`renders with the shipped fonts and no horizontal scroll at ${width} px`, async () => {
      const page = await browser.newPage({ viewport: { width, height: 900 } });
      const errors = watchErrors(page);
      await page.goto(appUrl(), { waitUntil: "load" });
      await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toContain("LC oscillator builds");
      const fontsLoaded = await page.evaluate(async () => {
        await document.fonts.ready;
        return [...document.fonts].filter((f) => f.status === "loaded").map((f) => f.family);
      });
      expect(fontsLoaded.length).toBeGreaterThan(0);
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      expect(overflow).toBeLessThanOrEqual(0);
      await expect(page.getByLabel("Safety note").textContent()).resolves.toContain("licence");
      await keepScreenshot(page, `landing-${width}`);
      expect(errors).toEqual([]);
      await page.close();
    });
  }

  it("reaches the sign-in link by keyboard with a visible focus ring", async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await page.goto(appUrl());
    let focusedText = "";
    for (let i = 0; i < 6 && focusedText !== "Sign in"; i++) {
      await page.keyboard.press("Tab");
      focusedText = await page.evaluate(() => (document.activeElement as HTMLElement | null)?.innerText?.trim() ?? "");
    }
    expect(focusedText).toBe("Sign in");
    const outline = await page.evaluate(() => getComputedStyle(document.activeElement as Element).outlineStyle);
    expect(outline).not.toBe("none");
    await page.close();
  });
});
