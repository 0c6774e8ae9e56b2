import { z } from "zod";
import { E_SERIES_NAMES } from "@/lib/oscillator/e-series";
import { BUILD_STATES, BUILD_TABLE_SORTS } from "@/db/queries/dashboard";
import { BUILD_KINDS } from "@/db/queries/builds";
import { booleanField, idSchema, optionalNumberField, optionalText } from "./common";
import { runListQuerySchema } from "./run";

// Sign-off, flags, follows and the retune plan: what the review actions and /api/v1 routes accept.

/** The reason for accepting a build whose latest run is flagged: required then (the service says when), never blank. */
export const REASON_REQUIRED_MESSAGE = "The latest run of this build is flagged: give the reason for accepting it anyway.";

/**
 * Accept, reject or reopen a build. A rejection says why (comment); accepting a flagged build also needs a reason,
 * which the service asks for because only it knows the latest run's verdict.
 */
// The logbook's review form posts `status` (accepted | rejected | open); the API takes `decision`. Both land here.
const STATUS_TO_DECISION: Record<string, string> = { accepted: "accept", rejected: "reject", open: "reopen" };

export const buildReviewInputSchema = z
  .preprocess(
    (v) => {
      if (typeof v !== "object" || v === null) return v;
      const o = v as Record<string, unknown>;
      return o.decision === undefined && typeof o.status === "string" ? { ...o, decision: STATUS_TO_DECISION[o.status] ?? o.status } : o;
    },
    z.object({
      decision: z.enum(["accept", "reject", "reopen"], { error: "The decision is accept, reject or reopen." }),
      comment: optionalText(2000, "The comment"),
      reason: optionalText(2000, "The reason"),
    }),
  )
  .superRefine((r, ctx) => {
    if (r.decision === "reject" && !r.comment) ctx.addIssue({ code: "custom", path: ["comment"], message: "Say why the build is rejected." });
  });
export type BuildReviewInput = z.output<typeof buildReviewInputSchema>;

/** The reason alone, as the service checks it when the build is flagged: trimmed and not empty. */
export const acceptReasonSchema = z
  .string({ error: REASON_REQUIRED_MESSAGE })
  .trim()
  .min(1, REASON_REQUIRED_MESSAGE)
  .max(2000, "The reason takes at most 2000 characters.");

export const flagAcknowledgeSchema = z.object({ flagId: idSchema });

export const buildFollowSchema = z.object({ buildId: idSchema, following: booleanField });
export const projectFollowSchema = z.object({ projectId: idSchema, following: booleanField });

/** Log the retune suggestion as a planned tweak; the series the new part comes from (default E12). */
export const retunePlanSchema = z.object({
  buildId: idSchema,
  series: z.preprocess((v) => (v === "" || v === null ? undefined : v), z.enum(E_SERIES_NAMES as [string, ...string[]], { error: `The series is one of ${E_SERIES_NAMES.join(", ")}.` }).optional()),
});

/** `?verdict=&status=&from=&to=` of a runs table, for its CSV export (no paging: the file holds every row). */
export const runExportQuerySchema = runListQuerySchema.omit({ cursor: true, limit: true });

const listOf = <T extends string>(values: readonly T[], label: string) =>
  z.preprocess(
    (v) => (typeof v === "string" ? (v.trim() === "" ? undefined : v.split(",").map((s) => s.trim())) : v),
    z.array(z.enum(values as [T, ...T[]], { error: `${label} is one of ${values.join(", ")}.` })).optional(),
  );

/** `?q=&state=&kind=&sort=&dir=&page=&pageSize=` of the project and design pages' build tables. */
export const buildTableQuerySchema = z.object({
  q: optionalText(200, "The search"),
  state: listOf(BUILD_STATES, "The state"),
  kind: z.preprocess((v) => (v === "" ? undefined : v), z.enum(BUILD_KINDS, { error: `The kind is one of ${BUILD_KINDS.join(", ")}.` }).optional()),
  sort: z.preprocess((v) => (v === "" ? undefined : v), z.enum(BUILD_TABLE_SORTS, { error: `Sort by one of ${BUILD_TABLE_SORTS.join(", ")}.` }).optional()),
  dir: z.preprocess((v) => (v === "" ? undefined : v), z.enum(["asc", "desc"], { error: "The direction is asc or desc." }).optional()),
  page: optionalNumberField("page", { min: 1 }).transform((v) => (v === undefined ? undefined : Math.floor(v))),
  pageSize: optionalNumberField("pageSize", { min: 1, max: 200 }).transform((v) => (v === undefined ? undefined : Math.floor(v))),
});
export type BuildTableQuery = z.output<typeof buildTableQuerySchema>;
