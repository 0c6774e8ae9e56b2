import Papa from "papaparse";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { createTweak } from "@/db/queries/tweaks";
import { iterateRunsForExport, listRunsForExport, type RunExportRow } from "@/db/queries/exports";
import { RUN_CSV_COLUMNS, runsCsvFilename, runsCsvHeader, runsCsvRows, runsToCsv } from "@/lib/exports/runs-csv";
import { failing, finishRun, logRun, makeBuild, makePerson } from "./fixtures";

afterAll(async () => {
  await closeDb();
});

/** A build with a tweak, a passing run, a failing run, a queued run, and hostile text in file names and notes. */
async function buildWithRuns() {
  const tech = await makePerson("technician", "=tech");
  const fx = await makeBuild({ owner: tech, label: "BB-7 / rev A" });
  const tweak = await createTweak({ buildId: fx.buildId, partRef: "C1", fromValue: 1e-9, toValue: 1.2e-9, note: '-moved "C1", shortened leads', planned: false, createdBy: tech.id });
  const pass = await logRun(fx, tech, "=HYPERLINK(\"http://example.test\").csv");
  await db()("runs").where({ id: pass }).update({ tweak_id: tweak.id, note: "+1 on the bench\nsecond line" });
  await finishRun(fx, pass, [], { measuredHz: 2_212_345.678901234, thdPercent: 0.42, worstHarmonicDbc: -44.25, driftPpm: -17.123456789 });
  const fail = await logRun(fx, tech, "@run, with comma.csv");
  await finishRun(fx, fail, [failing("thd", 3.3, 2), failing("harmonic-2", -35.5)], { measuredHz: 2_199_000, thdPercent: 3.3, worstHarmonicDbc: -35.5 });
  const queued = await logRun(fx, tech, "plain.csv");
  return { fx, tech, ids: { pass, fail, queued } };
}

function expectedCells(row: RunExportRow): string[] {
  // What a reader gets back: numbers as their shortest round-trip text, null as empty, text cells that start with
  // = + - @ prefixed with one quote (the formula guard), everything else as stored.
  return RUN_CSV_COLUMNS.map((c) => {
    const v = c.value(row);
    if (v === null) return "";
    if (typeof v === "number") return String(v);
    return /^[=+\-@\t\r]/.test(v) ? `'${v}` : v;
  });
}

describe("listRunsForExport", () => {
  it("holds_every_run_newest_first_with_tweak_and_failed_rules", async () => {
    const { fx, ids } = await buildWithRuns();
    const rows = await listRunsForExport(fx.buildId);
    expect(rows.map((r) => r.id)).toEqual([ids.queued, ids.fail, ids.pass]);
    expect(rows[1].failedRules).toEqual(["harmonic-2", "thd"]);
    expect(rows[2]).toMatchObject({ tweakPart: "C1", tweakFromSi: 1e-9, tweakToSi: 1.2e-9, verdict: "pass", measuredHz: 2_212_345.678901234 });
    expect(rows[0]).toMatchObject({ status: "queued", measuredHz: null, failedRules: [] });
  });

  it("honours_the_runs_table_filters", async () => {
    const { fx, ids } = await buildWithRuns();
    expect((await listRunsForExport(fx.buildId, { verdict: "fail" })).map((r) => r.id)).toEqual([ids.fail]);
    expect((await listRunsForExport(fx.buildId, { verdict: "none" })).map((r) => r.id)).toEqual([ids.queued]);
    expect((await listRunsForExport(fx.buildId, { status: "done" })).map((r) => r.id)).toEqual([ids.fail, ids.pass]);
    const all = await listRunsForExport(fx.buildId);
    const passAt = all.find((r) => r.id === ids.pass)!.createdAt;
    expect((await listRunsForExport(fx.buildId, { to: new Date(passAt.getTime() + 1) })).map((r) => r.id)).toEqual([ids.pass]);
    expect((await listRunsForExport(fx.buildId, { from: new Date(passAt.getTime() + 1) })).map((r) => r.id)).toEqual([ids.queued, ids.fail]);
  });

  it("batches_by_keyset_without_losing_or_repeating_rows", async () => {
    const { fx } = await buildWithRuns();
    const batches: string[][] = [];
    for await (const batch of iterateRunsForExport(fx.buildId, {}, 2)) batches.push(batch.map((r) => r.id));
    expect(batches.map((b) => b.length)).toEqual([2, 1]);
    expect(batches.flat()).toEqual((await listRunsForExport(fx.buildId)).map((r) => r.id));
  });
});

