import type { Run } from "@/db/queries/runs";
import type { PlotData } from "@/lib/analysis/plot";

/** A value as it arrives over JSON: Dates become ISO strings (server props keep them as Dates). */
type Wire<T> = [T] extends [Date] ? string | Date : [T] extends [Date | null] ? string | Date | null : T;

/** A run as the run page holds it, from server props or from GET /api/v1/runs/[runId]. */
export type RunData = { [K in keyof Run]: Wire<Run[K]> };

/** Names around the run for the page header and links. */
export interface RunContext {
  projectId: string;
  projectName: string;
  designId: string;
  designName: string;
  buildId: string;
  buildLabel: string;
  /** The tweak the run follows, in words, when there is one. */
  tweakLabel: string | null;
  /** The build's scope timebase accuracy, ± ppm; null when not entered. */
  timebasePpm: number | null;
}

export type RunPlot = PlotData;
