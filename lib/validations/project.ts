import { z } from "zod";
import { optionalText, pageQuerySchema } from "./common";

/** Create or edit a project (engineer and above). */
export const projectInputSchema = z.object({
  name: z
    .string({ error: "Give the project a name." })
    .trim()
    .min(1, "Give the project a name.")
    .max(120, "Use at most 120 characters for the name."),
  purpose: optionalText(2000, "The purpose").transform((v) => v ?? ""),
});
export type ProjectInput = z.infer<typeof projectInputSchema>;

export const projectPatchSchema = projectInputSchema.partial();
export type ProjectPatch = z.infer<typeof projectPatchSchema>;

export const projectListQuerySchema = pageQuerySchema.extend({ q: optionalText(200, "The search") });
