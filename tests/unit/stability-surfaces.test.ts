/**
 * Results stored by an engine before 1.3 carry no stability object: the run page, the compare page and the command
 * read that as "not measured (analysed by an older engine)", never as zeros or a crash.
 */
import { describe, expect, it } from "vitest";
import { readStability } from "../../components/logbook/stability/read-stability";
import { analyzeSamples } from "../../lib/analysis";
import { stabilityLines } from "../../lib/analysis/stability/summary";
import { SeededRandom } from "../helpers/signals";
import { FS, toneWithPhase } from "./stability-signals";

describe("readStability", () => {
  it("reads a 1.2 result as not measured by an older engine", () => {
    const reading = readStability({ engineVersion: "1.2.0", frequencyHz: 1e5 });
    expect(reading.status).toBe("not-measured");
    if (reading.status === "not-measured") expect(reading.reason).toMatch(/older engine 1\.2\.0/);
  });

  it("reads a missing or malformed object as not measured", () => {
    expect(readStability(null).status).toBe("not-measured");
    expect(readStability({ stability: { jitter: "nonsense" } }).status).toBe("not-measured");
  });

  it("reads a 1.3 result's figures as they were stored (through JSON)", () => {
    const { result } = analyzeSamples(toneWithPhase(new Float64Array(1 << 16), 1e-3, new SeededRandom(1501)), FS, { plot: false });
    const reading = readStability(JSON.parse(JSON.stringify(result)));
    expect(reading.status).toBe("measured");
    if (reading.status === "measured") expect(reading.stability.jitter.rmsJitterS).toBe(result.stability!.jitter.rmsJitterS);
  });
});

describe("stabilityLines", () => {
  it("says an older engine analysed the run instead of printing figures", () => {
    expect(stabilityLines(undefined)).toEqual([["stability", "not measured (analysed by an older engine)"]]);
  });

  it("marks floor values with ≤ and gives reasons for missing ones", () => {
    const { result } = analyzeSamples(toneWithPhase(new Float64Array(1 << 16), 1e-3, new SeededRandom(1502)), FS, { plot: false });
    const lines = Object.fromEntries(stabilityLines(result.stability));
    expect(lines["rms jitter"]).toMatch(/^≤ /);
    expect(lines.envelope).toMatch(/^steady/);
  });
});
