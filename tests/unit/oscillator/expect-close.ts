import { expect } from "vitest";
import type { OscillatorDesign, Topology } from "@/lib/oscillator";

/** |actual/expected − 1| ≤ rel, with the numbers in the failure message. */
export function expectRel(actual: number, expected: number, rel: number): void {
  const error = Math.abs(actual / expected - 1);
  expect(error, `${actual} vs ${expected}: relative error ${error} > ${rel}`).toBeLessThanOrEqual(rel);
}

/** |actual − expected| ≤ abs. */
export function expectAbs(actual: number, expected: number, abs: number): void {
  const error = Math.abs(actual - expected);
  expect(error, `${actual} vs ${expected}: absolute error ${error} > ${abs}`).toBeLessThanOrEqual(abs);
}

/** A design from plain values, optionally with tolerances. */
export function design(
  topology: Topology,
  values: Record<string, number>,
  tolerances: Record<string, number> = {},
  extraCapacitanceF?: number,
): OscillatorDesign {
  const parts: OscillatorDesign["parts"] = {};
  for (const [ref, valueSi] of Object.entries(values)) {
    parts[ref] = tolerances[ref] === undefined ? { valueSi } : { valueSi, tolerance: tolerances[ref] };
  }
  return extraCapacitanceF === undefined ? { topology, parts } : { topology, parts, extraCapacitanceF };
}
