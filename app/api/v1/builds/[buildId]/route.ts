import { apiHandler } from "@/lib/http/api-handler";
import { buildJson, flagJson, tweakJson } from "@/lib/logbook/api-json";
import { getBuildDetailForRequest, setBuildTimebase } from "@/lib/logbook/builds";
import { apiReadHandler, readJson } from "@/lib/logbook/http";
import { BadRequestError } from "@/lib/errors";
import { timebaseInputSchema } from "@/lib/validations/timebase";

export const dynamic = "force-dynamic";

type Params = { buildId: string };

/** A build: as-built parts, the prediction for them, its tweaks (oldest first) and open flags. */
export const GET = apiReadHandler<Params>(async (request, context) => {
  const { buildId } = await context.params;
  const { detail, prediction, predictionError } = await getBuildDetailForRequest(request, buildId);
  return Response.json({
    ...buildJson(detail.build, prediction),
    topology: detail.topology,
    predictionError,
    tweaks: detail.tweaks.map(tweakJson),
    openFlags: detail.openFlags.map(flagJson),
  });
});

/**
 * Sets the accuracy of the scope's timebase on this build's bench (technician and above): `{timebasePpm: 25}`, or
 * `{timebasePpm: null}` to clear it. Absolute frequencies of the build's runs then carry it in their uncertainty.
 */
export const PATCH = apiHandler<Params>({ action: "build:create" }, async (request, context, user) => {
  const { buildId } = await context.params;
  const body = await readJson(request);
  if (body === null || typeof body !== "object" || Array.isArray(body) || !("timebasePpm" in body) || Object.keys(body).length !== 1) {
    throw new BadRequestError("Send {\"timebasePpm\": number or null}: the scope timebase accuracy in ppm is the one field a build can change here.", {
      timebasePpm: ["required"],
    });
  }
  const { timebasePpm } = timebaseInputSchema.parse(body);
  const build = await setBuildTimebase({ user }, buildId, timebasePpm);
  return Response.json(buildJson(build));
});
