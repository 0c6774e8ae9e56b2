import { isIP } from "node:net";

/**
 * The client's address as the nearest proxy saw it: the last entry of X-Forwarded-For (Next adds the
 * socket address there when no proxy did), else X-Real-IP. Used for throttling and the audit log.
 * Deploy behind a proxy that appends to X-Forwarded-For; a bare `next start` keeps whatever the client sent.
 * @returns the address, or null when none is known or it is not an IP address
 */
export function clientIp(headers: Headers): string | null {
  const forwarded = headers.get("x-forwarded-for");
  const candidate = forwarded ? forwarded.split(",").at(-1)?.trim() : headers.get("x-real-ip")?.trim();
  if (!candidate) return null;
  const plain = candidate.startsWith("::ffff:") && isIP(candidate.slice(7)) === 4 ? candidate.slice(7) : candidate;
  return isIP(plain) ? plain : null;
}
