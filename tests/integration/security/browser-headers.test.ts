import type { Browser } from "playwright-core";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { launchBrowser } from "../../helpers/browser";
import { createFixture, type Fixture } from "../api/helpers";
import { appUrl, signedInCookie } from "../auth/helpers";

// Browser security headers on every answer (OWASP HTTP Headers Cheat Sheet), a CSP the app satisfies in
// Chromium (no violation reported, the client runtime starts), and malformed percent-escapes answered 400.

let fx: Fixture;
let cookie: string;
let browser: Browser;

beforeAll(async () => {
  fx = await createFixture("headers");
  cookie = await signedInCookie({ email: fx.team.viewer.email, password: "bench automation 2026" });
  browser = await launchBrowser();
}, 180_000);

afterAll(async () => {
  await browser?.close();
  await closeDb();
  await closeLucia();
});

function expectSecurityHeaders(headers: Record<string, string>, where: string): void {
  const csp = headers["content-security-policy"] ?? "";
  expect(csp, `${where}: CSP`).toContain("frame-ancestors 'none'");
  expect(csp, `${where}: CSP`).toContain("default-src 'self'");
  expect(csp, `${where}: CSP`).toContain("object-src 'none'");
  expect(csp, `${where}: CSP`).toContain("base-uri 'self'");
  expect(headers["x-frame-options"], `${where}: X-Frame-Options (RFC 7034)`).toBe("DENY");
  expect(headers["x-content-type-options"], `${where}: nosniff`).toBe("nosniff");
  expect(headers["referrer-policy"], where).toBe("strict-origin-when-cross-origin");
  expect(headers["permissions-policy"], where).toContain("camera=()");
  // The test stack runs `next start`, NODE_ENV=production: HSTS is on (RFC 6797 §6.1).
  expect(headers["strict-transport-security"], where).toMatch(/^max-age=31536000/);
}

describe("security headers", () => {
  it("are on public pages, signed-in pages (People and Profile too), API answers, errors and static files", async () => {
    const paths: { path: string; signedIn: boolean }[] = [
      { path: "/", signedIn: false },
      { path: "/sign-in", signedIn: false },
      { path: "/forgot-password", signedIn: false },
      { path: "/dashboard", signedIn: true },
      { path: "/people", signedIn: true },
      { path: "/profile", signedIn: true },
      { path: `/builds/${fx.buildId}`, signedIn: true },
      { path: "/api/health", signedIn: false },
      { path: "/api/v1/me", signedIn: false },
      { path: `/api/v1/builds/${fx.buildId}/runs.csv`, signedIn: true },
      { path: "/no-such-page", signedIn: false },
    ];
    for (const { path, signedIn } of paths) {
      const req = request(appUrl()).get(path).redirects(0);
      if (signedIn) req.set("cookie", cookie);
      const res = await req;
      expect(res.status, `${path}: ${res.status}`).toBeLessThan(500);
      expectSecurityHeaders(res.headers, path);
    }
    const page = await request(appUrl()).get("/sign-in");
    const script = /<script[^>]+src="(\/_next\/static\/[^"]+\.js)"/.exec(page.text)?.[1];
    expect(script).toBeDefined();
    const asset = await request(appUrl()).get(script!);
    expect(asset.status).toBe(200);
    expectSecurityHeaders(asset.headers, script!);
  });

  it("let the pages run in Chromium with no CSP violation, and React hydrates them", async () => {
    const context = await browser.newContext();
    const [name, value] = cookie.split("=");
    const violations: string[] = [];
    for (const path of ["/sign-in", "/dashboard", `/builds/${fx.buildId}`, "/profile"]) {
      if (path === "/dashboard") await context.addCookies([{ name, value: value.split(";")[0], url: appUrl() }]);
      const page = await context.newPage();
      page.on("console", (m) => {
        if (/Content Security Policy|Refused to/i.test(m.text())) violations.push(`${path}: ${m.text()}`);
      });
      await page.addInitScript(() => {
        document.addEventListener("securitypolicyviolation", (e) => {
          (window as unknown as { __cspViolations: string[] }).__cspViolations ??= [];
          (window as unknown as { __cspViolations: string[] }).__cspViolations.push(`${e.violatedDirective} ${e.blockedURI}`);
        });
      });
      const response = await page.goto(`${appUrl()}${path}`, { waitUntil: "load" });
      expect(response?.status(), path).toBe(200);
      // React marks each element it hydrated with a __reactFiber$… property; the RSC payload it needs comes in
      // inline scripts, so a CSP that blocked them would leave the body unmarked.
      const hydrated = () => Object.keys(document.body).some((k) => k.startsWith("__reactFiber"));
      await page.waitForFunction(hydrated, null, { timeout: 10_000 }).catch(() => undefined);
      expect(await page.evaluate(hydrated), `${path}: hydrated`).toBe(true);
      violations.push(...(await page.evaluate(() => (window as unknown as { __cspViolations?: string[] }).__cspViolations ?? [])).map((v) => `${path}: ${v}`));
      await page.close();
    }
    expect(violations).toEqual([]);
    await context.close();
  });

  it("refuse to be framed by another page (frame-ancestors 'none')", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    const blocked: string[] = [];
    page.on("console", (m) => {
      if (/frame-ancestors|X-Frame-Options|Refused to (display|frame)/i.test(m.text())) blocked.push(m.text());
    });
    await page.goto(`${appUrl()}/api/health`);
    await page.setContent(`<iframe id="f" src="${appUrl()}/sign-in"></iframe>`);
    await page.waitForTimeout(1500);
    const framed = page.frames().find((f) => f.url().includes("/sign-in"));
    const hasForm = framed ? await framed.$('input[name="password"]').then(Boolean).catch(() => false) : false;
    expect(hasForm).toBe(false);
    await context.close();
  });
});

describe("malformed percent-escapes", () => {
  it("answer 400 problem+json under /api and a 400 HTML page elsewhere, never the framework's 500", async () => {
    const apiRes = await request(appUrl()).get("/api/v1/builds/%E0%A4%A/runs");
    expect(apiRes.status).toBe(400);
    expect(apiRes.headers["content-type"]).toMatch(/^application\/problem\+json/);
    expect(JSON.parse(apiRes.text).detail).toContain("percent-escape");
    const pageRes = await request(appUrl()).get("/builds/%E0%A4%A");
    expect(pageRes.status).toBe(400);
    expect(pageRes.headers["content-type"]).toMatch(/^text\/html/);
    expect(pageRes.text).toContain("This address cannot be read");
    const lone = await request(appUrl()).get("/projects/%");
    expect(lone.status).toBe(400);
  });
});
