import { discardUnreadBody, type RouteContext } from "@/lib/http/api-handler";
import { problemFromError } from "@/lib/http/problem";
import { BadRequestError } from "@/lib/errors";
import { readLimitedJson, refuseBadText, SIGNED_IN_JSON_LIMITS } from "@/lib/http/json-body";

// Small pieces the /api/v1 logbook handlers share.

/**
 * The JSON body of a request within the signed-in limits (lib/http/json-body.ts): size read as a stream, key
 * count and depth checked before parsing, no NUL or lone surrogate in any string. Not JSON is a 400, not a 500.
 */
export async function readJson(request: Request): Promise<unknown> {
  const type = request.headers.get("content-type") ?? "";
  if (!type.toLowerCase().includes("application/json")) {
    throw new BadRequestError("Send the body as JSON (Content-Type: application/json).");
  }
  return readLimitedJson(request, SIGNED_IN_JSON_LIMITS);
}

/** The query string as a plain object (repeated keys keep the last value). */
export function queryObject(request: Request): Record<string, string> {
  const query = Object.fromEntries(new URL(request.url).searchParams.entries());
  refuseBadText(query, "the query string");
  return query;
}

/** 201 Created with a Location header pointing at the new resource. */
export function created(body: unknown, location: string): Response {
  return Response.json(body, { status: 201, headers: { location } });
}

/**
 * Wraps a read-only /api/v1 handler that authenticates inside its own service call, so the caller's token lookup
 * and the data come in one statement (authenticateRequestWith in lib/auth; the service makes the permission check
 * through requirePermission). Errors map to problem+json and answers are not cached, as with apiHandler, which
 * authenticates before the handler and so cannot join the lookup to the handler's query.
 */
export function apiReadHandler<P>(handler: (request: Request, context: RouteContext<P>) => Promise<Response>) {
  return async (request: Request, context: RouteContext<P>): Promise<Response> => {
    try {
      const response = await handler(request, context);
      if (!response.headers.has("cache-control")) response.headers.set("cache-control", "no-store");
      return response;
    } catch (err) {
      await discardUnreadBody(request);
      return problemFromError(err);
    }
  };
}
