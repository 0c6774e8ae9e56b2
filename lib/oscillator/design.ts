/**
 * The serialisable description of an oscillator design, and a plain (zod-free) validator for it.
 * The web layer wraps {@link validateDesign} in its zod schema; the CLI and the library call it directly.
 */

import { limitProblem } from "./limits";
import { formatEngineering } from "./units";

export type Topology = "tank" | "colpitts" | "hartley" | "clapp";

export const TOPOLOGIES: readonly Topology[] = ["tank", "colpitts", "hartley", "clapp"];

/** One part of a design. */
export interface PartSpec {
  /** Nominal value in SI units: F for capacitors, H for inductors and M, dimensionless for k. */
  valueSi: number;
  /** Symmetric tolerance as a fraction (0.05 for ±5 %), from 0 to below 1. */
  tolerance?: number;
  /** Nominal temperature coefficient of the value, ppm/K. */
  tempcoPpmPerK?: number;
  /** Half-width of the tempco's own tolerance, ppm/K (30 for C0G). */
  tempcoSpreadPpmPerK?: number;
}

export type WindingSense = "aiding" | "opposing";

export interface OscillatorDesign {
  topology: Topology;
  /**
   * Parts by reference: tank L, C; colpitts L, C1, C2; clapp L, C1, C2, C3; hartley L1, L2, C and optionally M
   * (mutual inductance, H) or k (coupling coefficient, 0..1).
   */
  parts: Record<string, PartSpec>;
  /** Known capacitance in parallel with the effective tank capacitance (stray, probe input, trimmer), F. */
  extraCapacitanceF?: number;
  /**
   * Signed capacitance inferred from a measurement and taken as real (see drift.ts), added to C_eff like the extra
   * capacitance, F. Negative when the build runs above its model. Set by retune calculations, rarely by people.
   */
  calibrationCapacitanceF?: number;
  /** Hartley only: whether the two windings' fields add (the usual tapped coil) or oppose. Default aiding. */
  windings?: WindingSense;
}

export type PartKind = "inductance" | "capacitance" | "coupling";

export interface PartRole {
  kind: PartKind;
  required: boolean;
  description: string;
}

/** The parts each topology takes. C1 is always the output (collector/drain) side, C2 the input (base/gate) side. */
export const TOPOLOGY_PARTS: Record<Topology, Readonly<Record<string, PartRole>>> = {
  tank: {
    L: { kind: "inductance", required: true, description: "tank inductor" },
    C: { kind: "capacitance", required: true, description: "tank capacitor" },
  },
  colpitts: {
    L: { kind: "inductance", required: true, description: "tank inductor" },
    C1: { kind: "capacitance", required: true, description: "divider capacitor on the output (collector/drain) side" },
    C2: { kind: "capacitance", required: true, description: "divider capacitor on the input (base/gate) side" },
  },
  hartley: {
    L1: { kind: "inductance", required: true, description: "winding on the output (collector/drain) side" },
    L2: { kind: "inductance", required: true, description: "winding on the input (base/gate) side" },
    C: { kind: "capacitance", required: true, description: "tank capacitor" },
    M: { kind: "inductance", required: false, description: "mutual inductance between L1 and L2" },
    k: { kind: "coupling", required: false, description: "coupling coefficient between L1 and L2 (0 to 1)" },
  },
  clapp: {
    L: { kind: "inductance", required: true, description: "tank inductor" },
    C1: { kind: "capacitance", required: true, description: "divider capacitor on the output (collector/drain) side" },
    C2: { kind: "capacitance", required: true, description: "divider capacitor on the input (base/gate) side" },
    C3: { kind: "capacitance", required: true, description: "tuning capacitor in series with L" },
  },
};

const UNIT_OF_KIND: Record<PartKind, string> = { inductance: "H", capacitance: "F", coupling: "" };

/**
 * The SI unit symbol of a part: "F", "H", or "" for the coupling coefficient k.
 *
 * @throws RangeError when the topology does not use the part.
 */
export function partUnit(topology: Topology, ref: string): string {
  const role = TOPOLOGY_PARTS[topology][ref];
  if (!role) throw new RangeError(`part ${ref} is not used by ${topology}`);
  return UNIT_OF_KIND[role.kind];
}

function describe(value: unknown): string {
  if (typeof value === "string") return `"${value}"`;
  if (typeof value === "number") return String(value);
  if (value === null) return "null";
  return typeof value;
}

