/**
 * The runs CSV's stability columns: SI units in the headers, numbers as numbers, the floor flagged, and a run from
 * an older engine read as "not measured" with empty cells (never 0).
 */
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import type { RunExportRow } from "../../db/queries/exports";
import { analyzeSamples } from "../../lib/analysis";
import { RUN_CSV_COLUMNS, runsToCsv } from "../../lib/exports/runs-csv";
import { SeededRandom } from "../helpers/signals";
import { bandLimitedPhase, FS, N, toneWithPhase } from "./stability-signals";

function row(stability: Record<string, unknown> | null, engineVersion: string): RunExportRow {
  return {
    id: "r1", createdAt: new Date("2026-12-01T10:00:00Z"), originalFilename: "a.csv", status: "done", channel: "Out", probeAttenuation: 1,
    supplyV: null, temperatureC: null, note: "", tweakPart: null, tweakFromSi: null, tweakToSi: null, tweakNote: null, predictedHz: null,
    measuredHz: 123456.7, frequencyUncertaintyHz: 0.01, driftPpm: null, impliedExtraCapacitanceF: null, fundamentalVpk: 1, thdPercent: null,
    worstHarmonicDbc: null, inRecordDriftPpm: null, verdict: null, failedRules: [], engineVersion, createdByName: "T", error: null, stability,
    withdrawnAt: null, withdrawalReason: null,
  };
}

/** What db/queries/exports selects from a stored result: the figures without the curves. */
function asExported(stability: NonNullable<ReturnType<typeof analyzeSamples>["result"]["stability"]>): Record<string, unknown> {
  const { curve: _curve, ...envelope } = stability.envelope;
  return { jitter: stability.jitter, points: stability.phaseNoise.points, periodJitter: stability.periodJitter, allan: stability.allan.points[0], envelope };
}

describe("runs CSV stability columns", () => {
  const random = new SeededRandom(1401);
  const { result } = analyzeSamples(toneWithPhase(bandLimitedPhase(N, FS, 10e3, 3e-3, random), 1e-4, random), FS, { plot: false });
  const csv = runsToCsv([row(asExported(result.stability!), "1.3.0"), row(null, "1.2.0")]);
  const [header, measured, older] = Papa.parse<string[]>(csv, { skipEmptyLines: true }).data;
  const cell = (r: string[], name: string) => r[header.indexOf(name)];

  it("names every stability column with its unit", () => {
    for (const name of ["rms jitter (s)", "rms phase jitter (rad)", "Phase noise at 1 kHz (dBc/Hz)", "Period jitter rms (s)", "Start-up to 90 % (s)", "Ring-down time constant (s)", "Q (1)"]) {
      expect(header).toContain(name);
    }
    expect(header.length).toBe(RUN_CSV_COLUMNS.length);
  });

  it("writes the measured figures as numbers that read back to the result's doubles", () => {
    expect(cell(measured, "Stability figures")).toBe("measured");
    expect(Number(cell(measured, "rms jitter (s)"))).toBe(result.stability!.jitter.rmsJitterS);
    expect(Number(cell(measured, "Phase noise at 1 kHz (dBc/Hz)"))).toBe(result.stability!.phaseNoise.points.find((p) => p.offsetHz === 1000)!.dbcPerHz);
    expect(cell(measured, "Jitter at noise floor (yes: the value is the floor, an upper bound)")).toBe("no");
    expect(cell(measured, "Envelope")).toBe("steady");
    // Outside the band (f0/4 ≈ 31 kHz): empty, not 0.
    expect(cell(measured, "Phase noise at 1 MHz (dBc/Hz)")).toBe("");
  });

  it("reads a run from an older engine as not measured, with empty cells", () => {
    expect(cell(older, "Stability figures")).toBe("not measured (older engine)");
    expect(cell(older, "rms jitter (s)")).toBe("");
    expect(cell(older, "Period jitter rms (s)")).toBe("");
  });
});
