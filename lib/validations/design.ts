import { z } from "zod";
import { TOPOLOGIES, TOPOLOGY_PARTS, parseValue, validateDesign, type PartSpec, type Topology } from "@/lib/oscillator";
import type { DesignSpec } from "@/lib/spec/types";
import { optionalEngineeringValue, optionalNumberField, optionalText, pageQuerySchema, tempcoField, toleranceField } from "./common";
import { partLimitName, withinLimit } from "./limits";

/** One part as entered: value in engineering notation or an IEC 60062 code (or SI number), tolerance, tempco. */
const rawPartSchema = z.object({
  value: z.union([z.string(), z.number()]).optional(),
  tolerance: toleranceField,
  tempco: tempcoField,
});
type RawPart = z.infer<typeof rawPartSchema>;

const UNIT_OF_KIND = { inductance: "H", capacitance: "F", coupling: undefined } as const;

function isBlank(value: unknown): boolean {
  return value === undefined || value === null || (typeof value === "string" && value.trim() === "");
}

/**
 * Parses each part's value with the unit its role in `topology` calls for, adding issues at
 * `parts.<ref>.value`; blank optional parts (Hartley's M or k) are dropped.
 */
function parseParts(topology: Topology, raw: Record<string, RawPart>, ctx: z.RefinementCtx, required: boolean): Record<string, PartSpec> {
  const roles = TOPOLOGY_PARTS[topology];
  const parts: Record<string, PartSpec> = {};
  for (const [ref, part] of Object.entries(raw)) {
    const role = roles[ref];
    if (!role) {
      ctx.addIssue({ code: "custom", path: ["parts", ref], message: `${topology} has no part ${ref} (its parts are ${Object.keys(roles).join(", ")}).` });
      continue;
    }
    if (isBlank(part.value)) {
      if (role.required && required) ctx.addIssue({ code: "custom", path: ["parts", ref, "value"], message: `Enter the value of ${ref} (${role.description}).` });
      continue;
    }
    let valueSi: number;
    if (typeof part.value === "number") {
      valueSi = part.value;
    } else {
      try {
        valueSi = parseValue(part.value as string, UNIT_OF_KIND[role.kind]);
      } catch (err) {
        ctx.addIssue({ code: "custom", path: ["parts", ref, "value"], message: err instanceof Error ? err.message : "This is not a value." });
        continue;
      }
    }
    // The bench limit per part here, so one unreadable value does not hide another part's absurd one.
    const limit = partLimitName(ref, role.kind);
    if (limit !== null) {
      const before = ctx.issues.length;
      withinLimit(limit, `part ${ref} (${role.description})`, ["parts", ref, "value"])(valueSi, ctx);
      if (ctx.issues.length > before) continue;
    }
    const spec: PartSpec = { valueSi };
    if (part.tolerance !== undefined) spec.tolerance = part.tolerance;
    if (part.tempco !== undefined) {
      spec.tempcoPpmPerK = part.tempco.ppmPerK;
      if (part.tempco.spreadPpmPerK) spec.tempcoSpreadPpmPerK = part.tempco.spreadPpmPerK;
    }
    parts[ref] = spec;
  }
  if (required) {
    for (const [ref, role] of Object.entries(roles)) {
      if (role.required && raw[ref] === undefined) {
        ctx.addIssue({ code: "custom", path: ["parts", ref, "value"], message: `Enter the value of ${ref} (${role.description}).` });
      }
    }
  }
  return parts;
}

/** Puts lib/oscillator's design problems ("part C1 must be …") on the field they name. */
function addDesignProblems(problems: string[], ctx: z.RefinementCtx): void {
  for (const problem of problems) {
    const ref = /^part (\S+)/.exec(problem)?.[1];
    const path = ref ? ["parts", ref, "value"] : /^extraCapacitanceF/.test(problem) ? ["extraCapacitance"] : ["parts"];
    ctx.addIssue({ code: "custom", path, message: problem.charAt(0).toUpperCase() + problem.slice(1) + "." });
  }
}

/**
 * A time limit as people write it ("50 ps", "50p", "2 ms", "1e-9") or seconds as a number (API); blank is unset.
 * lib/oscillator's parser reads the prefix; the trailing "s" is dropped first.
 */
function optionalSeconds(label: string) {
  return z.preprocess(
    (v) => (isBlank(v) ? undefined : v),
    z
      .union([z.number(), z.string()])
      .transform((value, ctx) => {
        let seconds: number;
        try {
          seconds = typeof value === "number" ? value : parseValue(value.trim().replace(/\s*s(ec)?$/i, ""));
        } catch {
          ctx.addIssue({ code: "custom", message: `${label} is a time such as 50 ps, 2 ms or 1e-9 (seconds).` });
          return z.NEVER;
        }
        if (!Number.isFinite(seconds) || seconds <= 0) {
          ctx.addIssue({ code: "custom", message: `${label} must be above 0 s.` });
          return z.NEVER;
        }
        return seconds;
      })
      .optional(),
  );
}

