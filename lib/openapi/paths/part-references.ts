import { TOPOLOGIES, TOPOLOGY_PARTS } from "@/lib/oscillator";

/** "tank: L, C; colpitts: L, C1, C2; …" from the model's own table, optional parts marked. */
export function partReferences(): string {
  return TOPOLOGIES.map(
    (t) => `${t}: ${Object.entries(TOPOLOGY_PARTS[t]).map(([ref, role]) => (role.required ? ref : `${ref} (optional)`)).join(", ")}`,
  ).join("; ");
}
