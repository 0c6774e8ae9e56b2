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
