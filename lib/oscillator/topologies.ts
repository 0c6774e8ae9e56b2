/**
 * Resonant frequency, effective L and C, feedback fraction and start-up gain of each topology
 * (formulas and their sources: REFERENCES.md §1).
 */

import {
  assertValidDesign,
  nominalValues,
  parallelCapacitanceF,
  type OscillatorDesign,
  type Topology,
  type WindingSense,
} from "./design";
import { formatEngineering } from "./units";

/** Text for the UI: what each model assumes, and which capacitor or winding is which. */
export const TOPOLOGY_ASSUMPTIONS: Record<Topology, string> = {
  tank:
    "Ideal lossless tank: f0 = 1/(2π√(LC)). Any extra capacitance given (stray, probe, trimmer) is added in parallel " +
    "with C. A bare tank has no feedback network, so no feedback fraction or start-up gain is given; they depend on " +
    "the amplifier driving it.",
  colpitts:
    "C1 and C2 in series across L: C_eff = C1·C2/(C1+C2), f0 = 1/(2π√(L·C_eff)). C1 is the capacitor on the " +
    "amplifier's output (collector/drain) side, C2 the one on its input (base/gate) side; books swap these labels. " +
    "Feedback fraction β = C1/C2, so the amplifier needs a gain of at least C2/C1 to start (Barkhausen: loop gain " +
    "above 1 at 0° loop phase). Ignores transistor capacitances, loading and losses; extra capacitance is taken in " +
    "parallel with C_eff, and stray that sits across C1 or C2 alone shifts f0 less.",
  hartley:
    "L1 and L2 with mutual inductance M in series: L_eff = L1 + L2 + 2M for aiding windings (L1 + L2 − 2M " +
    "opposing), M = k√(L1·L2) when k is given, and no M means uncoupled windings; f0 = 1/(2π√(L_eff·C)). L1 is the " +
    "winding on the amplifier's output (collector/drain) side, L2 on its input (base/gate) side. Feedback fraction " +
    "β = (L2+M)/(L1+M) (β = L2/L1 with M = 0), start-up gain at least 1/β. Ignores winding capacitance, transistor " +
    "loading and losses; extra capacitance is taken in parallel with C.",
  clapp:
    "C1, C2 and C3 in series around L: 1/C_eff = 1/C1 + 1/C2 + 1/C3, f0 = 1/(2π√(L·C_eff)); with C3 much smaller " +
    "than C1 and C2, C_eff ≈ C3 and the transistor's capacitances across C1 and C2 matter little. C1 is on the " +
    "amplifier's output (collector/drain) side, C2 on its input (base/gate) side, C3 in series with L. Feedback " +
    "fraction β = C1/C2 as in the Colpitts, start-up gain at least C2/C1. Extra capacitance is taken in parallel " +
    "with C_eff.",
};

export interface TankModel {
  /** Effective capacitance seen by the inductance, extra capacitance included, F. */
  cEffF: number;
  /** Effective inductance, mutual inductance included, H. */
  lEffH: number;
  /** Mutual inductance used (Hartley), H; null for the other topologies. */
  mutualInductanceH: number | null;
  /** Fraction of the output fed back to the input (V_f/V_out); null for a bare tank. */
  feedbackFraction: number | null;
  /** Smallest amplifier voltage gain magnitude that starts oscillation, 1/β; null for a bare tank. */
  minGain: number | null;
}

/** A value for a message: engineering notation with the unit when finite ("-120 nH"), else as JavaScript prints it. */
function shown(value: number, unit: string): string {
  return Number.isFinite(value) ? formatEngineering(value, unit, 4, { trimZeros: true }) : String(value);
}

/**
 * f0 = 1/(2π√(LC)).
 *
 * @param inductanceH - effective inductance, H, above 0.
 * @param capacitanceF - effective capacitance, F, above 0.
 * @returns resonant frequency, Hz.
 * @throws RangeError when either argument is not a finite number above 0.
 */
export function resonantFrequencyHz(inductanceH: number, capacitanceF: number): number {
  if (!(Number.isFinite(inductanceH) && inductanceH > 0)) {
    throw new RangeError(`effective inductance must be a finite number above 0 H; got ${shown(inductanceH, "H")}`);
  }
  if (!(Number.isFinite(capacitanceF) && capacitanceF > 0)) {
    throw new RangeError(`effective capacitance must be a finite number above 0 F; got ${shown(capacitanceF, "F")}`);
  }
  return 1 / (2 * Math.PI * Math.sqrt(inductanceH * capacitanceF));
}

