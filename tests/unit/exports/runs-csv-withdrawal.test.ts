import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import type { RunExportRow } from "../../../db/queries/exports";
import { runsToCsv } from "../../../lib/exports/runs-csv";

// A withdrawn run stays in the export with when and why it was withdrawn, so the file still accounts for every
// capture the build logged; a run that counts leaves both cells empty.

function row(id: string, withdrawnAt: Date | null, withdrawalReason: string | null): RunExportRow {
  return {
    id, createdAt: new Date("2026-12-01T10:00:00Z"), originalFilename: `${id}.csv`, status: "done", channel: "Out", probeAttenuation: 10,
    supplyV: 12, temperatureC: 23, note: "", tweakPart: null, tweakFromSi: null, tweakToSi: null, tweakNote: null, predictedHz: 370e3,
    measuredHz: 371e3, frequencyUncertaintyHz: 0.2, driftPpm: 2702.7, impliedExtraCapacitanceF: 1.2e-11, fundamentalVpk: 1, thdPercent: 1.5,
    worstHarmonicDbc: -38, inRecordDriftPpm: 0.3, verdict: "pass", failedRules: [], engineVersion: "1.3.0", createdByName: "T", error: null,
    stability: null, withdrawnAt, withdrawalReason,
  };
}

describe("runs CSV withdrawal columns", () => {
  const csv = runsToCsv([row("kept", null, null), row("gone", new Date("2026-12-02T08:30:00Z"), "=probe on the wrong board")]);
  const [header, kept, gone] = Papa.parse<string[]>(csv, { skipEmptyLines: true }).data;
  const cell = (r: string[], name: string) => r[header.indexOf(name)];

  it("marks_a_withdrawn_run_with_its_time_and_reason_and_leaves_a_counting_run_blank", () => {
    expect(header).toContain("Withdrawn (UTC, ISO 8601)");
    expect(cell(kept, "Withdrawn (UTC, ISO 8601)")).toBe("");
    expect(cell(kept, "Withdrawal reason")).toBe("");
    expect(cell(gone, "Withdrawn (UTC, ISO 8601)")).toBe("2026-12-02T08:30:00.000Z");
    // The reason is the user's text: one starting with = is defused like every other text cell.
    expect(cell(gone, "Withdrawal reason")).toBe("'=probe on the wrong board");
  });
});
