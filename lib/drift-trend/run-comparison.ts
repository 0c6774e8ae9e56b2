/**
 * Two runs side by side: every figure of A and B, and what changed from A to B (before and after a tweak).
 * Where the design's spec sets a limit (or a target window) each run is judged against it, not against the other
 * run: "B in spec, A not" says more than "B lower". Figures the spec does not cover fall back to their direction
 * (higher SINAD, lower THD). Pure: no I/O.
 */
import type { DesignSpec } from "@/lib/spec/types";

/** A run's spec verdict, as stored; null before the analysis or without a spec. */
export type ComparableVerdict = "pass" | "fail" | "inconclusive" | null;

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
  /**
   * Harmonic levels by order (2, 3, …), dBc; an order under the noise has dBc null and its detection limit, one
   * that could not be separated has status "not-separable".
   */
  harmonics: ReadonlyArray<{ order: number; dBc: number | null; detectionLimitDbc?: number | null; status?: string | null }>;
  /** The spec the run was judged against (its snapshot's); absent or null for none. */
  spec?: DesignSpec | null;
  verdict?: ComparableVerdict;
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
  /** Which run is better on this figure; "same" within `resolution` (or both on the same side of a limit); null when it cannot be said. */
  better: "a" | "b" | "same" | null;
  /**
   * What `better` rests on: "spec" (a limit of the spec), "target" (the target frequency and its window),
   * "direction" (no limit: lower THD, higher SINAD…), null when there is no judgement.
   */
  basis: "spec" | "target" | "direction" | null;
  /** With basis spec or target: whether each run is within the limit (null when its figure is missing, or no window). */
  within: { a: boolean | null; b: boolean | null } | null;
  /** Why a side has no figure, in a few words ("< −72.0 dBc" under the noise, "not separable"); absent when it has one. */
  missing?: { a?: string; b?: string };
}

