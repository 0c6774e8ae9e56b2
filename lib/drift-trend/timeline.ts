/**
 * The series of a build's timeline chart, from its analysed runs and its tweaks. Runs sit at x = 1, 2, 3… in
 * upload order; every run also owns the stretch from x − ½ to x + ½, so the prediction, its bands and the spec
 * lines are flat across a run and step exactly halfway between two runs when a tweak changed a part there.
 * Tweak markers sit at those halfway points. Pure: no I/O.
 */
import type { RunVerdict } from "@/lib/spec/types";

/** Points per run in the aligned series: the left edge, the run itself, the right edge. */
export const POINTS_PER_RUN = 3;

export interface FrequencyBandHz {
  minHz: number;
  maxHz: number;
}

/** The spec fields the charts draw. */
export interface TimelineSpec {
  targetHz?: number | null;
  toleranceValue?: number | null;
  toleranceUnit?: "percent" | "ppm" | null;
  maxThdPercent?: number | null;
  maxHarmonicDbc?: number | null;
}

/** One analysed run with what its snapshot predicted. */
export interface TimelineRunInput {
  id: string;
  createdAt: Date | string;
  originalFilename: string;
  measuredHz: number | null;
  frequencyUncertaintyHz: number | null;
  predictedHz: number | null;
  worstCase: FrequencyBandHz | null;
  statistical: FrequencyBandHz | null;
  spec: TimelineSpec | null;
  thdPercent: number | null;
  worstHarmonicDbc: number | null;
  verdict: RunVerdict | null;
}

/** A tweak of the build; planned ones have not happened and are left out. */
export interface TimelineTweakInput {
  id: string;
  createdAt: Date | string;
  partRef: string | null;
  planned: boolean;
  /** The tweak in words, e.g. "C2 12 nF → 15 nF — more feedback". */
  text: string;
}

/** A place between two runs where one or more tweaks happened. */
export interface TimelineMarker {
  /** 0.5 before the first run, n + 0.5 after the last. */
  x: number;
  /** 1-based marker number, for the "T1" label and the list under the chart. */
  number: number;
  tweaks: TimelineTweakInput[];
  /** True when one of the tweaks changed a part (the prediction may step here). */
  changesPart: boolean;
}

export interface TimelineRun extends TimelineRunInput {
  /** 1-based position on the x axis. */
  index: number;
  /** Stretch of the build between applied tweaks (0 before the first tweak). */
  segment: number;
  /** Frequency tolerance window around the target at that run, Hz; null without a target and tolerance. */
  toleranceBand: FrequencyBandHz | null;
}

export interface TimelineSeries {
  runs: TimelineRun[];
  markers: TimelineMarker[];
  /** Aligned x values, three per run (x − ½, x, x + ½). */
  x: number[];
  measuredHz: (number | null)[];
  measuredLowHz: (number | null)[];
  measuredHighHz: (number | null)[];
  predictedHz: (number | null)[];
  worstMinHz: (number | null)[];
  worstMaxHz: (number | null)[];
  statMinHz: (number | null)[];
  statMaxHz: (number | null)[];
  targetHz: (number | null)[];
  toleranceLowHz: (number | null)[];
  toleranceHighHz: (number | null)[];
  thdPercent: (number | null)[];
  worstHarmonicDbc: (number | null)[];
  maxThdPercent: (number | null)[];
  maxHarmonicDbc: (number | null)[];
}

function time(value: Date | string): number {
  const t = (value instanceof Date ? value : new Date(value)).getTime();
  if (Number.isNaN(t)) throw new RangeError(`createdAt must be a valid date; got ${String(value)}`);
  return t;
}

function finite(value: number | null | undefined): number | null {
  return typeof value === "number" && Number.isFinite(value) ? value : null;
}

/**
 * The frequency window a spec allows.
 *
 * @param spec - target (Hz) and tolerance (± percent or ppm).
 * @returns { minHz, maxHz }, or null when the target or the tolerance is missing.
 */
export function toleranceBandHz(spec: TimelineSpec | null | undefined): FrequencyBandHz | null {
  const target = finite(spec?.targetHz);
  const tol = finite(spec?.toleranceValue);
  if (target === null || tol === null) return null;
  const fraction = spec?.toleranceUnit === "ppm" ? tol / 1e6 : tol / 100;
  return { minHz: target * (1 - fraction), maxHz: target * (1 + fraction) };
}

