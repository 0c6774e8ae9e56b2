import { partUnit, type Topology } from "@/lib/oscillator/design";

/**
 * The unit of a part for display, or "" when the topology has no such part: a logged snapshot or tweak may name a
 * part the current topology table does not know, and a missing unit must not break the page.
 * @param topology the design's topology
 * @param ref the part reference, e.g. "C2"
 * @returns the unit symbol ("F", "H"; "" for the coupling coefficient k) or "" for a part the topology lacks
 */
export function partUnitOrBlank(topology: Topology, ref: string): string {
  try {
    return partUnit(topology, ref);
  } catch {
    return "";
  }
}
