import "server-only";
import { authenticateRequest, isReadMethod } from "@/lib/auth/authenticate-request";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { requirePermission } from "@/lib/auth/require-permission";
import type { Action } from "@/lib/auth/permissions";
import { countApiWrite } from "@/db/queries/api-write-counts";
import { env } from "@/lib/env";
import { TooManyRequestsError } from "@/lib/errors";
import { problemFromError } from "./problem";

/** A runaway bench script must not flood the logbook: writes are limited per user and minute. */
async function limitWrites(request: Request, user: CurrentUser | null): Promise<void> {
  if (!user || isReadMethod(request.method)) return;
  const limit = env().API_WRITES_PER_MINUTE;
  const { count, windowStart } = await countApiWrite(user.id);
  if (count > limit) {
    const retryAfterSeconds = Math.max(1, Math.ceil((windowStart.getTime() + 60_000 - Date.now()) / 1000));
    throw new TooManyRequestsError(
      `Too many writes: at most ${limit} a minute through the API. Try again in ${retryAfterSeconds} s.`,
      retryAfterSeconds,
    );
  }
}

/** Largest unread request body still read to its end after a refusal. */
const DRAIN_LIMIT_BYTES = 1024 * 1024;

/**
 * A refusal made before the body was read (401, 403, 415, 429…) first reads a small body to its end and drops
 * it: answering earlier lets the framework drop the unread body, which resets the connection under a client
 * that is still sending, and it never sees the answer.
 */
export async function discardUnreadBody(request: Request): Promise<void> {
  if (!request.body || request.bodyUsed) return;
  const length = Number(request.headers.get("content-length") ?? Number.NaN);
  if (!(length <= DRAIN_LIMIT_BYTES)) return;
  // Bounded in time as well, so a client that stops sending cannot hold its answer back for long.
  let timer: NodeJS.Timeout | undefined;
  await Promise.race([
    request.body.pipeTo(new WritableStream()).catch(() => undefined),
    new Promise<void>((resolve) => {
      timer = setTimeout(resolve, 2_000);
    }),
  ]);
  clearTimeout(timer);
}

/** The second argument Next passes a route handler; `params` is a promise in Next 15+. */
export interface RouteContext<P = Record<string, string | string[]>> {
  params: Promise<P>;
}

export interface ApiHandlerOptions {
  /** When set, the handler runs only for a user allowed this action (401/403 problem responses otherwise). */
  action?: Action;
}

/**
 * Wraps an /api/v1 route handler: authenticates the request (Bearer token or session cookie, with the Origin
 * check for cookie-authenticated writes), checks `options.action` through requirePermission, and maps anything
 * thrown (AppError, ZodError, the rest) to application/problem+json through problemFromError.
 * Without `options.action` the handler receives `null` for an anonymous request and decides itself.
 *
 * @example export const POST = apiHandler({ action: "run:upload" }, async (req, ctx, user) => Response.json(...));
 */
export function apiHandler<P = Record<string, string | string[]>>(
  options: ApiHandlerOptions & { action: Action },
  handler: (request: Request, context: RouteContext<P>, user: CurrentUser) => Promise<Response>,
): (request: Request, context: RouteContext<P>) => Promise<Response>;
export function apiHandler<P = Record<string, string | string[]>>(
  options: ApiHandlerOptions,
  handler: (request: Request, context: RouteContext<P>, user: CurrentUser | null) => Promise<Response>,
): (request: Request, context: RouteContext<P>) => Promise<Response>;
export function apiHandler<P>(
  options: ApiHandlerOptions,
  handler: (request: Request, context: RouteContext<P>, user: CurrentUser) => Promise<Response>,
) {
  return async (request: Request, context: RouteContext<P>): Promise<Response> => {
    try {
      const user = await authenticateRequest(request);
      const allowed = options.action ? requirePermission(user, options.action) : user;
      await limitWrites(request, allowed);
      const response = await handler(request, context, allowed as CurrentUser);
      if (!response.headers.has("cache-control")) response.headers.set("cache-control", "no-store");
      return response;
    } catch (err) {
      await discardUnreadBody(request);
      return problemFromError(err);
    }
  };
}
