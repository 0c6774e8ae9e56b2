import { z } from "zod";
import { BUILD_KINDS, BUILD_STATUSES } from "@/db/queries/builds";
import { documented } from "../documented";
import { flagSchema, isoTime, nullableIsoTime, pageOf, partsSchema, predictionSchema, rowId, topologySchema, userId } from "./common";
import { tweakSchema } from "./tweak";

const verdictSchema = z.enum(["pass", "fail", "inconclusive"]).nullable();

const buildShape = {
  id: rowId,
  designId: rowId,
  designName: z.string(),
  projectId: rowId,
  label: z.string(),
  kind: z.enum(BUILD_KINDS),
  kindRevision: z.string().describe("Free text beside the kind, e.g. “rev B”."),
  timebasePpm: z.number().nullable().describe("Accuracy of the scope's timebase on this bench, ± ppm; null when not entered."),
  builtBy: userId,
  builtByName: z.string(),
  asBuilt: partsSchema.describe("Parts as they are on the bench now: the design's values changed by every applied tweak."),
  status: z.enum(BUILD_STATUSES).describe("The review state."),
  reviewComment: z.string().nullable(),
  reviewedByName: z.string().nullable(),
  reviewedAt: nullableIsoTime,
  createdAt: isoTime,
  updatedAt: isoTime,
};

/** A build as created (POST /designs/{id}/builds). */
export const buildSchema = documented(z.object(buildShape), { refId: "Build" });

export const latestRunSchema = documented(
  z.object({
    id: rowId,
    createdAt: isoTime,
    status: z.string(),
    measuredHz: z.number().nullable(),
    driftPpm: z.number().nullable(),
    thdPercent: z.number().nullable(),
    verdict: verdictSchema,
  }),
  { refId: "LatestRun" },
);

export const buildListItemSchema = documented(
  z.object({ ...buildShape, runCount: z.int(), latestRun: latestRunSchema.nullable() }),
  { refId: "BuildListItem" },
);
export const buildPageSchema = pageOf(buildListItemSchema, "BuildPage");

/** GET /builds/{id}: the prediction for the as-built values, the tweak log and open flags. */
export const buildDetailSchema = documented(
  z.object({
    ...buildShape,
    prediction: predictionSchema.nullable(),
    topology: topologySchema,
    predictionError: z.string().nullable(),
    tweaks: z.array(tweakSchema).describe("The tweak log, oldest first."),
    openFlags: z.array(flagSchema).describe("Flags not yet acknowledged."),
  }),
  { refId: "BuildDetail" },
);
