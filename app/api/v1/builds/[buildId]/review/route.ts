import { clientIp } from "@/lib/auth/client-ip";
import { apiHandler } from "@/lib/http/api-handler";
import { buildJson } from "@/lib/logbook/api-json";
import { readJson } from "@/lib/logbook/http";
import { reviewBuild } from "@/lib/logbook/review";
import { buildReviewInputSchema } from "@/lib/validations/review";

export const dynamic = "force-dynamic";

type Params = { buildId: string };

/**
 * Sign a build off (engineer and above): JSON `{decision: "accept"|"reject"|"reopen", comment?, reason?}`.
 * Rejecting needs a comment; accepting a build whose latest analysed run is flagged needs a reason (400 with
 * `fields.reason` otherwise). 200 `{build, signOff: {reason, runId}, flaggedRules}`; the decision is audited.
 */
export const POST = apiHandler<Params>({ action: "build:review" }, async (request, context, user) => {
  const { buildId } = await context.params;
  const input = buildReviewInputSchema.parse(await readJson(request));
  const out = await reviewBuild(user, { buildId, ...input }, { ip: clientIp(request.headers) });
  return Response.json({ build: buildJson(out.build), signOff: out.basis, flaggedRules: out.flaggedRules });
});