export interface RunComparison {
  rows: MetricDifference[];
  /** Both runs' verdicts, and which is the better one (pass over cannot-judge over fail). */
  verdict: { a: ComparableVerdict; b: ComparableVerdict; better: "a" | "b" | "same" | null };
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

/** A limit a figure is judged against: the test, and what the judgement rests on. */
interface Limit {
  inside: (value: number) => boolean;
  basis: "spec" | "target";
}

function row(
  key: string,
  label: string,
  unit: string,
  a: number | null | undefined,
  b: number | null | undefined,
  betterWhen: BetterWhen,
  limit: Limit | null = null,
): MetricDifference {
  const fa = finite(a);
  const fb = finite(b);
  const change = fa !== null && fb !== null ? fb - fa : null;
  if (limit) {
    const within = { a: fa === null ? null : limit.inside(fa), b: fb === null ? null : limit.inside(fb) };
    const better = within.a === null || within.b === null ? null : within.a === within.b ? "same" : within.b ? "b" : "a";
    return { key, label, unit, a: fa, b: fb, change, betterWhen, better, basis: limit.basis, within };
  }
  const better = judge(fa, fb, betterWhen, unit);
  return { key, label, unit, a: fa, b: fb, change, betterWhen, better, basis: better === null ? null : "direction", within: null };
}

/** The spec's limits, one per figure it covers (the earlier run's spec when the two differ, B's when A has none). */
function specLimits(spec: DesignSpec | null | undefined) {
  const targetHz = finite(spec?.targetHz);
  const tolerance = finite(spec?.toleranceValue);
  const windowHz = targetHz !== null && tolerance !== null ? (spec?.toleranceUnit === "ppm" ? targetHz * tolerance * 1e-6 : (targetHz * tolerance) / 100) : null;
  const maxThd = finite(spec?.maxThdPercent);
  const maxHarmonic = finite(spec?.maxHarmonicDbc);
  const minVpk = finite(spec?.minFundamentalVpk);
  const maxDrift = finite(spec?.maxDriftPpm);
  const limit = (inside: (v: number) => boolean, basis: Limit["basis"] = "spec"): Limit => ({ inside, basis });
  return {
    targetHz,
    frequency: targetHz !== null && windowHz !== null ? limit((f) => Math.abs(f - targetHz) <= windowHz, "target") : null,
    offTargetPpm: targetHz !== null && windowHz !== null ? limit((ppm) => Math.abs(ppm) * 1e-6 * targetHz <= windowHz, "target") : null,
    thd: maxThd !== null ? limit((v) => v <= maxThd) : null,
    harmonic: maxHarmonic !== null ? limit((v) => v <= maxHarmonic) : null,
    amplitude: minVpk !== null ? limit((v) => v >= minVpk) : null,
    inRecordDrift: maxDrift !== null ? limit((v) => Math.abs(v) <= maxDrift) : null,
  };
}

const VERDICT_RANK: Record<NonNullable<ComparableVerdict>, number> = { fail: 0, inconclusive: 1, pass: 2 };

/**
 * Compares run B with run A, figure by figure.
 *
 * @param a - the earlier run (before the tweak).
 * @param b - the later run.
 * @returns one row per figure (harmonics of either run included), and whether the frequency change exceeds twice
 *   its combined standard uncertainty.
 */
export function compareRuns(a: ComparableRun, b: ComparableRun): RunComparison {
  const limits = specLimits(a.spec ?? b.spec);
  const targetA = finite(a.spec?.targetHz) ?? limits.targetHz;
  const targetB = finite(b.spec?.targetHz) ?? limits.targetHz;
  const offTarget = (f: number | null, t: number | null) => (f !== null && t !== null && t !== 0 ? ((f - t) / t) * 1e6 : null);
  const hasTarget = targetA !== null || targetB !== null;
  const rows: MetricDifference[] = [
    row("targetHz", "Target frequency", "Hz", targetA, targetB, null),
    row("measuredHz", "Measured frequency", "Hz", a.measuredHz, b.measuredHz, null, limits.frequency),
    // Without a tolerance window the target still orders the runs: nearer it is better.
    row("offTargetPpm", "Off target", "ppm", offTarget(finite(a.measuredHz), targetA), offTarget(finite(b.measuredHz), targetB), hasTarget ? "closer-to-zero" : null, limits.offTargetPpm),
    row("predictedHz", "Predicted frequency", "Hz", a.predictedHz, b.predictedHz, null),
    // With a target, nearness to the prediction says how good the model is, not the circuit: the target judges.
    row("driftPpm", "Drift vs predicted", "ppm", a.driftPpm, b.driftPpm, hasTarget ? null : "closer-to-zero"),
    row("impliedExtraCapacitanceF", "Implied extra capacitance", "F", a.impliedExtraCapacitanceF, b.impliedExtraCapacitanceF, hasTarget ? null : "closer-to-zero"),
    row("fundamentalVpk", "Fundamental amplitude (peak)", "V", a.fundamentalVpk, b.fundamentalVpk, null, limits.amplitude),
    row("thdPercent", "THD", "%", a.thdPercent, b.thdPercent, "lower", limits.thd),
    row("worstHarmonicDbc", "Worst harmonic", "dBc", a.worstHarmonicDbc, b.worstHarmonicDbc, "lower", limits.harmonic),
    row("sinadDb", "SINAD", "dB", a.sinadDb, b.sinadDb, "higher"),
    row("snrDb", "SNR", "dB", a.snrDb, b.snrDb, "higher"),
    row("sfdrDb", "SFDR", "dB", a.sfdrDb, b.sfdrDb, "higher"),
    row("inRecordDriftPpm", "In-record drift", "ppm", a.inRecordDriftPpm, b.inRecordDriftPpm, "closer-to-zero", limits.inRecordDrift),
  ];
  const orders = [...new Set([...a.harmonics, ...b.harmonics].map((h) => h.order))].filter((o) => o >= 2).sort((x, y) => x - y);
  const why = (h: ComparableRun["harmonics"][number] | undefined): string | undefined => {
    if (!h || finite(h.dBc) !== null) return undefined;
    if (h.status === "not-separable") return "not separable";
    const limitDbc = finite(h.detectionLimitDbc);
    return limitDbc !== null ? `< ${limitDbc.toFixed(1).replace("-", "−")} dBc` : undefined;
  };
  for (const order of orders) {
    const ha = a.harmonics.find((h) => h.order === order);
    const hb = b.harmonics.find((h) => h.order === order);
    const r = row(`harmonic-${order}`, `Harmonic ${order}`, "dBc", ha?.dBc, hb?.dBc, "lower", limits.harmonic);
    const missing = { a: why(ha), b: why(hb) };
    rows.push(missing.a || missing.b ? { ...r, missing } : r);
  }

  const fa = finite(a.measuredHz);
  const fb = finite(b.measuredHz);
  const ua = finite(a.frequencyUncertaintyHz);
  const ub = finite(b.frequencyUncertaintyHz);
  const frequencyChangePpm = fa !== null && fb !== null && fa !== 0 ? ((fb - fa) / fa) * 1e6 : null;
  const frequencyChangeUncertaintyHz = ua !== null && ub !== null ? Math.hypot(ua, ub) : null;
  const frequencyChangeSignificant =
    fa !== null && fb !== null && frequencyChangeUncertaintyHz !== null ? Math.abs(fb - fa) > 2 * frequencyChangeUncertaintyHz : null;
  const va = a.verdict ?? null;
  const vb = b.verdict ?? null;
  const verdictBetter = va === null || vb === null ? null : VERDICT_RANK[va] === VERDICT_RANK[vb] ? "same" : VERDICT_RANK[vb] > VERDICT_RANK[va] ? "b" : "a";
  return { rows, verdict: { a: va, b: vb, better: verdictBetter }, frequencyChangePpm, frequencyChangeUncertaintyHz, frequencyChangeSignificant };
}