/** The spec as entered. Each limit is optional; a tolerance needs a target; a phase-noise limit needs its offset. */
export const designSpecSchema = z
  .object({
    targetHz: optionalEngineeringValue("Hz", "The target frequency"),
    toleranceValue: optionalNumberField("The frequency tolerance", { min: 0 }),
    toleranceUnit: z.preprocess((v) => (isBlank(v) ? "percent" : v), z.enum(["percent", "ppm"], { error: "The tolerance unit is % or ppm." })),
    maxThdPercent: optionalNumberField("The THD limit", { min: 0, max: 100 }),
    maxHarmonicDbc: optionalNumberField("The harmonic limit (dBc, 0 or below, e.g. −40)", { max: 0 }),
    minFundamentalVpk: optionalNumberField("The minimum amplitude (V peak)", { min: 0 }),
    maxDriftPpm: optionalNumberField("The in-record drift limit (ppm)", { min: 0 }),
    maxRmsJitterS: optionalSeconds("The rms jitter limit"),
    maxPushingPpmPerV: optionalNumberField("The pushing limit (ppm/V)", { min: 0 }),
    maxTempcoPpmPerK: optionalNumberField("The temperature coefficient limit (ppm/K, as a size)", { min: 0 }),
    phaseNoiseOffsetHz: optionalEngineeringValue("Hz", "The phase-noise offset"),
    maxPhaseNoiseDbcPerHz: optionalNumberField("The phase-noise limit (dBc/Hz, below 0, e.g. −100)", { max: 0 }),
    maxStartUpS: optionalSeconds("The start-up time limit"),
  })
  .superRefine((s, ctx) => {
    if (s.maxPhaseNoiseDbcPerHz !== undefined && s.phaseNoiseOffsetHz === undefined) {
      ctx.addIssue({ code: "custom", path: ["phaseNoiseOffsetHz"], message: "A phase-noise limit needs the offset it applies at (e.g. 10k)." });
    }
    if (s.phaseNoiseOffsetHz !== undefined && s.maxPhaseNoiseDbcPerHz === undefined) {
      ctx.addIssue({ code: "custom", path: ["maxPhaseNoiseDbcPerHz"], message: "An offset needs the phase-noise limit that applies there (e.g. −100 dBc/Hz)." });
    }
    if (s.phaseNoiseOffsetHz !== undefined && !(s.phaseNoiseOffsetHz > 0)) {
      ctx.addIssue({ code: "custom", path: ["phaseNoiseOffsetHz"], message: "The phase-noise offset must be above 0 Hz." });
    }
    if (s.toleranceValue !== undefined && s.targetHz === undefined) {
      ctx.addIssue({ code: "custom", path: ["targetHz"], message: "A frequency tolerance needs a target frequency." });
    }
    if (s.targetHz !== undefined) withinLimit("frequencyHz", "the target frequency", ["targetHz"])(s.targetHz, ctx);
  })
  .transform(
    (s): DesignSpec => ({
      targetHz: s.targetHz ?? null,
      toleranceValue: s.toleranceValue ?? null,
      toleranceUnit: s.toleranceUnit,
      maxThdPercent: s.maxThdPercent ?? null,
      maxHarmonicDbc: s.maxHarmonicDbc ?? null,
      minFundamentalVpk: s.minFundamentalVpk ?? null,
      maxDriftPpm: s.maxDriftPpm ?? null,
      maxRmsJitterS: s.maxRmsJitterS ?? null,
      maxPushingPpmPerV: s.maxPushingPpmPerV ?? null,
      maxTempcoPpmPerK: s.maxTempcoPpmPerK ?? null,
      phaseNoiseOffsetHz: s.phaseNoiseOffsetHz ?? null,
      maxPhaseNoiseDbcPerHz: s.maxPhaseNoiseDbcPerHz ?? null,
      maxStartUpS: s.maxStartUpS ?? null,
    }),
  );

const nameField = z
  .string({ error: "Give the design a name." })
  .trim()
  .min(1, "Give the design a name.")
  .max(120, "Use at most 120 characters for the name.");

const windingsField = z.preprocess((v) => (isBlank(v) ? undefined : v), z.enum(["aiding", "opposing"], { error: "Windings are aiding or opposing." }).optional());

/**
 * A new design: name, topology, parts (by reference, as the topology names them), optional extra capacitance
 * and Hartley windings, and the spec. Output values are SI; tolerances are fractions.
 */
