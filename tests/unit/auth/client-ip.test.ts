import { describe, expect, it } from "vitest";
import { clientIp, parseTrustProxy } from "@/lib/auth/client-ip";

// X-Forwarded-For is whatever the client wrote unless a proxy we trust added it (RFC 7239 §8.3; OWASP
// Authentication Cheat Sheet): by default only the socket's address counts.

const none = parseTrustProxy(undefined);

describe("clientIp", () => {
  it("ignores X-Forwarded-For and X-Real-IP by default: the socket's address is the client", () => {
    const headers = new Headers({ "x-forwarded-for": "203.0.113.9, 198.51.100.7", "x-real-ip": "192.0.2.4" });
    expect(clientIp(headers, none, "127.0.0.1")).toBe("127.0.0.1");
    expect(parseTrustProxy("")).toEqual({ kind: "none" });
    expect(parseTrustProxy("false")).toEqual({ kind: "none" });
  });

  it("with a hop count, takes the entry that many proxies from the socket", () => {
    const headers = new Headers({ "x-forwarded-for": "203.0.113.9, 198.51.100.7" });
    expect(clientIp(headers, parseTrustProxy("1"), "10.0.0.2")).toBe("198.51.100.7");
    expect(clientIp(headers, parseTrustProxy("2"), "10.0.0.2")).toBe("203.0.113.9");
    // More hops than entries: the leftmost, not an out-of-range read.
    expect(clientIp(headers, parseTrustProxy("9"), "10.0.0.2")).toBe("203.0.113.9");
  });

  it("with a list of proxies, believes only what they added and never a forged entry behind an untrusted peer", () => {
    const trust = parseTrustProxy("10.0.0.2, 10.0.0.3");
    const headers = new Headers({ "x-forwarded-for": "203.0.113.9, 198.51.100.7, 10.0.0.3" });
    expect(clientIp(headers, trust, "10.0.0.2")).toBe("198.51.100.7");
    // The peer itself is no proxy of ours: what it claims is ignored.
    expect(clientIp(headers, trust, "192.0.2.50")).toBe("192.0.2.50");
  });

  it("unwraps an IPv4-mapped IPv6 address, keeps plain IPv6 and returns null for nothing or garbage", () => {
    expect(clientIp(new Headers(), none, "::ffff:127.0.0.1")).toBe("127.0.0.1");
    expect(clientIp(new Headers(), none, "2001:db8::1")).toBe("2001:db8::1");
    expect(clientIp(new Headers(), none, null)).toBeNull();
    expect(clientIp(new Headers({ "x-forwarded-for": "not-an-ip" }), parseTrustProxy("1"), "10.0.0.2")).toBeNull();
  });

  it("knows no address when the app runs without the peer-address preload", () => {
    expect(clientIp(new Headers({ "x-forwarded-for": "203.0.113.9" }), none)).toBeNull();
  });
});
