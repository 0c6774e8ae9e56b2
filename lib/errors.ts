// Domain errors with the HTTP status they map to. Route handlers turn them into problem+json
// (lib/http/problem.ts); server actions turn them into a message on the form.

export class AppError extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly type: string,
    readonly fields?: Record<string, string[]>,
  ) {
    super(message);
    this.name = new.target.name;
  }
}

export class BadRequestError extends AppError {
  constructor(message: string, fields?: Record<string, string[]>) {
    super(message, 400, "bad-request", fields);
  }
}

export class UnauthorizedError extends AppError {
  constructor(message = "Sign in first, or send a valid API token.") {
    super(message, 401, "unauthorized");
  }
}

export class ForbiddenError extends AppError {
  constructor(message: string) {
    super(message, 403, "forbidden");
  }
}

export class NotFoundError extends AppError {
  constructor(what: string) {
    super(`${what} was not found.`, 404, "not-found");
  }
}

export class ConflictError extends AppError {
  constructor(message: string, readonly existingId?: string) {
    super(message, 409, "conflict");
  }
}

export class PayloadTooLargeError extends AppError {
  constructor(message: string) {
    super(message, 413, "payload-too-large");
  }
}

export class UnsupportedMediaTypeError extends AppError {
  constructor(message: string) {
    super(message, 415, "unsupported-media-type");
  }
}

export class TooManyRequestsError extends AppError {
  constructor(message: string, readonly retryAfterSeconds: number) {
    super(message, 429, "too-many-requests");
  }
}

/** A backing service the request needed and could not reach; the request may simply be tried again. */
export type UnavailableService = "storage" | "database";

// PostgreSQL's "connection exception" class (08) and the shutdown / not-yet-started codes (57P01–57P03).
const PG_UNAVAILABLE_CODES = new Set(["08000", "08001", "08003", "08004", "08006", "57P01", "57P02", "57P03"]);
const SOCKET_CODES = new Set(["ECONNREFUSED", "ECONNRESET", "EPIPE", "ETIMEDOUT", "EHOSTUNREACH", "ENETUNREACH", "EAI_AGAIN"]);

function looksLikeLostDatabase(err: unknown, depth = 0): boolean {
  if (!(err instanceof Error) || depth > 3) return false;
  const code = (err as { code?: unknown }).code;
  if (typeof code === "string" && (PG_UNAVAILABLE_CODES.has(code) || SOCKET_CODES.has(code))) return true;
  // node-postgres and knex say these in words only.
  if (/^Connection terminated|^Knex: Timeout acquiring a connection/.test(err.message)) return true;
  if (err instanceof AggregateError) return err.errors.some((e) => looksLikeLostDatabase(e, depth + 1));
  return looksLikeLostDatabase(err.cause, depth + 1);
}

/**
 * Which service an error says is out of reach: object storage (a StorageError of kind "unreachable") or the
 * database (a refused or dropped PostgreSQL connection, or a shutting-down server). Route handlers answer these
 * with 503 and Retry-After, server actions with a plain sentence, instead of a bare 500.
 * @returns the service, or null for any other error
 */
export function unavailableService(err: unknown): UnavailableService | null {
  if (err instanceof Error && err.name === "StorageError") return (err as { kind?: string }).kind === "unreachable" ? "storage" : null;
  return looksLikeLostDatabase(err) ? "database" : null;
}

/** What the person is told when {@link unavailableService} names a service. */
export const UNAVAILABLE_MESSAGES: Record<UnavailableService, string> = {
  storage: "File storage is not answering just now, so nothing was stored. Try again in a minute.",
  database: "The database is not answering just now, so nothing was changed. Try again in a minute.",
};
