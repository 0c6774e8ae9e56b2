import { describe, expect, it } from "vitest";
import { clientIp } from "@/lib/auth/client-ip";

describe("clientIp", () => {
  it("takes the last X-Forwarded-For entry, the one the nearest proxy added", () => {
    expect(clientIp(new Headers({ "x-forwarded-for": "203.0.113.9, 198.51.100.7" }))).toBe("198.51.100.7");
  });

  it("unwraps an IPv4-mapped IPv6 address and keeps plain IPv6", () => {
    expect(clientIp(new Headers({ "x-forwarded-for": "::ffff:127.0.0.1" }))).toBe("127.0.0.1");
    expect(clientIp(new Headers({ "x-forwarded-for": "2001:db8::1" }))).toBe("2001:db8::1");
  });

  it("falls back to X-Real-IP and returns null for nothing or garbage", () => {
    expect(clientIp(new Headers({ "x-real-ip": "192.0.2.4" }))).toBe("192.0.2.4");
    expect(clientIp(new Headers())).toBeNull();
    expect(clientIp(new Headers({ "x-forwarded-for": "not-an-ip" }))).toBeNull();
  });
});
