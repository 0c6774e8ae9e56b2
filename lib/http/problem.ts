import { ZodError } from "zod";
import { AppError, TooManyRequestsError, UNAVAILABLE_MESSAGES, unavailableService } from "@/lib/errors";

const titles: Record<number, string> = {
  400: "Bad request",
  401: "Unauthorized",
  403: "Forbidden",
  404: "Not found",
  409: "Conflict",
  413: "Payload too large",
  415: "Unsupported media type",
  422: "Unprocessable content",
  429: "Too many requests",
  500: "Internal server error",
  503: "Service unavailable",
};

export interface ProblemBody {
  type: string;
  title: string;
  status: number;
  detail: string;
  fields?: Record<string, string[]>;
  [extra: string]: unknown;
}

/** An RFC 9457 problem response. */
export function problem(status: number, detail: string, extra: Partial<ProblemBody> = {}, headers: HeadersInit = {}): Response {
  const body: ProblemBody = {
    type: `https://tankbook.test/problems/${extra.type ?? titles[status]?.toLowerCase().replace(/ /g, "-") ?? "error"}`,
    title: titles[status] ?? "Error",
    status,
    detail,
    ...extra,
  };
  if (extra.type) body.type = `https://tankbook.test/problems/${extra.type}`;
  return new Response(JSON.stringify(body), {
    status,
    headers: { "content-type": "application/problem+json", "cache-control": "no-store", ...headers },
  });
}

/** Field list of a zod failure, keyed by dotted path: short messages, not raw issues. */
export function zodFields(error: ZodError): Record<string, string[]> {
  const fields: Record<string, string[]> = {};
  for (const issue of error.issues) {
    const key = issue.path.join(".") || "(body)";
    (fields[key] ??= []).push(issue.message);
  }
  return fields;
}

/** Maps anything a handler threw to a problem response; unknown errors become a 500 with no detail. */
export function problemFromError(err: unknown): Response {
  if (err instanceof ZodError) {
    const fields = zodFields(err);
    const detail = Object.entries(fields)
      .map(([k, v]) => `${k}: ${v.join("; ")}`)
      .join(" · ");
    return problem(400, detail || "The request is not valid.", { type: "validation", fields });
  }
  if (err instanceof AppError) {
    const headers: Record<string, string> = {};
    if (err instanceof TooManyRequestsError) headers["retry-after"] = String(err.retryAfterSeconds);
    return problem(err.status, err.message, { type: err.type, ...(err.fields ? { fields: err.fields } : {}) }, headers);
  }
  const unavailable = unavailableService(err);
  if (unavailable) {
    // A storage or database outage is not a bug: one line in the log, and a retryable answer for the client.
    console.error(`route handler: ${unavailable} unavailable: ${err instanceof Error ? err.message : String(err)}`);
    return problem(503, UNAVAILABLE_MESSAGES[unavailable], { type: `${unavailable}-unavailable` }, { "retry-after": "30" });
  }
  console.error("unhandled error in a route handler:", err);
  return problem(500, "Something failed on the server. Nothing you had stored was changed.");
}
