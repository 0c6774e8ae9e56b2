/**
 * Two runs side by side: every figure of A and B, and what changed from A to B (before and after a tweak).
 * Pure: no I/O.
 */

/** The figures of one run that a comparison looks at; null when the run has none. */
export interface ComparableRun {
  measuredHz: number | null;
  frequencyUncertaintyHz: number | null;
  predictedHz: number | null;
  driftPpm: number | null;
  impliedExtraCapacitanceF: number | null;
  fundamentalVpk: number | null;
  thdPercent: number | null;
  worstHarmonicDbc: number | null;
  sinadDb: number | null;
  snrDb: number | null;
  sfdrDb: number | null;
  inRecordDriftPpm: number | null;
  /** Harmonic levels by order (2, 3, …), dBc. */
  harmonics: ReadonlyArray<{ order: number; dBc: number | null }>;
}

/** Which way a figure improves: lower THD, higher SINAD, drift closer to zero; null when neither is better. */
export type BetterWhen = "lower" | "higher" | "closer-to-zero" | null;

export interface MetricDifference {
  key: string;
  label: string;
  /** Unit of a, b and change: "Hz", "ppm", "F", "V", "%", "dBc", "dB". */
  unit: string;
  a: number | null;
  b: number | null;
  /** b − a in `unit`; null when either is missing. */
  change: number | null;
  betterWhen: BetterWhen;
  /** Which run is better on this figure; "same" within `resolution`; null when it cannot be said. */
  better: "a" | "b" | "same" | null;
}

export interface RunComparison {
  rows: MetricDifference[];
  /** The frequency change relative to A, ppm. */
  frequencyChangePpm: number | null;
  /** √(u_A² + u_B²), Hz: the standard uncertainty of the frequency change. */
  frequencyChangeUncertaintyHz: number | null;
  /** True when the frequency moved by more than twice that uncertainty (a real change, not noise). */
  frequencyChangeSignificant: boolean | null;
}

function finite(value: number | null | undefined): number | null {
  return typeof value === "number" && Number.isFinite(value) ? value : null;
}

/** Changes smaller than this count as no change, per unit (display resolution of each figure). */
const RESOLUTION: Record<string, number> = { Hz: 0, ppm: 0.05, F: 0.005e-12, V: 1e-6, "%": 0.0005, dBc: 0.05, dB: 0.05 };

function judge(a: number | null, b: number | null, betterWhen: BetterWhen, unit: string): MetricDifference["better"] {
  if (a === null || b === null || betterWhen === null) return null;
  const ma = betterWhen === "closer-to-zero" ? Math.abs(a) : a;
  const mb = betterWhen === "closer-to-zero" ? Math.abs(b) : b;
  if (Math.abs(mb - ma) <= (RESOLUTION[unit] ?? 0)) return "same";
  const bBetter = betterWhen === "higher" ? mb > ma : mb < ma;
  return bBetter ? "b" : "a";
}

function row(key: string, label: string, unit: string, a: number | null | undefined, b: number | null | undefined, betterWhen: BetterWhen): MetricDifference {
  const fa = finite(a);
  const fb = finite(b);
  return { key, label, unit, a: fa, b: fb, change: fa !== null && fb !== null ? fb - fa : null, betterWhen, better: judge(fa, fb, betterWhen, unit) };
}

/**
 * Compares run B with run A, figure by figure.
 *
 * @param a - the earlier run (before the tweak).
 * @param b - the later run.
 * @returns one row per figure (harmonics of either run included), and whether the frequency change exceeds twice
 *   its combined standard uncertainty.
 */
export function compareRuns(a: ComparableRun, b: ComparableRun): RunComparison {
  const rows: MetricDifference[] = [
    row("measuredHz", "Measured frequency", "Hz", a.measuredHz, b.measuredHz, null),
    row("predictedHz", "Predicted frequency", "Hz", a.predictedHz, b.predictedHz, null),
    row("driftPpm", "Drift vs predicted", "ppm", a.driftPpm, b.driftPpm, "closer-to-zero"),
    row("impliedExtraCapacitanceF", "Implied extra capacitance", "F", a.impliedExtraCapacitanceF, b.impliedExtraCapacitanceF, "closer-to-zero"),
    row("fundamentalVpk", "Fundamental amplitude (peak)", "V", a.fundamentalVpk, b.fundamentalVpk, null),
    row("thdPercent", "THD", "%", a.thdPercent, b.thdPercent, "lower"),
    row("worstHarmonicDbc", "Worst harmonic", "dBc", a.worstHarmonicDbc, b.worstHarmonicDbc, "lower"),
    row("sinadDb", "SINAD", "dB", a.sinadDb, b.sinadDb, "higher"),
    row("snrDb", "SNR", "dB", a.snrDb, b.snrDb, "higher"),
    row("sfdrDb", "SFDR", "dB", a.sfdrDb, b.sfdrDb, "higher"),
    row("inRecordDriftPpm", "In-record drift", "ppm", a.inRecordDriftPpm, b.inRecordDriftPpm, "closer-to-zero"),
  ];
  const orders = [...new Set([...a.harmonics, ...b.harmonics].map((h) => h.order))].filter((o) => o >= 2).sort((x, y) => x - y);
  for (const order of orders) {
    const la = a.harmonics.find((h) => h.order === order)?.dBc;
    const lb = b.harmonics.find((h) => h.order === order)?.dBc;
    rows.push(row(`harmonic-${order}`, `Harmonic ${order}`, "dBc", la, lb, "lower"));
  }

  const fa = finite(a.measuredHz);
  const fb = finite(b.measuredHz);
  const ua = finite(a.frequencyUncertaintyHz);
  const ub = finite(b.frequencyUncertaintyHz);
  const frequencyChangePpm = fa !== null && fb !== null && fa !== 0 ? ((fb - fa) / fa) * 1e6 : null;
  const frequencyChangeUncertaintyHz = ua !== null && ub !== null ? Math.hypot(ua, ub) : null;
  const frequencyChangeSignificant =
    fa !== null && fb !== null && frequencyChangeUncertaintyHz !== null ? Math.abs(fb - fa) > 2 * frequencyChangeUncertaintyHz : null;
  return { rows, frequencyChangePpm, frequencyChangeUncertaintyHz, frequencyChangeSignificant };
}
