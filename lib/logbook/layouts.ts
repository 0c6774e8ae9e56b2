import { listLayoutGroups, type LayoutFilter } from "@/db/queries/layouts";
import { requirePermission } from "@/lib/auth/require-permission";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { layoutFigures, type LayoutFigure } from "@/lib/layouts/layout-figures";

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
