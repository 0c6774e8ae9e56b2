import type { SensitivityRunInput, SensitivityTweakInput } from "./types";

function time(value: Date | string): number {
  const t = (value instanceof Date ? value : new Date(value)).getTime();
  if (Number.isNaN(t)) throw new RangeError(`createdAt must be a valid date; got ${String(value)}`);
  return t;
}

/** Runs in upload order (then id, so equal times sort the same way everywhere). */
export function sortRuns<R extends Pick<SensitivityRunInput, "id" | "createdAt">>(runs: readonly R[]): R[] {
  return [...runs].sort((a, b) => time(a.createdAt) - time(b.createdAt) || a.id.localeCompare(b.id));
}

/**
 * Splits a build's runs where tweaks happened between them, the way the build timeline does
 * (lib/drift-trend/timeline.ts): a tweak belongs before the first run uploaded at or after it.
 *
 * @param runs - any order
 * @param tweaks - any order; planned tweaks are ignored
 * @param splitOn - "part": only tweaks that changed a part start a new group (a regression must never mix build
 *   states); "any": every applied tweak does (repeated runs must have nothing done between them)
 * @returns the groups in time order, each in upload order; empty groups are left out
 */
export function groupRunsByTweaks<R extends Pick<SensitivityRunInput, "id" | "createdAt">>(
  runs: readonly R[],
  tweaks: readonly SensitivityTweakInput[],
  splitOn: "part" | "any",
): R[][] {
  const sorted = sortRuns(runs);
  const cuts = tweaks
    .filter((t) => !t.planned && (splitOn === "any" || t.partRef !== null))
    .map((t) => time(t.createdAt))
    .sort((a, b) => a - b);
  const groups: R[][] = [];
  let current: R[] = [];
  let c = 0;
  for (const run of sorted) {
    const at = time(run.createdAt);
    let crossed = false;
    while (c < cuts.length && cuts[c] <= at) {
      crossed = true;
      c++;
    }
    if (crossed && current.length > 0) {
      groups.push(current);
      current = [];
    }
    current.push(run);
  }
  if (current.length > 0) groups.push(current);
  return groups;
}

/** The same condition: both values unknown, or both known and within ± band. */
function close(a: number | null, b: number | null, band: number): boolean {
  if (a === null || b === null) return a === b;
  return Math.abs(a - b) <= band;
}

/**
 * Repeated runs: within one group (no tweak between them), the runs whose supply and temperature stay within the
 * bands of the set's first run, in upload order. Runs at other conditions in between do not break a set: going to
 * 9 V and back to 12 V is still a repeat at 12 V.
 */
export function repeatRuns<R extends Pick<SensitivityRunInput, "supplyV" | "temperatureC">>(group: readonly R[], supplyBandV: number, temperatureBandK: number): R[][] {
  const sets: R[][] = [];
  for (const run of group) {
    const set = sets.find((s) => close(s[0].supplyV, run.supplyV, supplyBandV) && close(s[0].temperatureC, run.temperatureC, temperatureBandK));
    if (set) set.push(run);
    else sets.push([run]);
  }
  return sets;
}
