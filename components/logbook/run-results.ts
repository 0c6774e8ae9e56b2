/**
 * Reads the engine's stored result object into the few things the run page shows, falling back to the run's
 * result columns. Kept apart from the components so the mapping is one small, testable place.
 */
import type { HarmonicStatus, ThdSummary } from "@/lib/analysis/analysis-result";
import type { SpecMeasurements } from "@/lib/spec/types";
import type { RunData } from "./run-types";

export interface HarmonicRow {
  order: number;
  frequencyHz: number | null;
  amplitudeVpk: number | null;
  dBc: number | null;
  /** Absent on results from before engine 1.2 (then a level means measured). */
  status: HarmonicStatus | null;
  folded: boolean;
  seenAtHz: number | null;
  detectionLimitDbc: number | null;
  note: string | null;
}

export interface SpurRow {
  frequencyHz: number;
  dBc: number | null;
  kind: string;
  label: string;
}

/** THD's status and floor as the engine stores them (engine 1.2 on); null on older results. */
export type ThdRow = ThdSummary;

export interface WarningRow {
  code: string;
  message: string;
}

export interface RunFigures {
  frequencyHz: number | null;
  frequencyUncertaintyHz: number | null;
  fundamentalVpk: number | null;
  thdPercent: number | null;
  sinadDb: number | null;
  snrDb: number | null;
  sfdrDb: number | null;
  inRecordDriftPpm: number | null;
  sampleRateHz: number | null;
  samples: number | null;
  harmonics: HarmonicRow[];
  thd: ThdRow | null;
  spurs: SpurRow[];
  /** The component SFDR is measured against, in words ("harmonic 3", "f/2"); null when not named. */
  sfdrAgainst: string | null;
  /** The frequency noise share of the 1σ, Hz (0 when the segment scatter is explained); null when not assessed. */
  frequencyNoiseHz: number | null;
  warnings: WarningRow[];
  /** The capture's preamble lines, key → value. */
  metadata: Record<string, string>;
}

type Loose = Record<string, unknown>;

function asObject(value: unknown): Loose | undefined {
  return typeof value === "object" && value !== null && !Array.isArray(value) ? (value as Loose) : undefined;
}

function num(...candidates: unknown[]): number | null {
  for (const c of candidates) if (typeof c === "number" && Number.isFinite(c)) return c;
  return null;
}

/** Value at a dotted path of an object, or undefined. */
function at(root: Loose | undefined, path: string): unknown {
  let node: unknown = root;
  for (const key of path.split(".")) {
    const obj = asObject(node);
    if (!obj) return undefined;
    node = obj[key];
  }
  return node;
}

function first(root: Loose | undefined, ...paths: string[]): unknown[] {
  return paths.map((p) => at(root, p));
}

function readStatus(value: unknown): HarmonicRow["status"] {
  return value === "measured" || value === "below-detection" || value === "not-separable" ? value : null;
}

function readHarmonics(value: unknown): HarmonicRow[] {
  if (!Array.isArray(value)) return [];
  return value
    .map(asObject)
    .filter((h): h is Loose => h !== undefined && typeof h.order === "number")
    .map((h) => ({
      order: h.order as number,
      frequencyHz: num(h.frequencyHz),
      amplitudeVpk: num(h.amplitudeVpk, h.amplitudeV, h.vpk),
      dBc: num(h.dBc, h.dbc, h.levelDbc),
      status: readStatus(h.status),
      folded: h.folded === true,
      seenAtHz: num(h.seenAtHz),
      detectionLimitDbc: num(h.detectionLimitDbc),
      note: typeof h.note === "string" ? h.note : null,
    }))
    .filter((h) => h.order >= 2)
    .sort((a, b) => a.order - b.order);
}

function readSpurs(value: unknown): SpurRow[] {
  if (!Array.isArray(value)) return [];
  return value
    .map(asObject)
    .filter((s): s is Loose => s !== undefined && typeof s.frequencyHz === "number")
    .map((s) => ({
      frequencyHz: s.frequencyHz as number,
      dBc: num(s.dBc),
      kind: typeof s.kind === "string" ? s.kind : "other",
      label: typeof s.label === "string" ? s.label : "unidentified tone",
    }));
}

