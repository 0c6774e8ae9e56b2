import { describe, expect, it } from "vitest";
import { captureObjectKey, photoObjectKey } from "../../../lib/storage/object-keys";

const UUID = "[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}";
const MARCH_2026 = new Date("2026-03-31T23:59:59Z");

describe("captureObjectKey", () => {
  it("puts the run under its UTC year and month with a random suffix", () => {
    expect(captureObjectKey("run_42", MARCH_2026)).toMatch(new RegExp(`^captures/2026/03/run_42-${UUID}\\.csv$`));
  });

  it("gives a new key each call for the same run", () => {
    expect(captureObjectKey("r1", MARCH_2026)).not.toBe(captureObjectKey("r1", MARCH_2026));
  });

  it("throws TypeError for an id that could leave its prefix", () => {
    expect(() => captureObjectKey("../etc/passwd")).toThrow(TypeError);
    expect(() => captureObjectKey("")).toThrow(/runId must be 1-64 characters/);
  });
});

describe("photoObjectKey", () => {
  it("uses the extension of the content type", () => {
    expect(photoObjectKey("b7", "image/png", MARCH_2026)).toMatch(new RegExp(`^photos/2026/03/b7-${UUID}\\.png$`));
    expect(photoObjectKey("b7", undefined, MARCH_2026)).toMatch(/\.jpg$/);
  });

  it("throws RangeError for a content type that is not an allowed image", () => {
    expect(() => photoObjectKey("b7", "image/svg+xml")).toThrow(RangeError);
  });

  it("throws TypeError for a build id with a slash", () => {
    expect(() => photoObjectKey("a/b")).toThrow(/buildId/);
  });
});
