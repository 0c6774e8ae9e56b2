import type { Design, Parts } from "@/db/queries/designs";
import type { Build } from "@/db/queries/builds";
import type { RunSnapshot } from "@/db/queries/runs";
import { buildDesignReport, type OscillatorDesign, type Topology, type WindingSense } from "@/lib/oscillator";

/** What a design page and the run snapshot show about a set of part values. */
export interface Prediction {
  predictedHz: number;
  cEffF: number;
  lEffH: number;
  feedbackFraction: number | null;
  minGain: number | null;
  extraCapacitanceF: number;
  assumptions: string;
  worstCase: { minHz: number; maxHz: number };
  statistical: { minHz: number; maxHz: number; meanHz: number; stdDevHz: number };
}

/** The lib/oscillator description of parts in a topology. */
export function oscillatorDesign(topology: Topology, parts: Parts, extraCapacitanceF: number | null, windings: WindingSense | null): OscillatorDesign {
  return {
    topology,
    parts,
    ...(extraCapacitanceF ? { extraCapacitanceF } : {}),
    ...(topology === "hartley" && windings ? { windings } : {}),
  };
}

// Enough simulated builds for a stable 99.7 % band on a page; fixed seed, so the band never jitters.
const STATISTICAL = { seed: 1, trials: 5000 };

/**
 * Prediction and tolerance bands for a set of part values.
 * @returns the prediction, or an error sentence when the model refuses the values
 */
export function predict(design: OscillatorDesign): { prediction: Prediction; error: null } | { prediction: null; error: string } {
  try {
    const r = buildDesignReport(design, { statistical: STATISTICAL });
    return {
      prediction: {
        predictedHz: r.predictedHz,
        cEffF: r.cEffF,
        lEffH: r.lEffH,
        feedbackFraction: r.feedbackFraction,
        minGain: r.minGain,
        extraCapacitanceF: r.extraCapacitanceF,
        assumptions: r.assumptions,
        worstCase: { minHz: r.worstCase.minHz, maxHz: r.worstCase.maxHz },
        statistical: { minHz: r.statistical.minHz, maxHz: r.statistical.maxHz, meanHz: r.statistical.meanHz, stdDevHz: r.statistical.stdDevHz },
      },
      error: null,
    };
  } catch (err) {
    return { prediction: null, error: err instanceof Error ? err.message : String(err) };
  }
}

/** Prediction of a design's current revision. */
export function predictDesign(design: Design) {
  return predict(oscillatorDesign(design.topology, design.revision.parts, design.revision.extraCapacitanceF, design.revision.windings));
}

/** Prediction of a build's as-built values under its design's current extra capacitance and windings. */
export function predictBuild(build: Build, design: Design) {
  return predict(oscillatorDesign(design.topology, build.asBuilt, design.revision.extraCapacitanceF, design.revision.windings));
}

/**
 * What a run is measured against: the build's as-built parts now, the design's current revision (extra
 * capacitance, windings, spec) and the prediction and bands they give.
 */
export function runSnapshot(build: Build, design: Design): RunSnapshot {
  const { prediction, error } = predictBuild(build, design);
  return {
    topology: design.topology,
    designId: design.id,
    designRevisionId: design.revision.id,
    designRevision: design.revision.revision,
    parts: build.asBuilt,
    extraCapacitanceF: design.revision.extraCapacitanceF,
    windings: design.revision.windings,
    predictedHz: prediction?.predictedHz ?? null,
    lEffH: prediction?.lEffH ?? null,
    cEffF: prediction?.cEffF ?? null,
    worstCase: prediction?.worstCase ?? null,
    statistical: prediction ? { minHz: prediction.statistical.minHz, maxHz: prediction.statistical.maxHz } : null,
    spec: design.revision.spec,
    ...(error ? { predictionError: error } : {}),
  };
}
