/**
 * The design form's text fields, and the live preview computed from them in the browser with the same schema the
 * server action uses (lib/validations/design.ts) and the same model (lib/oscillator), so what the form shows
 * while typing is what the server will store and predict.
 */
import type { DesignRevision } from "@/db/queries/designs";
import { designInputSchema, designSpecSchema, type DesignInput } from "@/lib/validations/design";
import { buildDesignReport, type DesignReport } from "@/lib/oscillator/report";
import { TOPOLOGY_PARTS, partUnit, type Topology } from "@/lib/oscillator/design";
import { formatEngineering } from "@/lib/oscillator/units";

export interface PartDraft {
  value: string;
  tolerance: string;
  tempco: string;
}

export interface SpecDraft {
  targetHz: string;
  toleranceValue: string;
  toleranceUnit: "percent" | "ppm";
  maxThdPercent: string;
  maxHarmonicDbc: string;
  minFundamentalVpk: string;
  maxDriftPpm: string;
  /** Stability limits: rms jitter and start-up time as times ("50 ps", "2 ms"), the offset as a frequency. */
  maxRmsJitterS: string;
  maxPushingPpmPerV: string;
  maxTempcoPpmPerK: string;
  phaseNoiseOffsetHz: string;
  maxPhaseNoiseDbcPerHz: string;
  maxStartUpS: string;
}

export interface DesignDraft {
  name: string;
  topology: Topology;
  parts: Record<string, PartDraft>;
  extraCapacitance: string;
  windings: "" | "aiding" | "opposing";
  spec: SpecDraft;
  changeNote: string;
}

export const EMPTY_SPEC: SpecDraft = {
  targetHz: "",
  toleranceValue: "",
  toleranceUnit: "percent",
  maxThdPercent: "",
  maxHarmonicDbc: "",
  minFundamentalVpk: "",
  maxDriftPpm: "",
  maxRmsJitterS: "",
  maxPushingPpmPerV: "",
  maxTempcoPpmPerK: "",
  phaseNoiseOffsetHz: "",
  maxPhaseNoiseDbcPerHz: "",
  maxStartUpS: "",
};

/** A blank draft of a topology: every part the topology takes, empty. */
export function emptyDraft(topology: Topology): DesignDraft {
  return {
    name: "",
    topology,
    parts: Object.fromEntries(Object.keys(TOPOLOGY_PARTS[topology]).map((ref) => [ref, { value: "", tolerance: "", tempco: "" }])),
    extraCapacitance: "",
    windings: "",
    spec: { ...EMPTY_SPEC },
    changeNote: "",
  };
}

/** Keeps the values of parts both topologies share (L, C1, C2…) when the topology changes. */
export function switchTopology(draft: DesignDraft, topology: Topology): DesignDraft {
  const next = emptyDraft(topology);
  for (const ref of Object.keys(next.parts)) if (draft.parts[ref]) next.parts[ref] = { ...draft.parts[ref] };
  return { ...next, name: draft.name, extraCapacitance: draft.extraCapacitance, spec: draft.spec, changeNote: draft.changeNote, windings: topology === "hartley" ? draft.windings : "" };
}

function plain(value: number | null | undefined): string {
  return typeof value === "number" && Number.isFinite(value) ? String(value) : "";
}

function tempcoText(ppmPerK: number | undefined, spread: number | undefined): string {
  if (ppmPerK === undefined && !spread) return "";
  const nominal = ppmPerK ?? 0;
  const sign = nominal > 0 ? "+" : "";
  return spread ? `${sign}${nominal} ± ${spread} ppm/K` : `${sign}${nominal} ppm/K`;
}

