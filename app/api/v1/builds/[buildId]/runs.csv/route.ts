import { getBuild } from "@/db/queries/builds";
import { iterateRunsForExport } from "@/db/queries/exports";
import { NotFoundError } from "@/lib/errors";
import { runsCsvFilename, runsCsvHeader, runsCsvRows } from "@/lib/exports/runs-csv";
import { apiHandler } from "@/lib/http/api-handler";
import { isId } from "@/lib/logbook/context";
import { queryObject } from "@/lib/logbook/http";
import { runExportQuerySchema } from "@/lib/validations/review";

export const dynamic = "force-dynamic";

type Params = { buildId: string };

/**
 * The build's runs table as CSV (every row that matches, newest first): the same filters as
 * GET /api/v1/builds/{id}/runs — `?verdict=pass|fail|none&status=&from=&to=` (ISO 8601) — without paging.
 * SI units in the headers, ISO 8601 UTC times, formula-looking text cells prefixed with a quote. Streams in batches.
 */
export const GET = apiHandler<Params>({ action: "read" }, async (request, context) => {
  const { buildId } = await context.params;
  const filter = runExportQuerySchema.parse(queryObject(request));
  const build = isId(buildId) ? await getBuild(buildId) : null;
  if (!build) throw new NotFoundError("The build");

  const encoder = new TextEncoder();
  const batches = iterateRunsForExport(buildId, filter);
  // The first batch is read before the 200 goes out, so a filter the database refuses is still a problem answer
  // rather than a file cut off after its header.
  const first = await batches.next();
  const body = new ReadableStream<Uint8Array>({
    start(controller) {
      controller.enqueue(encoder.encode(runsCsvHeader()));
      if (first.done) controller.close();
      else controller.enqueue(encoder.encode(runsCsvRows(first.value)));
    },
    async pull(controller) {
      try {
        const next = await batches.next();
        if (next.done) controller.close();
        else controller.enqueue(encoder.encode(runsCsvRows(next.value)));
      } catch (err) {
        // Headers are gone by now; a cut-off file is the only honest signal left, and the log says why.
        console.error(`runs CSV export of build ${buildId} failed:`, err);
        controller.error(err);
      }
    },
    async cancel() {
      await batches.return(undefined);
    },
  });
  const filename = runsCsvFilename(build.label, new Date());
  return new Response(body, {
    headers: {
      "content-type": "text/csv; charset=utf-8; header=present",
      "content-disposition": `attachment; filename="${filename}"`,
      "x-content-type-options": "nosniff",
    },
  });
});
