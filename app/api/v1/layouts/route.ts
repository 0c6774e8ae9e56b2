import { apiHandler } from "@/lib/http/api-handler";
import { queryObject } from "@/lib/logbook/http";
import { listLayoutFigures } from "@/lib/logbook/layouts";
import { layoutFigureJson } from "@/lib/logbook/layouts-json";
import type { Topology } from "@/lib/oscillator/design";
import { layoutsQuerySchema } from "@/lib/validations/layouts";

export const dynamic = "force-dynamic";

/** The lab's layout figures per construction and topology: `{items}`; `?kind=&topology=`. */
export const GET = apiHandler({ action: "read" }, async (request, _context, user) => {
  const query = layoutsQuerySchema.parse(queryObject(request));
  const figures = await listLayoutFigures(user, { kind: query.kind, topology: query.topology as Topology | undefined });
  return Response.json({ items: figures.map(layoutFigureJson) });
});
