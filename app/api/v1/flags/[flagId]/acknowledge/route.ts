import { clientIp } from "@/lib/auth/client-ip";
import { apiHandler } from "@/lib/http/api-handler";
import { flagJson } from "@/lib/logbook/api-json";
import { acknowledgeFlag } from "@/lib/logbook/review";

export const dynamic = "force-dynamic";

type Params = { flagId: string };

/** Acknowledge a flag (engineer and above): 200 with the flag; 409 when it was already acknowledged. */
export const POST = apiHandler<Params>({ action: "flag:acknowledge" }, async (request, context, user) => {
  const { flagId } = await context.params;
  const flag = await acknowledgeFlag(user, { flagId }, { ip: clientIp(request.headers) });
  return Response.json(flagJson(flag));
});