/**
 * Which run a data index of the aligned series belongs to.
 * @param index - index into `x`.
 * @returns the 0-based run position.
 */
export function runPositionAt(index: number): number {
  return Math.floor(index / POINTS_PER_RUN);
}

/**
 * Lays out a build's runs and tweaks for the timeline and harmonics charts.
 *
 * @param runs - analysed runs in any order (sorted here by upload time, then id).
 * @param tweaks - the build's tweaks in any order; planned ones are ignored.
 * @returns per-run rows (index, segment, tolerance window), tweak markers, and aligned series for uPlot.
 * @throws RangeError when a date cannot be read.
 */
export function buildTimelineSeries(runs: readonly TimelineRunInput[], tweaks: readonly TimelineTweakInput[]): TimelineSeries {
  for (const item of [...runs, ...tweaks]) time(item.createdAt);
  const sortedRuns = [...runs].sort((a, b) => time(a.createdAt) - time(b.createdAt) || a.id.localeCompare(b.id));
  const applied = tweaks.filter((t) => !t.planned).sort((a, b) => time(a.createdAt) - time(b.createdAt) || a.id.localeCompare(b.id));

  // A tweak belongs before the first run uploaded after it (or at the same moment: the capture follows it).
  const before = new Map<number, TimelineTweakInput[]>();
  let r = 0;
  for (const t of applied) {
    const at = time(t.createdAt);
    while (r < sortedRuns.length && time(sortedRuns[r].createdAt) < at) r++;
    before.set(r, [...(before.get(r) ?? []), t]);
  }

  const markers: TimelineMarker[] = [...before.entries()]
    .sort(([a], [b]) => a - b)
    .map(([position, list], i) => ({ x: position + 0.5, number: i + 1, tweaks: list, changesPart: list.some((t) => t.partRef !== null) }));

  let segment = 0;
  const out: TimelineSeries = {
    runs: [],
    markers,
    x: [],
    measuredHz: [],
    measuredLowHz: [],
    measuredHighHz: [],
    predictedHz: [],
    worstMinHz: [],
    worstMaxHz: [],
    statMinHz: [],
    statMaxHz: [],
    targetHz: [],
    toleranceLowHz: [],
    toleranceHighHz: [],
    thdPercent: [],
    worstHarmonicDbc: [],
    maxThdPercent: [],
    maxHarmonicDbc: [],
  };
  sortedRuns.forEach((run, position) => {
    // Tweaks before the first run do not start a new segment: nothing was measured before them.
    if (before.has(position) && position > 0) segment++;
    const index = position + 1;
    const band = toleranceBandHz(run.spec);
    out.runs.push({ ...run, index, segment, toleranceBand: band });
    const measured = finite(run.measuredHz);
    const u = finite(run.frequencyUncertaintyHz);
    const flat = (value: number | null | undefined) => {
      const v = finite(value);
      return [v, v, v];
    };
    const centreOnly = (value: number | null) => [null, value, null];
    out.x.push(index - 0.5, index, index + 0.5);
    out.measuredHz.push(...centreOnly(measured));
    out.measuredLowHz.push(...centreOnly(measured !== null && u !== null ? measured - u : null));
    out.measuredHighHz.push(...centreOnly(measured !== null && u !== null ? measured + u : null));
    out.predictedHz.push(...flat(run.predictedHz));
    out.worstMinHz.push(...flat(run.worstCase?.minHz));
    out.worstMaxHz.push(...flat(run.worstCase?.maxHz));
    out.statMinHz.push(...flat(run.statistical?.minHz));
    out.statMaxHz.push(...flat(run.statistical?.maxHz));
    out.targetHz.push(...flat(run.spec?.targetHz));
    out.toleranceLowHz.push(...flat(band?.minHz));
    out.toleranceHighHz.push(...flat(band?.maxHz));
    out.thdPercent.push(...centreOnly(finite(run.thdPercent)));
    out.worstHarmonicDbc.push(...centreOnly(finite(run.worstHarmonicDbc)));
    out.maxThdPercent.push(...flat(run.spec?.maxThdPercent));
    out.maxHarmonicDbc.push(...flat(run.spec?.maxHarmonicDbc));
  });
  return out;
}
