import type { Build } from "@/db/queries/builds";
import type { Design } from "@/db/queries/designs";
import { listCompareRows, listLayoutGroups, type LayoutFilter } from "@/db/queries/layouts";
import { requirePermission } from "@/lib/auth/require-permission";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { NotFoundError } from "@/lib/errors";
import { compareBuilds, type ComparedBuild } from "@/lib/layouts/build-comparison";
import { calibratedPrediction, type CalibratedPrediction } from "@/lib/layouts/calibrated-prediction";
import { CONSTRUCTION_KINDS, constructionKey, constructionName, constructionOf, type Construction } from "@/lib/layouts/construction";
import { findLayoutFigure, layoutFigures, type FigureStrength, type LayoutFigure } from "@/lib/layouts/layout-figures";
import type { Topology } from "@/lib/oscillator/design";
import { isId } from "./context";
import { getDesign } from "./designs";
import { oscillatorDesign } from "./prediction";

export type { LayoutFilter } from "@/db/queries/layouts";

/**
 * The lab's layout figures (anyone who can read the logbook): per construction and topology, what the steady
 * builds imply beyond their models, over runs without trust warnings.
 * @param filter - construction kind and topology, both optional.
 */
export async function listLayoutFigures(user: CurrentUser | null, filter: LayoutFilter = {}): Promise<LayoutFigure[]> {
  requirePermission(user, "read");
  return layoutFigures(await listLayoutGroups(filter));
}

/** A construction someone may pick for the calibrated prediction. */
export interface ConstructionChoice {
  key: string;
  name: string;
  strength: FigureStrength;
  /** Steady builds behind its figure. */
  buildCount: number;
}

/** Both predictions of one set of part values, on one construction of this lab. */
export interface CalibratedView {
  construction: Construction;
  constructionKey: string;
  constructionName: string;
  /** The lab's figure used; null when the lab has no steady build of this construction and topology. */
  figure: LayoutFigure | null;
  /** Null when there is no figure or the model refuses the values (see `error`). */
  prediction: CalibratedPrediction | null;
  /** Why there is no calibrated prediction, in a sentence for the page. */
  error: string | null;
  /** Constructions the lab has figures for on this topology, the plain kinds too. */
  choices: ConstructionChoice[];
}

// Same Monte Carlo as the design page's own prediction (lib/logbook/prediction.ts): fixed seed, so bands never jitter.
const STATISTICAL = { seed: 1, trials: 5000 };

function choicesFor(figures: readonly LayoutFigure[]): ConstructionChoice[] {
  const byKey = new Map<string, ConstructionChoice>();
  for (const kind of CONSTRUCTION_KINDS) {
    const c = constructionOf(kind, "");
    byKey.set(constructionKey(c), { key: constructionKey(c), name: constructionName(c), strength: "none", buildCount: 0 });
  }
  for (const f of figures) {
    byKey.set(f.constructionKey, { key: f.constructionKey, name: f.constructionName, strength: f.strength, buildCount: f.capacitanceF.count });
  }
  return [...byKey.values()].sort((a, b) => b.buildCount - a.buildCount || a.name.localeCompare(b.name));
}

function calibratedView(
  figures: readonly LayoutFigure[],
  topology: Topology,
  design: ReturnType<typeof oscillatorDesign>,
  construction: Construction | null,
): CalibratedView {
  const choices = choicesFor(figures);
  // Without a choice: the construction the lab knows best on this topology, else a breadboard (the usual first build).
  const chosen = construction ?? figures.filter((f) => f.capacitanceF.count > 0)[0]?.construction ?? constructionOf("breadboard", "");
  const figure = findLayoutFigure(figures, chosen, topology);
  const base = { construction: chosen, constructionKey: constructionKey(chosen), constructionName: constructionName(chosen), figure, choices };
  if (!figure || figure.capacitanceF.median === null) {
    return {
      ...base,
      figure: null,
      prediction: null,
      error: `No ${constructionName(chosen).toLowerCase()} build of this topology has held its implied capacitance across a tweak here yet, so only the prediction as designed is known.`,
    };
  }
  try {
    const prediction = calibratedPrediction(design, { medianF: figure.capacitanceF.median, spreadF: figure.capacitanceF.scaledMad }, STATISTICAL);
    return { ...base, prediction, error: null };
  } catch (err) {
    return { ...base, prediction: null, error: err instanceof Error ? err.message : "The model refused these values." };
  }
}

/**
 * A design's two predictions: as designed, and as it will likely measure on `construction` in this lab.
 * @param construction - null: the construction with the most steady builds on the design's topology.
 * @throws NotFoundError for an unknown design
 */
export async function getDesignCalibration(user: CurrentUser | null, designId: string, construction: Construction | null): Promise<CalibratedView & { design: Design }> {
  const design = await getDesign(user, designId);
  return { design, ...(await designCalibration(user, design, construction)) };
}

/** {@link getDesignCalibration} for a design the page already holds. */
export async function designCalibration(user: CurrentUser | null, design: Design, construction: Construction | null): Promise<CalibratedView> {
  const figures = await listLayoutFigures(user, { topology: design.topology });
  const model = oscillatorDesign(design.topology, design.revision.parts, design.revision.extraCapacitanceF, design.revision.windings);
  return calibratedView(figures, design.topology, model, construction);
}

/** A build's as-built values, predicted as designed and on its own construction in this lab. */
export async function buildCalibration(user: CurrentUser | null, build: Build, design: Design): Promise<CalibratedView> {
  const figures = await listLayoutFigures(user, { topology: design.topology });
  const model = oscillatorDesign(design.topology, build.asBuilt, design.revision.extraCapacitanceF, design.revision.windings);
  return calibratedView(figures, design.topology, model, constructionOf(build.kind, build.kindRevision));
}

/**
 * Builds side by side (anyone who can read the logbook): each one's newest analysed run against its prediction,
 * THD and harmonics, and its implied-capacitance trend.
 * @param buildIds - two or more build ids, in the order to show.
 * @throws NotFoundError when one of the builds does not exist
 */
export async function getBuildComparison(user: CurrentUser | null, buildIds: readonly string[]): Promise<ComparedBuild[]> {
  requirePermission(user, "read");
  const ids = buildIds.filter(isId).map((id) => id.toLowerCase());
  const rows = await listCompareRows(ids);
  const known = new Set(rows.builds.map((b) => b.id));
  const missing = buildIds.find((id) => !known.has(id.toLowerCase()));
  if (missing !== undefined) throw new NotFoundError(`The build ${missing}`);
  return compareBuilds(rows, ids);
}
