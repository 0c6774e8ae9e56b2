import { BadRequestError } from "@/lib/errors";

// Small pieces the /api/v1 logbook handlers share.

/** The JSON body of a request; a body that is not JSON is a 400, not a 500. */
export async function readJson(request: Request): Promise<unknown> {
  const type = request.headers.get("content-type") ?? "";
  if (!type.toLowerCase().includes("application/json")) {
    throw new BadRequestError("Send the body as JSON (Content-Type: application/json).");
  }
  try {
    return await request.json();
  } catch {
    throw new BadRequestError("The body is not valid JSON.");
  }
}

/** The query string as a plain object (repeated keys keep the last value). */
export function queryObject(request: Request): Record<string, string> {
  return Object.fromEntries(new URL(request.url).searchParams.entries());
}

/** 201 Created with a Location header pointing at the new resource. */
export function created(body: unknown, location: string): Response {
  return Response.json(body, { status: 201, headers: { location } });
}
