import { z } from "zod";
import { documented } from "../documented";
import { designSpecSchema, isoTime, pageOf, partsSchema, predictionSchema, rowId, topologySchema, userId } from "./common";

const designShape = {
  id: rowId,
  projectId: rowId,
  projectName: z.string(),
  name: z.string(),
  topology: topologySchema,
  revision: z.int().min(1).describe("The current revision number; every edit adds one."),
  parts: partsSchema,
  extraCapacitanceF: z.number().nullable().describe("Extra capacitance across the tank, F."),
  windings: z.enum(["aiding", "opposing"]).nullable().describe("Hartley only: how the two windings are coupled."),
  spec: designSpecSchema,
  createdAt: isoTime,
  updatedAt: isoTime,
  prediction: predictionSchema.nullable(),
};

/** A design as created or revised (POST, PATCH). */
export const designSchema = documented(z.object(designShape), { refId: "Design" });

export const designListItemSchema = documented(z.object({ ...designShape, buildCount: z.int() }), { refId: "DesignListItem" });
export const designPageSchema = pageOf(designListItemSchema, "DesignPage");

export const designRevisionSchema = documented(
  z.object({
    id: rowId,
    revision: z.int().min(1),
    parts: partsSchema,
    extraCapacitanceF: z.number().nullable(),
    windings: z.enum(["aiding", "opposing"]).nullable(),
    spec: designSpecSchema,
    changeNote: z.string(),
    createdBy: userId,
    createdByName: z.string(),
    createdAt: isoTime,
  }),
  { refId: "DesignRevision", description: "One numbered state of a design; never changed once written." },
);

/** GET /designs/{id}: the design with why there is no prediction (if so) and its revision history. */
export const designDetailSchema = documented(
  z.object({
    ...designShape,
    predictionError: z.string().nullable().describe("Why there is no prediction, when there is none."),
    revisions: z.array(designRevisionSchema).describe("Every revision, newest first."),
  }),
  { refId: "DesignDetail" },
);
