import type { RunExportRow } from "@/db/queries/exports";
import type { Cell, Column } from "./runs-csv";

// The per-capture stability figures (engine ≥ 1.3) as CSV columns, SI units in the headers. A figure at its noise
// floor is written as the floor (an upper bound) with its "at floor" column saying yes; a run analysed by an older
// engine says so in "Stability figures" and leaves the numbers empty, never 0.

type Loose = Record<string, unknown>;

function obj(value: unknown): Loose | undefined {
  return typeof value === "object" && value !== null && !Array.isArray(value) ? (value as Loose) : undefined;
}

function part(row: RunExportRow, key: string): Loose | undefined {
  return obj(obj(row.stability)?.[key]);
}

function num(value: unknown): number | null {
  return typeof value === "number" && Number.isFinite(value) ? value : null;
}

function yesNo(value: unknown): string | null {
  return typeof value === "boolean" ? (value ? "yes" : "no") : null;
}

function point(row: RunExportRow, offsetHz: number): Loose | undefined {
  const points = obj(row.stability)?.points;
  return Array.isArray(points) ? points.map(obj).find((p) => p?.offsetHz === offsetHz) : undefined;
}

const DECADES: [number, string][] = [
  [100, "100 Hz"],
  [1e3, "1 kHz"],
  [1e4, "10 kHz"],
  [1e5, "100 kHz"],
  [1e6, "1 MHz"],
];

function column(header: string, value: (row: RunExportRow) => Cell): Column {
  return { header, value };
}

export const STABILITY_CSV_COLUMNS: readonly Column[] = [
  column("Stability figures", (r) => (r.status !== "done" ? null : r.stability ? "measured" : "not measured (older engine)")),
  column("rms phase jitter (rad)", (r) => num(part(r, "jitter")?.rmsPhaseRad)),
  column("rms jitter (s)", (r) => num(part(r, "jitter")?.rmsJitterS)),
  column("Jitter band from (Hz)", (r) => num(part(r, "jitter")?.bandLowHz)),
  column("Jitter band to (Hz)", (r) => num(part(r, "jitter")?.bandHighHz)),
  column("Jitter at noise floor (yes: the value is the floor, an upper bound)", (r) => yesNo(part(r, "jitter")?.atFloor)),
  ...DECADES.map(([hz, name]) => column(`Phase noise at ${name} (dBc/Hz)`, (r) => num(point(r, hz)?.dbcPerHz))),
  column("Phase noise offsets at noise floor (Hz; their value is the floor)", (r) => {
    const points = obj(r.stability)?.points;
    if (!Array.isArray(points)) return null;
    return points
      .map(obj)
      .filter((p) => p?.atFloor === true && typeof p.offsetHz === "number")
      .map((p) => String(p!.offsetHz))
      .join("; ");
  }),
  column("Period jitter rms (s)", (r) => num(part(r, "periodJitter")?.rmsPeriodJitterS)),
  column("Cycle-to-cycle jitter rms (s)", (r) => num(part(r, "periodJitter")?.rmsCycleToCycleS)),
  column("Period jitter (fraction of the period)", (r) => num(part(r, "periodJitter")?.rmsPeriodJitterFraction)),
  column("Period jitter at noise floor", (r) => yesNo(part(r, "periodJitter")?.atFloor)),
  column("Allan deviation at shortest tau (1)", (r) => num(part(r, "allan")?.adev)),
  column("Shortest tau (s)", (r) => num(part(r, "allan")?.tauS)),
  column("Envelope", (r) => {
    const kind = part(r, "envelope")?.kind;
    return typeof kind === "string" ? kind : null;
  }),
  column("Start-up to 90 % (s)", (r) => num(part(r, "envelope")?.startUpS)),
  column("Envelope growth (1/s)", (r) => num(part(r, "envelope")?.growthPerS)),
  column("Ring-down time constant (s)", (r) => num(part(r, "envelope")?.decayTauS)),
  column("Ring-down time constant 1-sigma (s)", (r) => num(part(r, "envelope")?.decayTauSigmaS)),
  column("Q (1)", (r) => num(part(r, "envelope")?.q)),
  column("Q 1-sigma (1)", (r) => num(part(r, "envelope")?.qSigma)),
];