export const designInputSchema = z
  .object({
    name: nameField,
    topology: z.enum(TOPOLOGIES as [Topology, ...Topology[]], { error: `The topology is one of ${TOPOLOGIES.join(", ")}.` }),
    parts: z.record(z.string(), rawPartSchema, { error: "Enter the part values." }),
    extraCapacitance: optionalEngineeringValue("F", "The extra capacitance"),
    windings: windingsField,
    spec: designSpecSchema.prefault({ toleranceUnit: "percent" }),
    changeNote: optionalText(500, "The note"),
  })
  .transform((d, ctx) => {
    const before = ctx.issues.length;
    const parts = parseParts(d.topology, d.parts, ctx, true);
    // Windings only mean something for a Hartley; a form may still post its select for the others.
    const windings = d.topology === "hartley" ? (d.windings ?? null) : null;
    const design = {
      topology: d.topology,
      parts,
      ...(d.extraCapacitance !== undefined ? { extraCapacitanceF: d.extraCapacitance } : {}),
      ...(windings ? { windings } : {}),
    };
    // Only when every value parsed: the model's checks on half-read parts would repeat the same complaint.
    if (ctx.issues.length === before && Object.keys(parts).length > 0) addDesignProblems(validateDesign(design), ctx);
    return {
      name: d.name,
      topology: d.topology,
      parts,
      extraCapacitanceF: d.extraCapacitance ?? null,
      windings,
      spec: d.spec,
      changeNote: d.changeNote ?? "",
    };
  });
export type DesignInput = z.output<typeof designInputSchema>;

/**
 * Every problem of a design form at once. {@link designInputSchema} stops at the first failing object (a bad
 * target hides the part values), so when it fails this also checks the parts, the spec and the name apart and
 * merges what they find, each issue once.
 *
 * @param raw - the form object or JSON the schema refused.
 * @param error - the schema's error.
 * @returns an error carrying the union of the issues, under the same dotted paths.
 */
export function everyDesignIssue(raw: unknown, error: z.ZodError): z.ZodError {
  if (typeof raw !== "object" || raw === null) return error;
  const o = raw as Record<string, unknown>;
  const issues = [...error.issues];
  const seen = new Set(issues.map((i) => `${i.path.join(".")}|${i.message}`));
  const add = (found: readonly z.core.$ZodIssue[], prefix: PropertyKey[]) => {
    for (const issue of found) {
      const path = [...prefix, ...issue.path];
      const key = `${path.join(".")}|${issue.message}`;
      if (seen.has(key)) continue;
      seen.add(key);
      issues.push({ ...issue, path } as z.core.$ZodIssue);
    }
  };
  const partsOnly = designInputSchema.safeParse({ ...o, name: "parts only", spec: {} });
  if (!partsOnly.success) add(partsOnly.error.issues.filter((i) => i.path[0] !== "name" && i.path[0] !== "spec"), []);
  const spec = designSpecSchema.safeParse(o.spec ?? {});
  if (!spec.success) add(spec.error.issues, ["spec"]);
  const name = nameField.safeParse(o.name);
  if (!name.success) add(name.error.issues, ["name"]);
  return new z.ZodError(issues);
}

/**
 * A change to a design (a new revision): every field optional. Parts given replace those refs (the others stay),
 * the spec given replaces the spec, `extraCapacitance: ""` clears it. The merged design is checked by the service.
 */
export function designPatchSchemaFor(topology: Topology) {
  return z
    .object({
      name: nameField.optional(),
      parts: z.record(z.string(), rawPartSchema).optional(),
      extraCapacitance: z.union([z.literal(""), z.null(), z.string(), z.number()]).optional(),
      windings: windingsField,
      spec: designSpecSchema.optional(),
      changeNote: optionalText(500, "The note"),
    })
    .transform((d, ctx) => {
      let extraCapacitanceF: number | null | undefined;
      if (d.extraCapacitance === "" || d.extraCapacitance === null) extraCapacitanceF = null;
      else if (typeof d.extraCapacitance === "number") extraCapacitanceF = d.extraCapacitance;
      else if (typeof d.extraCapacitance === "string") {
        try {
          extraCapacitanceF = parseValue(d.extraCapacitance, "F");
        } catch (err) {
          ctx.addIssue({ code: "custom", path: ["extraCapacitance"], message: err instanceof Error ? err.message : "This is not a value." });
        }
      }
      return {
        name: d.name,
        parts: d.parts ? parseParts(topology, d.parts, ctx, false) : undefined,
        extraCapacitanceF,
        windings: d.windings,
        spec: d.spec,
        changeNote: d.changeNote ?? "",
      };
    });
}
export type DesignPatch = z.output<ReturnType<typeof designPatchSchemaFor>>;

/** Checks a merged design (after a patch) and returns field errors in the same shape a form shows. */
export function designProblemsByField(design: unknown): Record<string, string[]> {
  const fields: Record<string, string[]> = {};
  for (const problem of validateDesign(design)) {
    const ref = /^part (\S+)/.exec(problem)?.[1];
    const key = ref ? `parts.${ref}.value` : /^extraCapacitanceF/.test(problem) ? "extraCapacitance" : "parts";
    (fields[key] ??= []).push(problem);
  }
  return fields;
}

export const designListQuerySchema = pageQuerySchema.extend({
  q: optionalText(200, "The search"),
  topology: z.preprocess((v) => (isBlank(v) ? undefined : v), z.enum(TOPOLOGIES as [Topology, ...Topology[]]).optional()),
});