function readThd(value: unknown): ThdRow | null {
  const t = asObject(value);
  if (!t || (t.status !== "measured" && t.status !== "below-floor" && t.status !== "not-measurable")) return null;
  return {
    status: t.status,
    floorPercent: num(t.floorPercent) ?? 0,
    upperBoundPercent: num(t.upperBoundPercent),
    detectedOrders: Array.isArray(t.detectedOrders) ? t.detectedOrders.filter((o): o is number => typeof o === "number") : [],
    note: typeof t.note === "string" ? t.note : null,
    neededSampleRateHz: num(t.neededSampleRateHz),
  };
}

function readWarnings(value: unknown): WarningRow[] {
  if (!Array.isArray(value)) return [];
  return value
    .map(asObject)
    .filter((w): w is Loose => w !== undefined && typeof w.code === "string")
    .map((w) => ({ code: w.code as string, message: typeof w.message === "string" ? w.message : String(w.code) }));
}

function readMetadata(value: unknown): Record<string, string> {
  const obj = asObject(value);
  if (!obj) return {};
  const out: Record<string, string> = {};
  for (const [k, v] of Object.entries(obj)) if (typeof v === "string" || typeof v === "number") out[k] = String(v);
  return out;
}

/**
 * The figures of an analysed run.
 *
 * @param run - the run; its result columns are used where the result object lacks a figure.
 * @returns figures in SI units (Hz, V peak), THD in %, levels in dB/dBc, drift in ppm.
 */
export function runFigures(run: Pick<RunData, "results" | "measuredHz" | "frequencyUncertaintyHz" | "fundamentalVpk" | "thdPercent">): RunFigures {
  const r = asObject(run.results);
  return {
    frequencyHz: num(run.measuredHz, ...first(r, "frequencyHz", "frequency.hz", "fundamental.frequencyHz")),
    frequencyUncertaintyHz: num(
      run.frequencyUncertaintyHz,
      ...first(r, "frequencyUncertaintyHz", "frequency.uncertaintyHz", "fundamental.frequencyUncertaintyHz"),
    ),
    fundamentalVpk: num(run.fundamentalVpk, ...first(r, "fundamentalVpk", "amplitudeVpk", "fundamental.amplitudeVpk")),
    thdPercent: num(run.thdPercent, ...first(r, "thdPercent", "thd.percent")),
    sinadDb: num(...first(r, "sinadDb", "sinad.db")),
    snrDb: num(...first(r, "snrDb", "snr.db")),
    sfdrDb: num(...first(r, "sfdrDb", "sfdr.db")),
    inRecordDriftPpm: num(...first(r, "inRecordDriftPpm", "drift.inRecordPpm", "inRecordDrift.ppm")),
    sampleRateHz: num(...first(r, "sampleRateHz", "capture.sampleRateHz")),
    samples: num(...first(r, "samples", "sampleCount", "capture.samples")),
    harmonics: readHarmonics(at(r, "harmonics")),
    thd: readThd(at(r, "thd")),
    spurs: readSpurs(at(r, "spurs")),
    sfdrAgainst: typeof at(r, "largestSpur.label") === "string" ? (at(r, "largestSpur.label") as string) : null,
    frequencyNoiseHz: num(at(r, "uncertainty.frequencyNoiseHz")),
    warnings: readWarnings(at(r, "warnings")),
    metadata: readMetadata(at(r, "metadata") ?? at(r, "capture.metadata") ?? at(r, "preamble")),
  };
}

/** The figures in the narrow shape the spec evaluator takes, or null when the run has no frequency yet. */
export function specMeasurements(f: RunFigures): SpecMeasurements | null {
  if (f.frequencyHz === null || f.fundamentalVpk === null) return null;
  return {
    frequencyHz: f.frequencyHz,
    thdPercent: f.thdPercent,
    thd: f.thd,
    harmonics: f.harmonics.map((h) => ({
      order: h.order,
      dBc: h.dBc,
      ...(h.status ? { status: h.status, detectionLimitDbc: h.detectionLimitDbc, folded: h.folded } : {}),
    })),
    fundamentalVpk: f.fundamentalVpk,
    inRecordDriftPpm: f.inRecordDriftPpm,
    warnings: f.warnings,
  };
}