/** A stored revision as form text, in forms the parsers read back to the same numbers. */
export function draftFromRevision(name: string, topology: Topology, revision: Pick<DesignRevision, "parts" | "extraCapacitanceF" | "windings" | "spec">): DesignDraft {
  const draft = emptyDraft(topology);
  draft.name = name;
  for (const [ref, part] of Object.entries(revision.parts)) {
    const unit = ref in TOPOLOGY_PARTS[topology] ? partUnit(topology, ref) : "";
    draft.parts[ref] = {
      value: unit === "" ? String(part.valueSi) : formatEngineering(part.valueSi, unit, 6, { trimZeros: true }),
      tolerance: part.tolerance ? `${Number((part.tolerance * 100).toPrecision(6))}%` : "",
      tempco: tempcoText(part.tempcoPpmPerK, part.tempcoSpreadPpmPerK),
    };
  }
  draft.extraCapacitance = revision.extraCapacitanceF ? formatEngineering(revision.extraCapacitanceF, "F", 6, { trimZeros: true }) : "";
  draft.windings = revision.windings ?? "";
  const s = revision.spec ?? {};
  draft.spec = {
    targetHz: typeof s.targetHz === "number" ? formatEngineering(s.targetHz, "Hz", 9, { trimZeros: true }) : "",
    toleranceValue: plain(s.toleranceValue),
    toleranceUnit: s.toleranceUnit === "ppm" ? "ppm" : "percent",
    maxThdPercent: plain(s.maxThdPercent),
    maxHarmonicDbc: plain(s.maxHarmonicDbc),
    minFundamentalVpk: plain(s.minFundamentalVpk),
    maxDriftPpm: plain(s.maxDriftPpm),
    maxRmsJitterS: typeof s.maxRmsJitterS === "number" ? formatEngineering(s.maxRmsJitterS, "s", 6, { trimZeros: true }) : "",
    maxPushingPpmPerV: plain(s.maxPushingPpmPerV),
    maxTempcoPpmPerK: plain(s.maxTempcoPpmPerK),
    phaseNoiseOffsetHz: typeof s.phaseNoiseOffsetHz === "number" ? formatEngineering(s.phaseNoiseOffsetHz, "Hz", 6, { trimZeros: true }) : "",
    maxPhaseNoiseDbcPerHz: plain(s.maxPhaseNoiseDbcPerHz),
    maxStartUpS: typeof s.maxStartUpS === "number" ? formatEngineering(s.maxStartUpS, "s", 6, { trimZeros: true }) : "",
  };
  return draft;
}

/** The form fields as the server action receives them: dotted names mirroring the schema's paths. */
export function draftFields(draft: DesignDraft): Array<[string, string]> {
  const out: Array<[string, string]> = [
    ["name", draft.name],
    ["topology", draft.topology],
    ["extraCapacitance", draft.extraCapacitance],
    ["windings", draft.windings],
    ["changeNote", draft.changeNote],
  ];
  for (const [ref, p] of Object.entries(draft.parts)) {
    out.push([`parts.${ref}.value`, p.value], [`parts.${ref}.tolerance`, p.tolerance], [`parts.${ref}.tempco`, p.tempco]);
  }
  for (const [k, v] of Object.entries(draft.spec)) out.push([`spec.${k}`, v]);
  return out;
}

export interface DesignPreview {
  /** The prediction, when the parts make a valid design (a spec problem does not hold it back). */
  report: DesignReport | null;
  /** The parsed design, SI units, when both parts and spec are valid. */
  input: DesignInput | null;
  /** Problems keyed by dotted field path ("parts.C1.value", "spec.targetHz"). */
  problems: Record<string, string[]>;
  /** True when the only problems are required part values not typed yet. */
  incomplete: boolean;
}

function collect(issues: ReadonlyArray<{ path: PropertyKey[]; message: string }>, prefix: string, into: Record<string, string[]>): void {
  for (const issue of issues) {
    const key = [prefix, ...issue.path.map(String)].filter(Boolean).join(".") || "form";
    (into[key] ??= []).push(issue.message);
  }
}

/**
 * Checks the draft with the server's schema and predicts it. Parts and spec are checked apart, so a bad spec field
 * does not hide the part problems (the schema stops at the first failing object) nor the prediction.
 *
 * @param draft - the form as typed; the name does not affect the prediction.
 * @returns the report (f0, C_eff, L_eff, β, minimum gain, worst-case and statistical bands, assumptions) when the
 *   parts are valid, the problems by dotted field path, and whether the only problems are values not typed yet.
 */
export function previewDesign(draft: DesignDraft): DesignPreview {
  const problems: Record<string, string[]> = {};
  const partsOnly = designInputSchema.safeParse({
    ...draft,
    name: draft.name.trim() || "preview",
    spec: { toleranceUnit: draft.spec.toleranceUnit },
  });
  const spec = designSpecSchema.safeParse(draft.spec);
  if (!partsOnly.success) collect(partsOnly.error.issues, "", problems);
  if (!spec.success) collect(spec.error.issues, "spec", problems);
  const incomplete =
    Object.keys(problems).length > 0 && Object.values(problems).flat().every((m) => /^Enter the value of/.test(m));

  let report: DesignReport | null = null;
  if (partsOnly.success) {
    const d = partsOnly.data;
    try {
      report = buildDesignReport({
        topology: d.topology,
        parts: d.parts,
        ...(d.extraCapacitanceF ? { extraCapacitanceF: d.extraCapacitanceF } : {}),
        ...(d.windings ? { windings: d.windings } : {}),
      });
    } catch (err) {
      (problems.parts ??= []).push(err instanceof Error ? err.message : "The model refused these values.");
    }
  }
  const input = partsOnly.success && spec.success && report ? { ...partsOnly.data, spec: spec.data } : null;
  return { report, input, problems, incomplete };
}