function isFiniteNumber(value: unknown): value is number {
  return typeof value === "number" && Number.isFinite(value);
}

function partProblems(ref: string, part: unknown, role: PartRole): string[] {
  if (typeof part !== "object" || part === null) return [`part ${ref} must be an object with valueSi; got ${describe(part)}`];
  const p = part as Record<string, unknown>;
  const problems: string[] = [];
  const unit = UNIT_OF_KIND[role.kind];
  const unitText = unit === "" ? "" : ` ${unit}`;
  if (role.kind === "coupling") {
    if (!isFiniteNumber(p.valueSi) || p.valueSi < 0 || p.valueSi > 1) {
      problems.push(`part ${ref} (coupling coefficient) must be a number from 0 to 1; got ${describe(p.valueSi)}`);
    }
  } else if (!isFiniteNumber(p.valueSi)) {
    problems.push(`part ${ref} (${role.description}) must be a finite number${unitText}; got ${describe(p.valueSi)}`);
  } else {
    const limit = ref === "M" ? "mutualInductanceH" : role.kind === "inductance" ? "inductanceH" : "capacitanceF";
    const problem = limitProblem(limit, p.valueSi, `part ${ref} (${role.description})`);
    if (problem) problems.push(problem);
  }
  if (p.tolerance !== undefined) {
    const problem = isFiniteNumber(p.tolerance)
      ? limitProblem("tolerance", p.tolerance, `part ${ref} tolerance`)
      : `part ${ref} tolerance must be a fraction (0.05 = 5 %); got ${describe(p.tolerance)}`;
    if (problem) problems.push(problem);
  }
  if (p.tempcoPpmPerK !== undefined) {
    const problem = isFiniteNumber(p.tempcoPpmPerK)
      ? limitProblem("tempcoPpmPerK", p.tempcoPpmPerK, `part ${ref} tempco`)
      : `part ${ref} tempcoPpmPerK must be a finite number; got ${describe(p.tempcoPpmPerK)}`;
    if (problem) problems.push(problem);
  }
  if (p.tempcoSpreadPpmPerK !== undefined) {
    const problem = isFiniteNumber(p.tempcoSpreadPpmPerK)
      ? limitProblem("tempcoSpreadPpmPerK", p.tempcoSpreadPpmPerK, `part ${ref} tempco spread`)
      : `part ${ref} tempcoSpreadPpmPerK must be a finite number, 0 or above; got ${describe(p.tempcoSpreadPpmPerK)}`;
    if (problem) problems.push(problem);
  }
  return problems;
}

/** A gain as a message shows it: 3 figures, exponent form past 10⁴ ("1.00e7", not "10000000"). */
function gainText(gain: number): string {
  return gain >= 1e4 ? gain.toExponential(2).replace("e+", "e") : String(Number(gain.toPrecision(3)));
}

/**
 * The feedback fraction of the nominal values, for the plausibility check only (topologies.ts holds the model and
 * its sources; it imports this file, so the two formulas are repeated here rather than imported).
 */
function nominalFeedbackFraction(topology: Topology, parts: Record<string, PartSpec>, windings: unknown): number | null {
  if (topology === "colpitts" || topology === "clapp") return parts.C1.valueSi / parts.C2.valueSi;
  if (topology !== "hartley") return null;
  const l1 = parts.L1.valueSi;
  const l2 = parts.L2.valueSi;
  const full = Math.sqrt(l1 * l2);
  const m = parts.M !== undefined ? Math.min(parts.M.valueSi, full) : parts.k !== undefined ? Math.min(parts.k.valueSi, 1) * full : 0;
  const signed = windings === "opposing" ? -m : m;
  const beta = (l2 + signed) / (l1 + signed);
  return beta > 0 ? beta : null;
}

/**
 * Checks a design description from any source (form, API, CLI).
 *
 * @param value - anything; typically parsed JSON.
 * @returns a list of problems in plain words, empty when the design is usable.
 */
