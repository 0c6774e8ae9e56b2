/** A failed mail call, with a message that names the server it was talking to. */
export class MailError extends Error {
  override name = "MailError";
  constructor(
    readonly kind: "unreachable" | "rejected" | "failed",
    message: string,
    options?: { cause?: unknown },
  ) {
    super(message, options);
  }
}

const NETWORK_CODES = new Set(["ECONNREFUSED", "ECONNRESET", "ENOTFOUND", "EHOSTUNREACH", "ENETUNREACH", "ETIMEDOUT", "EAI_AGAIN"]);

/**
 * Translate a nodemailer error into a {@link MailError}.
 * @param server e.g. "smtp://127.0.0.1:2525"
 */
export function toMailError(err: unknown, action: string, server: string): MailError {
  if (err instanceof MailError) return err;
  const e = err as { code?: string; responseCode?: number; message?: string; cause?: { code?: string } };
  // nodemailer reports refused/timed-out connections as ECONNECTION / ETIMEDOUT / ESOCKET with the socket code in the text.
  const socketCode = e.cause?.code ?? /\b(E[A-Z]+)\b/.exec(e.message ?? "")?.[1];
  if (e.code === "ECONNECTION" || e.code === "ETIMEDOUT" || e.code === "ESOCKET" || (socketCode && NETWORK_CODES.has(socketCode))) {
    return new MailError("unreachable", `Mail server is unreachable at ${server} (${action}): ${e.message ?? String(err)}`, { cause: err });
  }
  if (typeof e.responseCode === "number" && e.responseCode >= 400) {
    return new MailError("rejected", `Mail server at ${server} refused to ${action}: ${e.message ?? String(err)}`, { cause: err });
  }
  return new MailError("failed", `Could not ${action} through ${server}: ${e.message ?? String(err)}`, { cause: err });
}
