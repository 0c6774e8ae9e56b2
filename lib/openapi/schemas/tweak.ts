import { z } from "zod";
import { documented } from "../documented";
import { isoTime, pageOf, rowId, userId } from "./common";

export const tweakSchema = documented(
  z.object({
    id: rowId,
    buildId: rowId,
    partRef: z.string().nullable().describe("The part changed; null for a note-only tweak."),
    fromValue: z.number().nullable().describe("The part's value before, SI units (F, H; k unitless)."),
    toValue: z.number().nullable().describe("The part's new value, SI units."),
    note: z.string(),
    planned: z.boolean().describe("A planned tweak has not changed the as-built values yet."),
    createdBy: userId,
    createdByName: z.string(),
    createdAt: isoTime,
  }),
  { refId: "Tweak", description: "What changed on a build: a part's value and/or a note." },
);

export const tweakPageSchema = pageOf(tweakSchema, "TweakPage");
