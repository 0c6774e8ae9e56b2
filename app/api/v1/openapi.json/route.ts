import { openApiDocument } from "@/lib/openapi";

export const dynamic = "force-dynamic";

/** The OpenAPI 3.1 document of /api/v1: public (it describes the API, it holds no data). */
export function GET(): Response {
  return Response.json(openApiDocument(), {
    headers: { "cache-control": "public, max-age=300", "access-control-allow-origin": "*" },
  });
}