describe("runsToCsv", () => {
  it("parses_back_with_papaparse_to_the_same_rows", async () => {
    const { fx } = await buildWithRuns();
    const rows = await listRunsForExport(fx.buildId);
    const csv = runsToCsv(rows);
    const parsed = Papa.parse<string[]>(csv, { skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data[0]).toEqual(RUN_CSV_COLUMNS.map((c) => c.header));
    expect(parsed.data.slice(1)).toEqual(rows.map(expectedCells));
    // Numbers read back to the same doubles.
    const measured = parsed.data[0].indexOf("Measured frequency (Hz)");
    expect(Number(parsed.data[3][measured])).toBe(2_212_345.678901234);
  });

  it("guards_text_cells_against_formulas_but_leaves_negative_numbers_alone", async () => {
    const { fx } = await buildWithRuns();
    const rows = await listRunsForExport(fx.buildId);
    const parsed = Papa.parse<string[]>(runsToCsv(rows), { skipEmptyLines: true }).data;
    const col = (name: string) => parsed[0].indexOf(name);
    const passRow = parsed[3];
    expect(passRow[col("File")]).toBe(`'=HYPERLINK("http://example.test").csv`);
    expect(passRow[col("Note")]).toBe("'+1 on the bench\nsecond line");
    expect(passRow[col("Tweak note")]).toBe(`'-moved "C1", shortened leads`);
    expect(passRow[col("Logged by")]).toBe("Test =tech"); // does not start with a formula character
    expect(parsed[2][col("File")]).toBe("'@run, with comma.csv");
    expect(passRow[col("Drift (ppm)")]).toBe("-17.123456789");
    expect(passRow[col("Worst harmonic (dBc)")]).toBe("-44.25");
  });

  it("writes_SI_units_in_the_headers_and_ISO_8601_UTC_times", async () => {
    const header = runsCsvHeader();
    expect(header.endsWith("\r\n")).toBe(true);
    for (const h of ["Measured frequency (Hz)", "Implied extra capacitance (F)", "Fundamental amplitude (V peak)", "Supply (V)", "Uploaded (UTC, ISO 8601)"]) {
      expect(header).toContain(h);
    }
    const { fx } = await buildWithRuns();
    const rows = await listRunsForExport(fx.buildId);
    const parsed = Papa.parse<string[]>(runsToCsv(rows), { skipEmptyLines: true }).data;
    const at = parsed[1][parsed[0].indexOf("Uploaded (UTC, ISO 8601)")];
    expect(at).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/);
    expect(new Date(at).getTime()).toBe(rows[0].createdAt.getTime());
  });

  it("streams_in_chunks_that_join_into_the_same_file", async () => {
    const { fx } = await buildWithRuns();
    const rows = await listRunsForExport(fx.buildId);
    expect(runsCsvHeader() + runsCsvRows(rows.slice(0, 1)) + runsCsvRows(rows.slice(1))).toBe(runsToCsv(rows));
    expect(runsCsvRows([])).toBe("");
  });
});

describe("runsCsvFilename", () => {
  it("keeps_only_safe_characters", () => {
    expect(runsCsvFilename("BB-2 / rev A", new Date("2026-12-01T10:00:00Z"))).toBe("tankbook-runs-BB-2-rev-A-2026-12-01.csv");
    expect(runsCsvFilename('"; rm -rf', new Date("2026-12-01T10:00:00Z"))).toBe("tankbook-runs-rm-rf-2026-12-01.csv");
    expect(runsCsvFilename("///", new Date("2026-12-01T10:00:00Z"))).toBe("tankbook-runs-build-2026-12-01.csv");
  });
});