function seriesCapacitance(...capacitancesF: number[]): number {
  return 1 / capacitancesF.reduce((sum, c) => sum + 1 / c, 0);
}

/**
 * The tank seen by the inductance, from raw part values (no validation of the design shape; used in loops by the
 * tolerance and retune code). A Hartley k above 1, or M above √(L1·L2), is clamped to full coupling, since a
 * tolerance corner can step past what a winding can do.
 *
 * @param topology - tank, colpitts, hartley or clapp.
 * @param values - part values in SI units by reference.
 * @param extraCapacitanceF - capacitance in parallel with C_eff, F; may be negative when it stands for a measured
 *   shortfall (retune calibration), as long as C_eff stays above 0.
 * @param windings - Hartley winding sense, default aiding.
 * @returns effective C and L, mutual inductance, feedback fraction and minimum gain.
 */
export function tankModel(
  topology: Topology,
  values: Readonly<Record<string, number>>,
  extraCapacitanceF = 0,
  windings: WindingSense = "aiding",
): TankModel {
  switch (topology) {
    case "tank":
      return { cEffF: values.C + extraCapacitanceF, lEffH: values.L, mutualInductanceH: null, feedbackFraction: null, minGain: null };
    case "colpitts":
    case "clapp": {
      const series =
        topology === "colpitts"
          ? seriesCapacitance(values.C1, values.C2)
          : seriesCapacitance(values.C1, values.C2, values.C3);
      // REFERENCES.md §1: with C1 on the output side, β = X_C2/X_C1 = C1/C2.
      const beta = values.C1 / values.C2;
      return { cEffF: series + extraCapacitanceF, lEffH: values.L, mutualInductanceH: null, feedbackFraction: beta, minGain: 1 / beta };
    }
    case "hartley": {
      const { L1, L2 } = values;
      const fullCoupling = Math.sqrt(L1 * L2);
      let m = 0;
      if (values.M !== undefined) m = Math.min(values.M, fullCoupling);
      else if (values.k !== undefined) m = Math.min(values.k, 1) * fullCoupling;
      const signedM = windings === "aiding" ? m : -m;
      const beta = (L2 + signedM) / (L1 + signedM);
      return {
        cEffF: values.C + extraCapacitanceF,
        lEffH: L1 + L2 + 2 * signedM,
        mutualInductanceH: m,
        feedbackFraction: beta > 0 ? beta : null,
        minGain: beta > 0 ? 1 / beta : null,
      };
    }
  }
}

/** f0 for raw values; see {@link tankModel} for the arguments. */
export function frequencyFromValues(
  topology: Topology,
  values: Readonly<Record<string, number>>,
  extraCapacitanceF = 0,
  windings: WindingSense = "aiding",
): number {
  const model = tankModel(topology, values, extraCapacitanceF, windings);
  return resonantFrequencyHz(model.lEffH, model.cEffF);
}

export interface OscillatorPrediction extends TankModel {
  topology: Topology;
  /** Predicted oscillation frequency f0, Hz. */
  predictedHz: number;
  /** 2π·f0, rad/s. */
  angularFrequencyRadPerS: number;
  /** The declared extra parallel capacitance that was included, F. */
  extraCapacitanceF: number;
  /** The calibration capacitance that was included, F (0 when none). */
  calibrationCapacitanceF: number;
  /** What the model assumes, in words for the UI. */
  assumptions: string;
}

/**
 * Predicts the frequency of a design from its nominal part values.
 *
 * @param design - the design; validated first.
 * @returns f0 in Hz with C_eff (F), L_eff (H), feedback fraction, minimum start-up gain and the assumptions text.
 * @throws RangeError listing every problem when the design is invalid.
 * @example predictOscillator({ topology: "colpitts", parts: { L: { valueSi: 15e-6 }, C1: { valueSi: 1e-9 },
 *   C2: { valueSi: 10e-9 } } }).predictedHz // ≈ 1.3629e6
 */
export function predictOscillator(design: OscillatorDesign): OscillatorPrediction {
  assertValidDesign(design);
  const extraCapacitanceF = design.extraCapacitanceF ?? 0;
  const model = tankModel(design.topology, nominalValues(design), parallelCapacitanceF(design), design.windings);
  const predictedHz = resonantFrequencyHz(model.lEffH, model.cEffF);
  return {
    topology: design.topology,
    predictedHz,
    angularFrequencyRadPerS: 2 * Math.PI * predictedHz,
    ...model,
    extraCapacitanceF,
    calibrationCapacitanceF: design.calibrationCapacitanceF ?? 0,
    assumptions: TOPOLOGY_ASSUMPTIONS[design.topology],
  };
}
