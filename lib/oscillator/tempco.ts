/**
 * Frequency shift from part value changes, in particular temperature. Changes are applied to each part and f0 is
 * recomputed; they are never applied to C_eff or L_eff, because a Colpitts with a C0G C1 and an X7R C2 moves
 * very differently from one whose C_eff moves by the X7R figure (REFERENCES.md §8).
 */

import { assertValidDesign, nominalValues, parallelCapacitanceF, type OscillatorDesign } from "./design";
import { frequencyFromValues } from "./topologies";
import { frequencySensitivities } from "./tolerance";
import { assertWithinLimit } from "./limits";

export interface FrequencyShift {
  nominalHz: number;
  shiftedHz: number;
  /** shiftedHz − nominalHz. */
  shiftHz: number;
  /** Exact relative shift f'/f − 1 from recomputing f0 with the changed parts. */
  exactFraction: number;
  /** First-order estimate Σ S_i·Δx_i/x_i, which for a plain tank is −½(ΔL/L + ΔC/C). */
  linearFraction: number;
}

/**
 * Shift of f0 when some parts change by given fractions.
 *
 * @param design - validated first.
 * @param fractionalChanges - Δx/x by part reference (0.003 for +0.3 %); parts not named stay at nominal.
 * @returns nominal and shifted f0 in Hz, the exact relative shift and its linear estimate.
 * @throws RangeError when the design is invalid, a reference is not one of its parts, or a change is not finite
 *   or would take a value to 0 or below.
 */
export function frequencyShiftForPartChanges(
  design: OscillatorDesign,
  fractionalChanges: Readonly<Record<string, number>>,
): FrequencyShift {
  assertValidDesign(design);
  const nominal = nominalValues(design);
  const changed = { ...nominal };
  for (const [ref, change] of Object.entries(fractionalChanges)) {
    if (!(ref in nominal)) throw new RangeError(`part ${ref} is not in this ${design.topology} design`);
    if (!Number.isFinite(change) || change <= -1) {
      throw new RangeError(`the change of part ${ref} must be a finite fraction above -1; got ${change}`);
    }
    changed[ref] = nominal[ref] * (1 + change);
  }
  const extra = parallelCapacitanceF(design);
  const nominalHz = frequencyFromValues(design.topology, nominal, extra, design.windings);
  const shiftedHz = frequencyFromValues(design.topology, changed, extra, design.windings);
  const sensitivities = frequencySensitivities(design);
  let linearFraction = 0;
  for (const [ref, change] of Object.entries(fractionalChanges)) linearFraction += sensitivities[ref] * change;
  return { nominalHz, shiftedHz, shiftHz: shiftedHz - nominalHz, exactFraction: shiftedHz / nominalHz - 1, linearFraction };
}

export interface TemperatureShift extends FrequencyShift {
  temperatureChangeK: number;
  /** Lowest and highest f0 when every tempco is anywhere within its nominal ± spread. */
  minHz: number;
  maxHz: number;
}

/**
 * Predicted f0 after a temperature change, from each part's tempco (ΔX/X = tempco·1e-6·ΔT).
 *
 * @param design - validated first; parts without a tempco do not move.
 * @param temperatureChangeK - ΔT in K (same size as °C).
 * @returns the shift at nominal tempcos, plus the range of f0 over every corner of the tempco spreads.
 * @throws RangeError when the design is invalid or `temperatureChangeK` is outside the bench limit (never down to
 *   absolute zero from 25 °C, at most +500 K; lib/oscillator/limits.ts).
 */
export function temperatureShift(design: OscillatorDesign, temperatureChangeK: number): TemperatureShift {
  assertWithinLimit("temperatureChangeK", temperatureChangeK, "the temperature change from 25 °C");
  assertValidDesign(design);
  const parts = Object.entries(design.parts);
  const nominalChanges: Record<string, number> = {};
  for (const [ref, part] of parts) nominalChanges[ref] = (part.tempcoPpmPerK ?? 0) * 1e-6 * temperatureChangeK;
  const shift = frequencyShiftForPartChanges(design, nominalChanges);

  const spreadRefs = parts.filter(([, p]) => (p.tempcoSpreadPpmPerK ?? 0) > 0).map(([ref]) => ref);
  let minHz = shift.shiftedHz;
  let maxHz = shift.shiftedHz;
  for (let mask = 0; mask < 2 ** spreadRefs.length; mask++) {
    const changes = { ...nominalChanges };
    spreadRefs.forEach((ref, i) => {
      const spread = (design.parts[ref].tempcoSpreadPpmPerK as number) * (mask & (1 << i) ? 1 : -1);
      changes[ref] += spread * 1e-6 * temperatureChangeK;
    });
    const f = frequencyShiftForPartChanges(design, changes).shiftedHz;
    minHz = Math.min(minHz, f);
    maxHz = Math.max(maxHz, f);
  }
  return { ...shift, temperatureChangeK, minHz, maxHz };
}