export function validateDesign(value: unknown): string[] {
  if (typeof value !== "object" || value === null) return [`a design must be an object; got ${describe(value)}`];
  const d = value as Record<string, unknown>;
  if (typeof d.topology !== "string" || !TOPOLOGIES.includes(d.topology as Topology)) {
    return [`topology must be one of ${TOPOLOGIES.join(", ")}; got ${describe(d.topology)}`];
  }
  const topology = d.topology as Topology;
  if (typeof d.parts !== "object" || d.parts === null || Array.isArray(d.parts)) {
    return [`parts must be an object keyed by part reference; got ${describe(d.parts)}`];
  }
  const parts = d.parts as Record<string, unknown>;
  const roles = TOPOLOGY_PARTS[topology];
  const refs = Object.keys(roles);
  const problems: string[] = [];

  for (const ref of Object.keys(parts)) {
    if (!(ref in roles)) problems.push(`part ${ref} is not used by ${topology} (its parts are ${refs.join(", ")})`);
  }
  for (const [ref, role] of Object.entries(roles)) {
    if (parts[ref] === undefined) {
      if (role.required) problems.push(`${topology} needs part ${ref} (${role.description}, ${UNIT_OF_KIND[role.kind]})`);
      continue;
    }
    problems.push(...partProblems(ref, parts[ref], role));
  }

  if (topology === "hartley") {
    if (parts.M !== undefined && parts.k !== undefined) problems.push("hartley takes M or k, not both");
    if (d.windings !== undefined && d.windings !== "aiding" && d.windings !== "opposing") {
      problems.push(`windings must be "aiding" or "opposing"; got ${describe(d.windings)}`);
    }
    const l1 = (parts.L1 as PartSpec | undefined)?.valueSi;
    const l2 = (parts.L2 as PartSpec | undefined)?.valueSi;
    const m = (parts.M as PartSpec | undefined)?.valueSi;
    const k = (parts.k as PartSpec | undefined)?.valueSi;
    if (problems.length === 0 && isFiniteNumber(l1) && isFiniteNumber(l2)) {
      const mMax = Math.sqrt(l1 * l2);
      if (isFiniteNumber(m) && m > mMax * (1 + 1e-12)) {
        problems.push(`part M must not exceed √(L1·L2) = ${formatEngineering(mMax, "H", 4)} (coupling k = 1); got ${formatEngineering(m, "H", 4)}`);
      }
      const mUsed = isFiniteNumber(m) ? m : isFiniteNumber(k) ? k * mMax : 0;
      if (d.windings === "opposing" && l1 + l2 - 2 * mUsed <= 0) {
        problems.push("opposing windings cancel completely here (L1 + L2 − 2M is not above 0)");
      }
    }
  } else if (d.windings !== undefined) {
    problems.push(`windings applies to hartley only; ${topology} has one inductor`);
  }

  if (d.extraCapacitanceF !== undefined) {
    const problem = isFiniteNumber(d.extraCapacitanceF)
      ? limitProblem("extraCapacitanceF", d.extraCapacitanceF, "extraCapacitanceF (the extra capacitance)")
      : `extraCapacitanceF must be a finite number of F, 0 or above; got ${describe(d.extraCapacitanceF)}`;
    if (problem) problems.push(problem);
  }
  if (problems.length === 0) {
    const beta = nominalFeedbackFraction(topology, parts as Record<string, PartSpec>, d.windings);
    // An infinite Hartley β (opposing windings with M = L1) is the model's own edge case, not a typo.
    const problem = beta === null || !Number.isFinite(beta) ? null : limitProblem("feedbackFraction", beta, "the feedback fraction β");
    if (problem) {
      const which = topology === "hartley" ? "(L2+M)/(L1+M)" : "C1/C2";
      problems.push(`${problem} (β = ${which}; the amplifier would need a gain of ${gainText(1 / beta!)} to start)`);
    }
  }
  if (d.calibrationCapacitanceF !== undefined && !isFiniteNumber(d.calibrationCapacitanceF)) {
    problems.push(`calibrationCapacitanceF must be a finite number of F; got ${describe(d.calibrationCapacitanceF)}`);
  }
  return problems;
}

/**
 * {@link validateDesign} for code paths that want an exception.
 *
 * @throws RangeError carrying every problem, joined with "; ".
 */
export function assertValidDesign(value: unknown): asserts value is OscillatorDesign {
  const problems = validateDesign(value);
  if (problems.length > 0) throw new RangeError(problems.join("; "));
}

/** The nominal value of every part, by reference. */
export function nominalValues(design: OscillatorDesign): Record<string, number> {
  const out: Record<string, number> = {};
  for (const [ref, part] of Object.entries(design.parts)) out[ref] = part.valueSi;
  return out;
}

/** All capacitance the model adds in parallel with C_eff: the declared extra plus any calibration, F. */
export function parallelCapacitanceF(design: OscillatorDesign): number {
  return (design.extraCapacitanceF ?? 0) + (design.calibrationCapacitanceF ?? 0);
}
