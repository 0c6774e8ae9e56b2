import type { Build } from "@/db/queries/builds";
import type { Design } from "@/db/queries/designs";
import { listCompareRows, listLayoutGroups, type LayoutFilter } from "@/db/queries/layouts";
import { requirePermission } from "@/lib/auth/require-permission";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { BadRequestError, NotFoundError } from "@/lib/errors";
import { chosenRunsProblem, compareBuilds, type ComparedBuild } from "@/lib/layouts/build-comparison";
import { calibratedPrediction, type CalibratedPrediction, type PredictionFigures } from "@/lib/layouts/calibrated-prediction";
import { CONSTRUCTION_KINDS, constructionKey, constructionName, constructionOf, type Construction } from "@/lib/layouts/construction";
import { findLayoutFigure, layoutFigures, type FigureStrength, type LayoutFigure } from "@/lib/layouts/layout-figures";
import { TOPOLOGIES, type Topology } from "@/lib/oscillator/design";
import { proposeValues } from "@/lib/oscillator/value-proposal";
import { formatPartValue } from "@/lib/format/numbers";
import { valueProposalInputSchema } from "@/lib/validations/layouts";
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

/** What the new-build form shows while its construction is being chosen. */
export interface BuildFormCalibration {
  /** The design's nominal prediction with its bands; null when the model refuses the values (see `error`). */
  asDesigned: PredictionFigures | null;
  error: string | null;
  /** One view per construction the lab has a figure for on this topology (a key outside them has no figure). */
  views: CalibratedView[];
}

/**
 * Both predictions of a design for every construction the lab has a figure for, in one read of the figures, so
 * the new-build form can show them as soon as a kind (and revision) is picked.
 */
export async function designCalibrationsByConstruction(user: CurrentUser | null, design: Design): Promise<BuildFormCalibration> {
  const figures = await listLayoutFigures(user, { topology: design.topology });
  const model = oscillatorDesign(design.topology, design.revision.parts, design.revision.extraCapacitanceF, design.revision.windings);
  let asDesigned: PredictionFigures | null = null;
  let error: string | null = null;
  try {
    // No lab capacitance: the design's own figures, with the same fixed-seed Monte Carlo as the calibrated ones.
    asDesigned = calibratedPrediction(model, { medianF: 0, spreadF: 0 }, STATISTICAL).asDesigned;
  } catch (err) {
    error = err instanceof Error ? err.message : "The model refused these values.";
  }
  const views = figures
    .filter((f) => f.topology === design.topology && f.capacitanceF.count > 0)
    .map((f) => calibratedView(figures, design.topology, model, f.construction));
  return { asDesigned, error, views };
}

/** A build's as-built values, predicted as designed and on its own construction in this lab. */
export async function buildCalibration(user: CurrentUser | null, build: Build, design: Design): Promise<CalibratedView> {
  const figures = await listLayoutFigures(user, { topology: design.topology });
  const model = oscillatorDesign(design.topology, build.asBuilt, design.revision.extraCapacitanceF, design.revision.windings);
  return calibratedView(figures, design.topology, model, constructionOf(build.kind, build.kindRevision));
}

/**
 * Builds side by side (anyone who can read the logbook): each one's compared run (chosen, else its newest analysed
 * run that is not withdrawn) against its prediction, THD, harmonics and stability, and its implied-capacitance trend.
 * @param buildIds - two or more build ids, in the order to show.
 * @param chosenRunIds - runs to compare instead of the default, at most one per build.
 * @throws NotFoundError when one of the builds does not exist; BadRequestError when a chosen run is not an analysed run of them
 */
export async function getBuildComparison(user: CurrentUser | null, buildIds: readonly string[], chosenRunIds: readonly string[] = []): Promise<ComparedBuild[]> {
  requirePermission(user, "read");
  const ids = buildIds.filter(isId).map((id) => id.toLowerCase());
  const chosen = chosenRunIds.filter(isId).map((id) => id.toLowerCase());
  const rows = await listCompareRows(ids, chosen);
  const known = new Set(rows.builds.map((b) => b.id));
  const missing = buildIds.find((id) => !known.has(id.toLowerCase()));
  if (missing !== undefined) throw new NotFoundError(`The build ${missing}`);
  const problem = chosenRunsProblem(rows.trendRuns, chosen);
  if (problem) throw new BadRequestError(problem, { runs: [problem] });
  return compareBuilds(rows, ids, chosen);
}

/** What the design form's "propose values" step shows. */
export interface DesignValueProposals {
  constructionName: string;
  /** The lab's figure the proposals include, F; 0 when the lab has none for this construction and topology. */
  labCapacitanceF: number;
  figureStrength: FigureStrength;
  /** Steady builds behind the figure. */
  figureBuildCount: number;
  /** Best first; each value as the form's fields take it ("4.7 nF") and in SI. */
  proposals: { values: Record<string, string>; valuesSi: Record<string, number>; predictedHz: number; errorPpm: number; reactanceOhm: number }[];
}

/**
 * Standard values for a new design that land on its target as built on the chosen construction here (engineer and
 * above, as creating a design is): the lab's figure for that construction and topology is taken in parallel.
 * @param input - checked here with zod (valueProposalInputSchema)
 * @throws ZodError for bad input; BadRequestError when the model cannot use the values (e.g. a Hartley without its coil)
 */
export async function proposeDesignValues(user: CurrentUser | null, input: unknown): Promise<DesignValueProposals> {
  requirePermission(user, "design:write");
  const { topology, targetHz, construction, series, dividerRatio, fixed } = valueProposalInputSchema.parse(input);
  const figures = await listLayoutFigures(user, { topology });
  const figure = findLayoutFigure(figures, construction, topology);
  const labCapacitanceF = figure?.capacitanceF.median ?? 0;
  const kept = Object.fromEntries(Object.entries(fixed).filter((e): e is [string, number] => typeof e[1] === "number"));
  let found;
  try {
    found = proposeValues({ topology, targetHz, series, labCapacitanceF, fixed: kept, dividerRatio });
  } catch (err) {
    if (err instanceof RangeError) throw new BadRequestError(`${err.message.charAt(0).toUpperCase()}${err.message.slice(1)}.`);
    throw err;
  }
  return {
    constructionName: constructionName(construction),
    labCapacitanceF,
    figureStrength: figure?.strength ?? "none",
    figureBuildCount: figure?.capacitanceF.count ?? 0,
    proposals: found.map((p) => ({
      values: Object.fromEntries(Object.entries(p.values).map(([ref, v]) => [ref, ref === "k" ? String(v) : formatPartValue(v, ref === "C" || ref.startsWith("C") ? "F" : "H")])),
      valuesSi: p.values,
      predictedHz: p.predictedHz,
      errorPpm: p.errorPpm,
      reactanceOhm: p.reactanceOhm,
    })),
  };
}

/** The constructions a new design can be aimed at, per topology, with how many steady builds stand behind each. */
export async function listConstructionChoicesByTopology(user: CurrentUser | null): Promise<Record<Topology, ConstructionChoice[]>> {
  const figures = await listLayoutFigures(user);
  return Object.fromEntries(TOPOLOGIES.map((t) => [t, choicesFor(figures.filter((f) => f.topology === t))])) as Record<Topology, ConstructionChoice[]>;
}
