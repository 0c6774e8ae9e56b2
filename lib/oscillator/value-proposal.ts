/**
 * Standard part values that land a new design on a target frequency as it will be built here: the search behind
 * the design form's "propose values" step. The lab's figure for the construction and topology is taken as an
 * extra parallel capacitance across C_eff (as calibrated predictions take it), so the proposal aims at what the
 * board will measure, not at the bare model. Pure: no I/O.
 *
 * Closed forms (see ../shared REFERENCES §1): f0 = 1/(2π√(L·C_eff)); Colpitts C_eff = C1·C2/(C1+C2); Clapp
 * 1/C_eq = 1/C1 + 1/C2 + 1/C3; Hartley L_eff = L1 + L2 ± 2M. The frequency of every proposal is computed by
 * predictOscillator, the same model the design page uses.
 */
import type { OscillatorDesign, PartSpec, Topology } from "./design";
import { nearestPreferred, nextAbove, nextBelow, preferredValuesBetween, type ESeriesName } from "./e-series";
import { predictOscillator } from "./topologies";

/** The series a proposal may draw from: the two every parts drawer stocks. */
export type ProposalSeries = Extract<ESeriesName, "E12" | "E24">;

export interface ValueProposalInput {
  topology: Topology;
  targetHz: number;
  series: ProposalSeries;
  /** The lab's figure for the chosen construction and topology, F (signed); 0 when there is none. */
  labCapacitanceF?: number;
  /**
   * Inductances already chosen (an inductor on hand, a wound coil), H: L for tank, Colpitts and Clapp; L1 and L2
   * (and M or k) for Hartley, which the search never changes because a tapped coil is one part.
   */
  fixed?: Record<string, number>;
  /** Colpitts and Clapp: C2/C1, the inverse of the feedback fraction C1/C2. Default 1 (β = 1, C1 = C2). */
  dividerRatio?: number;
  /** Reactance of the inductor at the target the search prefers when it picks L, Ω. Default 200 Ω. */
  reactanceOhm?: number;
  /** Proposals returned at most, best first. Default 3. */
  limit?: number;
}

export interface ValueProposal {
  /** Part values in SI units, each a preferred value of the series (inductances given in `fixed` kept as given). */
  values: Record<string, number>;
  /** The frequency these values give with the lab's figure added, Hz. */
  predictedHz: number;
  /** (predicted − target)/target, ppm. */
  errorPpm: number;
  /** 2πf·L of the (total) inductance at the target, Ω. */
  reactanceOhm: number;
}

// Inductors the search picks from when none is given: 100 nH to 10 mH covers the bench's HF to LF tanks.
const L_MIN_H = 100e-9;
const L_MAX_H = 10e-3;
// Capacitors it accepts: below 1 pF strays rule; above 10 µF nobody builds a tank.
const C_MIN_F = 1e-12;
const C_MAX_F = 10e-6;
/** In a Clapp the divider is this many times C3, so C3 sets the frequency (C_eq → C3 as C1, C2 grow). */
const CLAPP_DIVIDER_FACTOR = 10;
const DEFAULT_REACTANCE_OHM = 200;
/**
 * How far C2/C1 may stray from the ratio asked (a factor): the divider sets the feedback fraction and the start-up
 * gain, so a pair that hits the frequency by skewing it is only taken when no pair near the ratio comes close.
 */
const RATIO_SLACK = 1.5;

/** A preferred value and its two neighbours: the three a rounding can land on. */
function around(value: number, series: ESeriesName): number[] {
  const p = nearestPreferred(value, series);
  return [nextBelow(p, series), p, nextAbove(p, series)].filter((v) => v >= C_MIN_F && v <= C_MAX_F);
}

function withinCaps(...values: number[]): boolean {
  return values.every((v) => v >= C_MIN_F && v <= C_MAX_F);
}

/** C_eff the tank needs at the target with inductance `lEffH`, before the lab's figure: 1/((2πf)²L) − C_lab. */
function neededCEffF(targetHz: number, lEffH: number, labF: number): number {
  const w = 2 * Math.PI * targetHz;
  return 1 / (w * w * lEffH) - labF;
}

function part(valueSi: number): PartSpec {
  return { valueSi };
}

function evaluate(topology: Topology, values: Record<string, number>, labF: number, targetHz: number, lEffH: number): ValueProposal {
  const parts = Object.fromEntries(Object.entries(values).map(([k, v]) => [k, part(v)]));
  const design: OscillatorDesign = { topology, parts, calibrationCapacitanceF: labF };
  const predictedHz = predictOscillator(design).predictedHz;
  return { values, predictedHz, errorPpm: ((predictedHz - targetHz) / targetHz) * 1e6, reactanceOhm: 2 * Math.PI * targetHz * lEffH };
}

