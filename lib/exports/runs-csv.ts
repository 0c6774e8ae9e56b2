import Papa from "papaparse";
import type { RunExportRow } from "@/db/queries/exports";
import { STABILITY_CSV_COLUMNS } from "./stability-columns";

// The runs table as CSV: one header row naming each column with its SI unit, times in ISO 8601 UTC, numbers at
// full precision (they read back to the same double), text cells that a spreadsheet would run as a formula
// (= + - @, tab, CR at the start) prefixed with a quote; numbers are never touched, so −38.2 stays a number.

export type Cell = string | number | null;

export interface Column {
  header: string;
  value: (row: RunExportRow) => Cell;
}

/** The columns in file order. Headers carry the unit in parentheses. */
export const RUN_CSV_COLUMNS: readonly Column[] = [
  { header: "Run id", value: (r) => r.id },
  { header: "Uploaded (UTC, ISO 8601)", value: (r) => r.createdAt.toISOString() },
  { header: "File", value: (r) => r.originalFilename },
  { header: "Status", value: (r) => r.status },
  { header: "Verdict", value: (r) => r.verdict },
  { header: "Failed rules", value: (r) => r.failedRules.join("; ") },
  { header: "Predicted frequency (Hz)", value: (r) => r.predictedHz },
  { header: "Measured frequency (Hz)", value: (r) => r.measuredHz },
  { header: "Frequency uncertainty (Hz)", value: (r) => r.frequencyUncertaintyHz },
  { header: "Drift (ppm)", value: (r) => r.driftPpm },
  { header: "Implied extra capacitance (F)", value: (r) => r.impliedExtraCapacitanceF },
  { header: "Fundamental amplitude (V peak)", value: (r) => r.fundamentalVpk },
  { header: "THD (%)", value: (r) => r.thdPercent },
  { header: "Worst harmonic (dBc)", value: (r) => r.worstHarmonicDbc },
  { header: "In-record drift (ppm)", value: (r) => r.inRecordDriftPpm },
  { header: "Tweak part", value: (r) => r.tweakPart },
  { header: "Tweak from (SI: F or H)", value: (r) => r.tweakFromSi },
  { header: "Tweak to (SI: F or H)", value: (r) => r.tweakToSi },
  { header: "Tweak note", value: (r) => r.tweakNote },
  { header: "Channel", value: (r) => r.channel },
  { header: "Probe attenuation (×)", value: (r) => r.probeAttenuation },
  { header: "Supply (V)", value: (r) => r.supplyV },
  { header: "Temperature (°C)", value: (r) => r.temperatureC },
  { header: "Note", value: (r) => r.note },
  { header: "Logged by", value: (r) => r.createdByName },
  { header: "Engine version", value: (r) => r.engineVersion },
  { header: "Error", value: (r) => r.error },
  { header: "Withdrawn (UTC, ISO 8601)", value: (r) => r.withdrawnAt?.toISOString() ?? null },
  { header: "Withdrawal reason", value: (r) => r.withdrawalReason },
  ...STABILITY_CSV_COLUMNS,
];

const NEWLINE = "\r\n";

// papaparse's own `escapeFormulae: true` pattern (/^[=+\-@\t\r].*$/) misses multi-line text, because `.` stops at a
// line break and `$` then fails; a cell only has to start with one of these characters to be run as a formula.
const FORMULA_START = /^[=+\-@\t\r]/;

function unparse(data: Cell[][], header: boolean): string {
  return Papa.unparse(
    { fields: RUN_CSV_COLUMNS.map((c) => c.header), data },
    { header, newline: NEWLINE, escapeFormulae: FORMULA_START, quotes: false },
  );
}

/** The header line, with its line end (papaparse already ends a header-only table with one). */
export function runsCsvHeader(): string {
  const header = unparse([], true);
  return header.endsWith(NEWLINE) ? header : header + NEWLINE;
}

/**
 * Rows as CSV lines, each ending in CRLF (RFC 4180), without the header: chunks of a streamed export
 * concatenate into one file.
 */
export function runsCsvRows(rows: readonly RunExportRow[]): string {
  if (rows.length === 0) return "";
  return unparse(rows.map((r) => RUN_CSV_COLUMNS.map((c) => c.value(r))), false) + NEWLINE;
}

/** A whole file: the header, then the rows. */
export function runsToCsv(rows: readonly RunExportRow[]): string {
  return runsCsvHeader() + runsCsvRows(rows);
}

/**
 * A file name for the download, from the build's label: letters, digits, dot, dash and underscore only.
 * @example runsCsvFilename("BB-2 / rev A", new Date("2026-12-01T10:00:00Z")) → "tankbook-runs-BB-2-rev-A-2026-12-01.csv"
 */
export function runsCsvFilename(buildLabel: string, at: Date): string {
  const safe = buildLabel.normalize("NFKD").replace(/[^A-Za-z0-9._-]+/g, "-").replace(/-{2,}/g, "-").replace(/^-+|-+$/g, "").slice(0, 60) || "build";
  return `tankbook-runs-${safe}-${at.toISOString().slice(0, 10)}.csv`;
}
