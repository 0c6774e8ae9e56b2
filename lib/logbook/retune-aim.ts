import { getRetuneAim, setRetuneAim, RETUNE_AIMS, type RetuneAim } from "@/db/queries/retune-preferences";
import { requirePermission } from "@/lib/auth/require-permission";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { BadRequestError } from "@/lib/errors";
import { constructionName, constructionOf } from "@/lib/layouts/construction";
import { findLayoutFigure } from "@/lib/layouts/layout-figures";
import type { BuildKind } from "@/db/queries/builds";
import type { Topology } from "@/lib/oscillator/design";
import { listLayoutFigures } from "./layouts";

// Which calibration the retune card aims with, remembered per person: the build's own latest run (what it always
// did) or the lab's figure for the build's construction and topology (the calibrated model).

export type { RetuneAim } from "@/db/queries/retune-preferences";

/** The aim in force for one person on one build, and what the card says about it. */
export interface RetuneAimView {
  /** What the person chose. */
  aim: RetuneAim;
  /** The capacitance the retune takes as real instead of the run's, F; undefined to use the run's own. */
  calibrationCapacitanceF: number | undefined;
  /** The construction in words ("PCB rev B"). */
  constructionName: string;
  /** Why the lab's figure is not used although chosen (the lab has none for this construction); null otherwise. */
  fallbackReason: string | null;
}

/**
 * The retune aim for `user` on a build of `kind`/`kindRevision` and `topology`.
 * @throws UnauthorizedError without a user
 */
export async function retuneAimFor(user: CurrentUser | null, build: { kind: BuildKind; kindRevision: string }, topology: Topology): Promise<RetuneAimView> {
  const reader = requirePermission(user, "read");
  const aim = await getRetuneAim(reader.id);
  const construction = constructionOf(build.kind, build.kindRevision);
  const name = constructionName(construction);
  if (aim === "measured") return { aim, calibrationCapacitanceF: undefined, constructionName: name, fallbackReason: null };
  const figure = findLayoutFigure(await listLayoutFigures(user, { topology }), construction, topology);
  const median = figure?.capacitanceF.median ?? null;
  if (median === null) {
    return {
      aim,
      calibrationCapacitanceF: undefined,
      constructionName: name,
      fallbackReason: `The lab has no steady ${name.toLowerCase()} build of this topology yet, so the retune aims with this build's own run.`,
    };
  }
  return { aim, calibrationCapacitanceF: median, constructionName: name, fallbackReason: null };
}

/**
 * Remembers how the person's retune card aims (anyone signed in: it is their own view).
 * @throws BadRequestError for an aim that is not measured or lab
 */
export async function chooseRetuneAim(user: CurrentUser | null, aim: unknown): Promise<RetuneAim> {
  const reader = requirePermission(user, "read");
  if (typeof aim !== "string" || !(RETUNE_AIMS as readonly string[]).includes(aim)) {
    throw new BadRequestError("Aim with the build's own run (measured) or with the lab's figure (lab).", { aim: ["Choose measured or lab."] });
  }
  await setRetuneAim(reader.id, aim as RetuneAim);
  return aim as RetuneAim;
}
