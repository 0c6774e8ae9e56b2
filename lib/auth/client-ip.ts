import { isIP } from "node:net";

/**
 * Which X-Forwarded-For entries are believed (the TRUST_PROXY setting):
 * - `{ kind: "none" }` (the default, TRUST_PROXY unset, empty, `false` or `0`): none; the address is the socket's.
 * - `{ kind: "hops", hops }` (TRUST_PROXY=2): that many proxies sit in front, each appending the address it saw.
 * - `{ kind: "list", addresses }` (TRUST_PROXY=10.0.0.5,10.0.0.6): proxies by address; entries they added are
 *   believed, the first address from the right that is not one of them is the client.
 * A client can write anything into X-Forwarded-For, so believing it without a proxy in front lets anyone pick
 * the address the throttle counts and the audit log records (OWASP Authentication Cheat Sheet; RFC 7239 §8.3).
 */
export type TrustProxy = { kind: "none" } | { kind: "hops"; hops: number } | { kind: "list"; addresses: Set<string> };

/** Reads TRUST_PROXY (see TrustProxy). */
export function parseTrustProxy(value: string | undefined): TrustProxy {
  const text = (value ?? "").trim();
  if (text === "" || text === "false" || text === "0") return { kind: "none" };
  if (/^\d+$/.test(text)) return { kind: "hops", hops: Number(text) };
  const addresses = new Set(text.split(",").map((a) => plainIp(a.trim())).filter((a): a is string => a !== null));
  return addresses.size > 0 ? { kind: "list", addresses } : { kind: "none" };
}

function plainIp(candidate: string | undefined): string | null {
  if (!candidate) return null;
  const plain = candidate.startsWith("::ffff:") && isIP(candidate.slice(7)) === 4 ? candidate.slice(7) : candidate;
  return isIP(plain) ? plain : null;
}

/** The header scripts/lib/peer-address.mjs writes the socket address into, when the app was started with it. */
function peerHeaderName(): string | null {
  const name = (globalThis as Record<symbol, unknown>)[Symbol.for("tankbook.peerAddressHeader")];
  return typeof name === "string" ? name : null;
}

/**
 * The client's address for throttling and the audit log: the socket's peer, and X-Forwarded-For only as far as
 * TRUST_PROXY says (see TrustProxy).
 * @param peer the socket's address; by default the one the preload stamped on the request
 * @returns the address, or null when none is known (started without the preload) or it is not an IP address
 */
export function clientIp(headers: Headers, trust: TrustProxy = parseTrustProxy(process.env.TRUST_PROXY), peer: string | null = peerFrom(headers)): string | null {
  const socket = plainIp(peer ?? undefined);
  if (trust.kind === "none" || !socket) return socket;
  const forwarded = (headers.get("x-forwarded-for") ?? "")
    .split(",")
    .map((a) => a.trim())
    .filter(Boolean);
  // Nearest hop last: what each proxy appended, then the socket the last proxy connected from.
  const chain = [...forwarded, socket];
  if (trust.kind === "hops") {
    const at = Math.max(0, chain.length - 1 - trust.hops);
    return plainIp(chain[at]);
  }
  for (let i = chain.length - 1; i >= 0; i--) {
    const address = plainIp(chain[i]);
    if (address === null) return null;
    if (!trust.addresses.has(address) || i === 0) return address;
  }
  return null;
}

function peerFrom(headers: Headers): string | null {
  const name = peerHeaderName();
  return name ? headers.get(name) : null;
}
