import type { MeasuredSlope, SlopeFigure, StateGroupReport } from "@/lib/sensitivity/types";

// The numbers a Sensitivity scatter chart draws, worked out on the server so the chart only plots. Pure.

export type SensitivityVariable = "supply" | "temperature";

export interface ScatterPoint {
  runId: string;
  originalFilename: string;
  /** Supply voltage (V) or temperature (°C). */
  x: number;
  /** Frequency, ppm from the fit's frequency at the reference point (after holding the other variable, see `held`). */
  yPpm: number;
  /** The run's measured frequency, Hz, as logged. */
  frequencyHz: number;
  frequencySigmaPpm: number;
}

export interface ScatterSeries {
  variable: SensitivityVariable;
  points: ScatterPoint[];
  referenceHz: number;
  referenceX: number;
  slopePpm: number;
  slopeSigmaPpm: number;
  /** The parts' predicted slope, ppm/K (temperature only); null when none. */
  predictedPpm: number | null;
  /** The other variable the points were moved along (its fitted slope) to the reference, when it varied too. */
  held: { variable: SensitivityVariable; to: number } | null;
  /** Largest run 1σ, ppm (to say whether the error bars would show). */
  largestSigmaPpm: number;
}

const xOf = (p: StateGroupReport["points"][number], v: SensitivityVariable) => (v === "supply" ? p.supplyV : p.temperatureC);

/**
 * The scatter of one build state's runs against supply or temperature, with the fitted line's numbers; null when
 * the figure was not measured (the card then says why instead of drawing).
 */
export function scatterSeries(group: StateGroupReport, variable: SensitivityVariable): ScatterSeries | null {
  const figure: SlopeFigure = variable === "supply" ? group.pushing : group.tempco;
  if (!figure.measured || figure.ppm === null || figure.ppmSigma === null) return null;
  const other: SensitivityVariable = variable === "supply" ? "temperature" : "supply";
  const otherFigure = variable === "supply" ? group.tempco : group.pushing;
  const referenceX = (variable === "supply" ? figure.referenceSupplyV : figure.referenceTemperatureC) as number;
  const otherReference = other === "supply" ? figure.referenceSupplyV : figure.referenceTemperatureC;
  const held = otherFigure.measured && otherReference !== null ? { variable: other, to: otherReference, slope: (otherFigure as MeasuredSlope).slope } : null;
  const points: ScatterPoint[] = [];
  for (const p of group.points) {
    const x = xOf(p, variable);
    if (x === null) continue;
    const otherX = xOf(p, other);
    if (held && otherX === null) continue;
    const heldHz = held ? p.frequencyHz - held.slope * ((otherX as number) - held.to) : p.frequencyHz;
    points.push({
      runId: p.runId,
      originalFilename: p.originalFilename,
      x,
      yPpm: (heldHz / figure.intercept - 1) * 1e6,
      frequencyHz: p.frequencyHz,
      frequencySigmaPpm: (p.frequencySigmaHz / figure.intercept) * 1e6,
    });
  }
  points.sort((a, b) => a.x - b.x || a.runId.localeCompare(b.runId));
  const predicted = variable === "temperature" && group.predictedTempco.predicted ? group.predictedTempco.ppmPerK : null;
  return {
    variable,
    points,
    referenceHz: figure.intercept,
    referenceX,
    slopePpm: figure.ppm,
    slopeSigmaPpm: figure.ppmSigma,
    predictedPpm: predicted,
    held: held ? { variable: held.variable, to: held.to } : null,
    largestSigmaPpm: Math.max(0, ...points.map((p) => p.frequencySigmaPpm)),
  };
}
