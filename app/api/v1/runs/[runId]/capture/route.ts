import { apiHandler } from "@/lib/http/api-handler";
import { getRunCaptureUrl } from "@/lib/logbook/runs";

export const dynamic = "force-dynamic";

type Params = { runId: string };

/** The raw capture, unchanged: 302 to a presigned GET (5 minutes) that downloads it under its original name. */
export const GET = apiHandler<Params>({ action: "read" }, async (_request, context, user) => {
  const { runId } = await context.params;
  const url = await getRunCaptureUrl(user, runId);
  return new Response(null, { status: 302, headers: { location: url } });
});
