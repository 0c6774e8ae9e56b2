import request from "supertest";
import { describe, expect, it } from "vitest";
import { appUrl } from "../helpers/stack";

describe("landing page", () => {
  it("says what Tankbook is and carries the safety note", async () => {
    const res = await request(appUrl()).get("/");
    expect(res.status).toBe(200);
    expect(res.text).toContain("The logbook for LC oscillator builds");
    expect(res.text).toContain("spurious-emission limits");
    expect(res.text).toContain("your local codes and licensed practice govern");
  });

  it("serves its fonts from the app itself", async () => {
    const res = await request(appUrl()).get("/");
    const fontLinks = [...res.text.matchAll(/href="(\/_next\/static\/media\/[^"]+\.woff2)"/g)].map((m) => m[1]);
    expect(fontLinks.length).toBeGreaterThan(0);
    const font = await request(appUrl()).get(fontLinks[0]);
    expect(font.status).toBe(200);
  });
});