/** The best capacitor choice for one inductance, or null when no preferred capacitors fit. */
function bestCapacitors(input: Required<Pick<ValueProposalInput, "topology" | "targetHz" | "series" | "dividerRatio">>, inductances: Record<string, number>, lEffH: number, labF: number): ValueProposal | null {
  const { topology, targetHz, series, dividerRatio: r } = input;
  const need = neededCEffF(targetHz, lEffH, labF);
  if (!(need > 0)) return null;
  const candidates: Record<string, number>[] = [];
  if (topology === "tank" || topology === "hartley") {
    for (const c of around(need, series)) candidates.push({ ...inductances, C: c });
  } else if (topology === "colpitts") {
    // C1·C2/(C1+C2) = need with C2 = r·C1 → C1 = need·(1 + r)/r.
    const c1Ideal = (need * (1 + r)) / r;
    if (!withinCaps(c1Ideal)) return null;
    for (const c1 of around(c1Ideal, series)) {
      // The C2 that completes the series pair for this C1: 1/C2 = 1/need − 1/C1.
      const c2Exact = 1 / (1 / need - 1 / c1);
      const c2s = c2Exact > 0 && Number.isFinite(c2Exact) ? around(c2Exact, series) : [];
      for (const c2 of c2s) candidates.push({ ...inductances, C1: c1, C2: c2 });
    }
  } else {
    // Clapp: the divider CLAPP_DIVIDER_FACTOR times C3, in the ratio asked; C3 then trims C_eq onto the target.
    const c3Rough = need * (1 + (1 + 1 / r) / CLAPP_DIVIDER_FACTOR);
    const c1 = nearestPreferred(c3Rough * CLAPP_DIVIDER_FACTOR, series);
    const c2 = nearestPreferred(c1 * r, series);
    if (!withinCaps(c1, c2)) return null;
    const c3Exact = 1 / (1 / need - 1 / c1 - 1 / c2);
    if (!(c3Exact > 0) || !Number.isFinite(c3Exact)) return null;
    for (const c3 of around(c3Exact, series)) candidates.push({ ...inductances, C1: c1, C2: c2, C3: c3 });
  }
  const nearRatio = (v: Record<string, number>) => v.C1 === undefined || v.C2 === undefined || Math.abs(Math.log(v.C2 / v.C1 / r)) <= Math.log(RATIO_SLACK);
  const kept = candidates.some(nearRatio) ? candidates.filter(nearRatio) : candidates;
  let best: ValueProposal | null = null;
  for (const values of kept) {
    const p = evaluate(topology, values, labF, targetHz, lEffH);
    if (!best || Math.abs(p.errorPpm) < Math.abs(best.errorPpm)) best = p;
  }
  return best;
}

/** L_eff of a Hartley coil from its parts: L1 + L2 + 2M (aiding), with M = k√(L1·L2) when k is given. */
function hartleyLEffH(fixed: Record<string, number>): number {
  const m = fixed.M ?? (fixed.k !== undefined ? fixed.k * Math.sqrt(fixed.L1 * fixed.L2) : 0);
  return fixed.L1 + fixed.L2 + 2 * m;
}

/**
 * Proposes standard values that put a design on `targetHz` as built here.
 *
 * @returns up to `limit` proposals. With the inductance given, the best capacitor choices for it (one proposal);
 *   without it, one proposal per candidate inductor, the inductors whose reactance at the target is nearest
 *   `reactanceOhm` first.
 * @throws RangeError for a target that is not a positive finite frequency, a divider ratio that is not positive,
 *   or a Hartley without its coil (L1 and L2 in `fixed`).
 * @example proposeValues({ topology: "colpitts", targetHz: 6.1640444e6, series: "E24", fixed: { L: 10e-6 }, dividerRatio: 2 })
 *   → C1 100 pF, C2 200 pF (the tutorial Colpitts of REFERENCES §1 row 7).
 */
export function proposeValues(input: ValueProposalInput): ValueProposal[] {
  const { topology, targetHz, series } = input;
  if (!(Number.isFinite(targetHz) && targetHz > 0)) throw new RangeError(`the target must be a positive frequency in Hz; got ${targetHz}`);
  const labF = input.labCapacitanceF ?? 0;
  if (!Number.isFinite(labF)) throw new RangeError(`the lab's capacitance must be a finite number of F; got ${labF}`);
  const dividerRatio = input.dividerRatio ?? 1;
  if (!(Number.isFinite(dividerRatio) && dividerRatio > 0)) throw new RangeError(`C2/C1 must be a positive ratio; got ${dividerRatio}`);
  const limit = Math.max(1, Math.floor(input.limit ?? 3));
  const fixed = input.fixed ?? {};
  const settings = { topology, targetHz, series, dividerRatio };

  if (topology === "hartley") {
    if (!(fixed.L1 > 0 && fixed.L2 > 0)) throw new RangeError("a Hartley's coil is one part: give L1 and L2 (and M or k) first, then the capacitor is proposed");
    const coil: Record<string, number> = { L1: fixed.L1, L2: fixed.L2, ...(fixed.M !== undefined ? { M: fixed.M } : {}), ...(fixed.k !== undefined ? { k: fixed.k } : {}) };
    const p = bestCapacitors(settings, coil, hartleyLEffH(fixed), labF);
    return p ? [p] : [];
  }
  if (fixed.L !== undefined) {
    if (!(fixed.L > 0)) throw new RangeError(`the inductance must be above 0 H; got ${fixed.L}`);
    const p = bestCapacitors(settings, { L: fixed.L }, fixed.L, labF);
    return p ? [p] : [];
  }
  const wantOhm = input.reactanceOhm ?? DEFAULT_REACTANCE_OHM;
  const byReactance = preferredValuesBetween(L_MIN_H, L_MAX_H, series)
    .map((l) => ({ l, distance: Math.abs(Math.log((2 * Math.PI * targetHz * l) / wantOhm)) }))
    .sort((a, b) => a.distance - b.distance);
  const out: ValueProposal[] = [];
  for (const { l } of byReactance) {
    const p = bestCapacitors(settings, { L: l }, l, labF);
    if (p) out.push(p);
    if (out.length >= limit) break;
  }
  return out;
}
