import { z } from "zod";
import { BUILD_KINDS, BUILD_STATUSES } from "@/db/queries/builds";
import { optionalText, pageQuerySchema } from "./common";

const kindField = z.enum(BUILD_KINDS, { error: `The kind is one of ${BUILD_KINDS.join(", ")}.` });

/** A new build of a design; its as-built values start as the design's current ones. */
export const buildInputSchema = z.object({
  label: z
    .string({ error: "Give the build a label, e.g. “BB-1”." })
    .trim()
    .min(1, "Give the build a label, e.g. “BB-1”.")
    .max(80, "Use at most 80 characters for the label."),
  kind: kindField,
  kindRevision: optionalText(40, "The revision").transform((v) => v ?? ""),
  /** Who built it; the person logging it when left out. */
  builtBy: optionalText(64, "The builder"),
});
export type BuildInput = z.infer<typeof buildInputSchema>;

export const buildListQuerySchema = pageQuerySchema.extend({
  q: optionalText(200, "The search"),
  status: z.preprocess((v) => (v === "" ? undefined : v), z.enum(BUILD_STATUSES).optional()),
  kind: z.preprocess((v) => (v === "" ? undefined : v), kindField.optional()),
});

/** A build photo upload slot request (image/jpeg, image/png or image/webp, up to 20 MB). */
export const PHOTO_LIMIT_BYTES = 20 * 1024 * 1024;
export const photoSlotRequestSchema = z.object({
  contentType: z.enum(["image/jpeg", "image/png", "image/webp"], { error: "Photos can be JPEG, PNG or WebP." }),
  sizeBytes: z.number().int().min(1, "The photo is empty.").max(PHOTO_LIMIT_BYTES, "Photos can be up to 20 MB."),
  filename: z.string().trim().min(1).max(255),
  caption: optionalText(200, "The caption").transform((v) => v ?? ""),
});
