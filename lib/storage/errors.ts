/** What went wrong talking to object storage, so callers can pick an HTTP status without parsing text. */
export type StorageErrorKind = "unreachable" | "no-bucket" | "not-found" | "denied" | "failed";

/** A failed object-storage call, with a message a person can act on (it names the endpoint, bucket or key). */
export class StorageError extends Error {
  override name = "StorageError";
  constructor(
    readonly kind: StorageErrorKind,
    message: string,
    options?: { cause?: unknown },
  ) {
    super(message, options);
  }
}

const NETWORK_CODES = new Set(["ECONNREFUSED", "ECONNRESET", "ENOTFOUND", "EHOSTUNREACH", "ENETUNREACH", "ETIMEDOUT", "EAI_AGAIN", "EPIPE"]);

function isNetworkError(err: unknown): boolean {
  if (!(err instanceof Error)) return false;
  const code = (err as NodeJS.ErrnoException).code;
  if (code && NETWORK_CODES.has(code)) return true;
  if (err.name === "TimeoutError" || err.name === "AbortError") return true;
  // Node's happy-eyeballs connect wraps one error per address tried.
  if (err instanceof AggregateError) return err.errors.some(isNetworkError);
  return err.cause !== undefined && isNetworkError(err.cause);
}

/**
 * Translate an AWS SDK or socket error into a {@link StorageError}.
 * @param action what we were doing, e.g. `get "captures/2026/01/x.csv"`
 */
export function toStorageError(err: unknown, action: string, where: { endpoint: string; bucket: string }): StorageError {
  if (err instanceof StorageError) return err;
  if (isNetworkError(err)) {
    return new StorageError("unreachable", `Object storage is unreachable at ${where.endpoint} (${action})`, { cause: err });
  }
  const name = err instanceof Error ? err.name : "";
  const status = (err as { $metadata?: { httpStatusCode?: number } })?.$metadata?.httpStatusCode;
  if (name === "NoSuchBucket") {
    return new StorageError("no-bucket", `Bucket "${where.bucket}" does not exist at ${where.endpoint} (${action})`, { cause: err });
  }
  if (name === "NoSuchKey" || name === "NotFound" || status === 404) {
    return new StorageError("not-found", `No such object in bucket "${where.bucket}" (${action})`, { cause: err });
  }
  if (["AccessDenied", "InvalidAccessKeyId", "SignatureDoesNotMatch", "Forbidden"].includes(name) || status === 403) {
    return new StorageError(
      "denied",
      `Object storage at ${where.endpoint} refused the credentials for bucket "${where.bucket}" (${action}); check S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY`,
      { cause: err },
    );
  }
  const detail = err instanceof Error ? `${err.name}: ${err.message}` : String(err);
  return new StorageError("failed", `Object storage ${action} failed at ${where.endpoint}: ${detail}`, { cause: err });
}
