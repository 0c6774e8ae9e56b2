import "server-only";
import { authenticateRequest } from "@/lib/auth/authenticate-request";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { requirePermission } from "@/lib/auth/require-permission";
import type { Action } from "@/lib/auth/permissions";
import { problemFromError } from "./problem";

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
      const response = await handler(request, context, allowed as CurrentUser);
      if (!response.headers.has("cache-control")) response.headers.set("cache-control", "no-store");
      return response;
    } catch (err) {
      return problemFromError(err);
    }
  };
}
