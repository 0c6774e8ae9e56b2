/**
 * How a build was put together, as the lab's figures group it: the kind (breadboard, perfboard, PCB, other) and,
 * for a PCB, its board revision, since a respin moves traces and pads. Pure: no I/O.
 */
import type { BuildKind } from "@/db/queries/builds";

export const CONSTRUCTION_KINDS: readonly BuildKind[] = ["breadboard", "perfboard", "pcb", "other"];

export interface Construction {
  kind: BuildKind;
  /** The PCB revision ("rev B"); "" for the other kinds and for a PCB without one. */
  revision: string;
}

const KIND_NAMES: Record<BuildKind, string> = { breadboard: "Breadboard", perfboard: "Perfboard", pcb: "PCB", other: "Other construction" };

/** Longest revision text a build takes (lib/validations/build.ts). */
const MAX_REVISION_LENGTH = 40;

function normalisedRevision(kind: BuildKind, revision: string): string {
  return kind === "pcb" ? revision.trim() : "";
}

/** The construction of a build: the revision counts only on a PCB. */
export function constructionOf(kind: BuildKind, revision: string): Construction {
  return { kind, revision: normalisedRevision(kind, revision) };
}

/**
 * The construction as one URL-safe text: "breadboard", "perfboard", "other", "pcb", or "pcb:<revision>".
 * Revisions compare without regard to case, so "Rev B" and "rev b" share a figure.
 */
export function constructionKey(c: Construction): string {
  const revision = normalisedRevision(c.kind, c.revision).toLowerCase();
  return revision ? `${c.kind}:${revision}` : c.kind;
}

/**
 * Reads a construction key back.
 * @returns the construction, or null when the text names no kind or the revision is too long.
 */
export function parseConstruction(text: string): Construction | null {
  const at = text.indexOf(":");
  const kindText = (at < 0 ? text : text.slice(0, at)).trim().toLowerCase();
  const kind = CONSTRUCTION_KINDS.find((k) => k === kindText);
  if (!kind) return null;
  const revision = at < 0 ? "" : text.slice(at + 1).trim();
  if (revision.length > MAX_REVISION_LENGTH || (revision && kind !== "pcb")) return null;
  return { kind, revision };
}

/** "Breadboard", "PCB rev B", "PCB (no revision given)". */
export function constructionName(c: Construction): string {
  if (c.kind !== "pcb") return KIND_NAMES[c.kind];
  return c.revision ? `PCB ${c.revision}` : "PCB (no revision given)";
}

/** Lower-case form for running text: "a breadboard", "PCB rev B". */
export function constructionPhrase(c: Construction): string {
  if (c.kind === "pcb") return constructionName(c);
  if (c.kind === "other") return "other construction";
  return `a ${c.kind}`;
}
