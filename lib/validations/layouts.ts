import { z } from "zod";
import { BUILD_KINDS } from "@/db/queries/builds";
import { parseConstruction } from "@/lib/layouts/construction";
import { MAX_COMPARED_BUILDS } from "@/lib/layouts/build-comparison";
import { TOPOLOGIES } from "@/lib/oscillator/design";
import { parseValue } from "@/lib/oscillator/units";
import { idSchema } from "./common";

const blank = (v: unknown) => (v === "" ? undefined : v);

/** `GET /api/v1/layouts`: `?kind=&topology=`, both optional. */
export const layoutsQuerySchema = z.object({
  kind: z.preprocess(blank, z.enum(BUILD_KINDS, { error: `The kind is one of ${BUILD_KINDS.join(", ")}.` }).optional()),
  topology: z.preprocess(blank, z.enum(TOPOLOGIES as [string, ...string[]], { error: `The topology is one of ${TOPOLOGIES.join(", ")}.` }).optional()),
});

/** `GET /api/v1/designs/{id}/prediction`: `?construction=breadboard|perfboard|other|pcb|pcb:<revision>`, optional. */
export const predictionQuerySchema = z.object({
  construction: z.preprocess(
    blank,
    z
      .string()
      .trim()
      .max(60, "The construction takes at most 60 characters.")
      .refine((v) => parseConstruction(v) !== null, "The construction is breadboard, perfboard, other, pcb, or pcb:<revision> (e.g. pcb:rev B).")
      .transform((v) => parseConstruction(v)!)
      .optional(),
  ),
});

/** `GET /api/v1/builds/compare`: `?ids=<uuid>,<uuid>[,…]`, two to {@link MAX_COMPARED_BUILDS} builds. */
export const compareQuerySchema = z.object({
  ids: z
    .string({ error: "Name the builds to compare: ?ids=<id>,<id>." })
    .transform((v) => v.split(",").map((s) => s.trim()).filter((s) => s !== ""))
    .pipe(
      z
        .array(idSchema)
        .min(2, "Compare at least two builds.")
        .max(MAX_COMPARED_BUILDS, `Compare at most ${MAX_COMPARED_BUILDS} builds at once.`)
        .refine((ids) => new Set(ids).size === ids.length, "Name each build once."),
    ),
  // The run to compare for some builds instead of the default (the newest one not withdrawn): `?runs=<id>,<id>`.
  runs: z.preprocess(
    (v) => (typeof v === "string" && v.trim() === "" ? undefined : v),
    z
      .string()
      .transform((v) => v.split(",").map((s) => s.trim()).filter((s) => s !== ""))
      .pipe(z.array(idSchema).max(MAX_COMPARED_BUILDS, `Choose at most ${MAX_COMPARED_BUILDS} runs, one per build.`))
      .optional(),
  ),
});

const valueText = (label: string, unit: "Hz" | "H" | "F" | "") =>
  z
    .string({ error: `${label} is missing.` })
    .trim()
    .min(1, `${label} is missing.`)
    .max(40, `${label} takes at most 40 characters.`)
    .transform((v, ctx) => {
      try {
        const n = parseValue(v, unit === "" ? undefined : unit);
        if (Number.isFinite(n) && n > 0) return n;
      } catch {
        // The message below names the field; the parser's own words would name no field.
      }
      ctx.addIssue({ code: "custom", message: `${label} is not a value Tankbook reads (e.g. ${unit === "Hz" ? "1.04M or 455k" : unit === "H" ? "10u" : unit === "F" ? "4n7" : "0.5"}).` });
      return z.NEVER;
    });

/**
 * The design form's "propose values" step: a target, the construction it will be built on, the series, and for
 * Colpitts and Clapp the divider ratio C2/C1. `fixed` holds inductances already typed into the form (kept as given).
 */
export const valueProposalInputSchema = z.object({
  topology: z.enum(TOPOLOGIES as [string, ...string[]], { error: `The topology is one of ${TOPOLOGIES.join(", ")}.` }).transform((t) => t as (typeof TOPOLOGIES)[number]),
  targetHz: valueText("The target frequency", "Hz"),
  construction: z
    .string()
    .trim()
    .max(60, "The construction takes at most 60 characters.")
    .refine((v) => parseConstruction(v) !== null, "The construction is breadboard, perfboard, other, pcb, or pcb:<revision>.")
    .transform((v) => parseConstruction(v)!),
  series: z.enum(["E12", "E24"], { error: "The series is E12 or E24." }),
  dividerRatio: z.preprocess(
    (v) => (typeof v === "string" ? (v.trim() === "" ? undefined : Number(v.trim().replace(",", "."))) : v),
    z.number({ error: "C2/C1 must be a number." }).finite("C2/C1 must be a finite number.").min(0.05, "C2/C1 must be at least 0.05.").max(20, "C2/C1 must be at most 20.").optional(),
  ),
  fixed: z
    .object({
      L: valueText("L", "H").optional(),
      L1: valueText("L1", "H").optional(),
      L2: valueText("L2", "H").optional(),
      M: valueText("M", "H").optional(),
      k: valueText("k", "").optional(),
    })
    .partial()
    .default({}),
});

export type ValueProposalRequest = z.input<typeof valueProposalInputSchema>;
