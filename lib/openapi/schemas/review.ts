import { z } from "zod";
import { documented } from "../documented";
import { rowId } from "./common";
import { buildSchema } from "./build";

export const reviewOutcomeSchema = documented(
  z.object({
    build: buildSchema,
    signOff: z
      .object({
        reason: z.string().nullable().describe("Why a flagged build was accepted anyway."),
        runId: rowId.nullable().describe("The latest analysed run the decision was based on."),
      })
      .describe("What the decision was based on."),
    flaggedRules: z.array(z.string()).describe("Rules the latest analysed run failed when the decision was made."),
  }),
  { refId: "ReviewOutcome" },
);

export const buildFollowSchema = documented(
  z.object({
    following: z.boolean(),
    via: z.enum(["build", "project", "maker"]).nullable().describe("Why you follow it: the build itself, its project, or as its maker."),
    followsProject: z.boolean(),
    isMaker: z.boolean().describe("You created or built it (makers follow by default)."),
  }),
  { refId: "BuildFollow", description: "Whether you get the build's flags by e-mail, and why." },
);

export const projectFollowSchema = documented(z.object({ following: z.boolean() }), { refId: "ProjectFollow" });

const bandSchema = z.object({ minHz: z.number(), maxHz: z.number() }).loose();

export const retuneSuggestionSchema = documented(
  z
    .object({
      part: z.string().describe("The part to change."),
      unit: z.enum(["F", "H"]),
      fromSi: z.number(),
      toSi: z.number().describe("The standard value to fit, SI units."),
      fromF: z.number().nullable(),
      toF: z.number().nullable(),
      fromH: z.number().nullable(),
      toH: z.number().nullable(),
      idealSi: z.number().nullable().describe("The exact value that would hit the target; null if none can."),
      changed: z.boolean().describe("False when the current value is already the closest choice."),
      targetHz: z.number(),
      predictedHz: z.number().describe("Predicted frequency after the change, Hz."),
      errorHz: z.number(),
      errorPercent: z.number(),
      feedbackFraction: z.number().nullable().describe("Feedback fraction β after the change; null for a bare tank."),
      minGain: z.number().nullable().describe("Minimum amplifier gain to start after the change, 1/β."),
      feedbackFractionBefore: z.number().nullable().describe("β with the present values."),
      minGainBefore: z.number().nullable().describe("Minimum gain to start with the present values."),
      startupWarning: z.string().nullable().describe("Set when the change raises the minimum gain to start by more than 5 %: less start-up margin."),
      currentHz: z.number().describe("f0 with the present values, the measurement's implied capacitance included, Hz."),
      onTarget: z.boolean().describe("True when the build is already within the spec's frequency tolerance: no tweak needed."),
      reachable: z.boolean().describe("False when no single part change within three decades and the bench limits reaches the target."),
      nearestReachableHz: z.number().nullable().describe("The reachable frequency nearest the target when it cannot be reached, Hz; null when it can."),
      reachableBand: bandSchema.describe("The span of f0 the parts considered can reach."),
      unreachableReason: z.string().nullable().describe("Why the target cannot be reached, in words."),
      series: z.string().describe("The E-series the value comes from."),
      calibrationCapacitanceF: z.number().describe("The signed capacitance taken from the measurement, F."),
      worstCase: bandSchema,
      statistical: bandSchema,
    })
    .loose(),
  { refId: "RetuneSuggestion" },
);

export const retuneSchema = documented(
  z.object({
    runId: rowId.nullable().describe("The analysed run the suggestion is computed from; null when there is none."),
    suggestion: retuneSuggestionSchema.nullable(),
    trustWarnings: z.array(z.string()).describe("The run's trust warnings: the suggestion rests on a capture that may not be trusted when any are listed."),
  }),
  { refId: "Retune" },
);
