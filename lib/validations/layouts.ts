import { z } from "zod";
import { BUILD_KINDS } from "@/db/queries/builds";
import { parseConstruction } from "@/lib/layouts/construction";
import { MAX_COMPARED_BUILDS } from "@/lib/layouts/build-comparison";
import { TOPOLOGIES } from "@/lib/oscillator/design";
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
});
