/**
 * The lab's figures: what each construction kind (PCBs per revision) adds to each topology, as robust statistics
 * over the builds whose implied extra capacitance held across their tweaks. Pure: no I/O.
 */
import type { LayoutGroupRows, SteadyLayoutBuild } from "@/db/queries/layouts";
import type { Topology } from "@/lib/oscillator/design";
import { constructionKey, constructionName, type Construction } from "./construction";
import { robustSummary, type RobustSummary } from "./robust-stats";

/**
 * Below this many steady builds a figure is shown as thin: with fewer, one odd build still moves the median and
 * the scaled MAD says little about the spread (our choice, not a standard).
 */
export const MIN_BUILDS_FOR_TRUST = 5;

export type FigureStrength =
  /** At least {@link MIN_BUILDS_FOR_TRUST} steady builds. */
  | "trusted"
  /** One to {@link MIN_BUILDS_FOR_TRUST} − 1 steady builds: a first figure, not yet one to design on blindly. */
  | "thin"
  /** No steady build yet. */
  | "none";

export interface LayoutFigure {
  construction: Construction;
  /** {@link constructionKey} of the construction, for URLs and the API. */
  constructionKey: string;
  constructionName: string;
  topology: Topology;
  strength: FigureStrength;
  /** Builds with trusted runs, steady or not. */
  candidateBuildCount: number;
  /** The implied extra capacitance across the steady builds, F: median, scaled MAD, count and range. */
  capacitanceF: RobustSummary;
  /**
   * Where the sign points to the coil rather than a stray (the steady builds that run above their prediction): the
   * fractional error of L_eff that would explain them, as a robust summary; count 0 when none does.
   */
  inductanceErrorFraction: RobustSummary;
  /** The steady builds behind the figure, by their typical value. */
  builds: SteadyLayoutBuild[];
}

/** The strength of a figure that rests on `count` steady builds. */
export function figureStrength(count: number): FigureStrength {
  if (count >= MIN_BUILDS_FOR_TRUST) return "trusted";
  return count > 0 ? "thin" : "none";
}

/**
 * Turns the aggregate's groups into figures.
 * @param groups - rows from db/queries/layouts' listLayoutGroups.
 * @returns one figure per construction × topology, with steady builds first by count, then by name.
 */
export function layoutFigures(groups: readonly LayoutGroupRows[]): LayoutFigure[] {
  return groups
    .map((g) => {
      const construction: Construction = { kind: g.kind, revision: g.kindRevision };
      const runsAbove = g.steadyBuilds.filter((b) => b.typicalF < 0 && b.inductanceErrorFraction !== null);
      return {
        construction,
        constructionKey: constructionKey(construction),
        constructionName: constructionName(construction),
        topology: g.topology,
        strength: figureStrength(g.steadyBuilds.length),
        candidateBuildCount: g.candidateBuildCount,
        capacitanceF: robustSummary(g.steadyBuilds.map((b) => b.typicalF)),
        inductanceErrorFraction: robustSummary(runsAbove.map((b) => b.inductanceErrorFraction!)),
        builds: g.steadyBuilds,
      };
    })
    .sort(
      (a, b) =>
        b.capacitanceF.count - a.capacitanceF.count ||
        a.constructionName.localeCompare(b.constructionName) ||
        a.topology.localeCompare(b.topology),
    );
}

/** The figure for one construction and topology, or null when the lab has none. */
export function findLayoutFigure(figures: readonly LayoutFigure[], construction: Construction, topology: Topology): LayoutFigure | null {
  const key = constructionKey(construction);
  return figures.find((f) => f.constructionKey === key && f.topology === topology) ?? null;
}
