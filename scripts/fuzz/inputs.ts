// The fuzz campaign's inputs, by class: JSON bodies on every write, query strings on every list, path segments on
// the id routes and pages, hostile headers, multipart envelopes and CSV captures inside well-formed uploads.
// Everything is drawn from a seeded Random, so the same seed and index always give the same input.
import type { Random } from "./random";
import { INPUT_CLASSES, UNKNOWN_ID, caller, short, text, type CallerRef, type InputClass, type FixtureIds, type FuzzInput, type Method, type Role } from "./input-kit";
import { csvInput, multipartInput } from "./upload-inputs";

export { INPUT_CLASSES, UNKNOWN_ID, type CallerRef, type InputClass, type FixtureIds, type FuzzInput, type Method, type Role } from "./input-kit";
export { multipartBody, smallCapture } from "./upload-inputs";

/** Share of each class in a campaign (the slice in `npm test` keeps the same mix). */
export const CLASS_WEIGHTS: Record<InputClass, number> = { json: 30, query: 14, path: 15, headers: 15, multipart: 12, csv: 14 };

const KNOWN_KEYS = [
  "name", "purpose", "topology", "parts", "spec", "windings", "extraCapacitance", "changeNote", "label", "kind", "kindRevision", "builtBy",
  "partRef", "toValue", "note", "planned", "changes", "decision", "comment", "reason", "series", "buildId", "filename", "sizeBytes", "contentType",
  "channel", "probe", "supplyV", "temperatureC", "tweakId", "keepDuplicate", "email", "password", "role", "id", "createdBy", "timebasePpm",
  "targetHz", "toleranceValue", "toleranceUnit", "construction", "__proto__", "constructor", "prototype",
];

function jsonValue(r: Random, depth = 0): unknown {
  return r.weighted<() => unknown>([
    [5, () => text(r)],
    [2, () => r.pick([0, -1, 1, 2 ** 53 + 1, -(2 ** 31), 1e308, -1e308, 5e-324, 0.1, 411000, 500_000_001, 1e21, 3.5])],
    [1, () => r.pick([null, true, false])],
    [depth < 3 ? 1 : 0, () => Array.from({ length: r.int(0, 3) }, () => jsonValue(r, depth + 1))],
    [depth < 3 ? 1 : 0, () => jsonObject(r, depth + 1)],
  ])();
}

function jsonObject(r: Random, depth = 0): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (let i = r.int(0, 6); i > 0; i--) {
    const key = r.bool(0.8) ? r.pick(KNOWN_KEYS) : text(r);
    // defineProperty, so "__proto__" becomes an own key in the JSON text rather than a prototype change here.
    Object.defineProperty(out, key, { value: jsonValue(r, depth), enumerable: true, configurable: true, writable: true });
  }
  return out;
}

/** Bodies shaped like a design's, with the right keys and wrong values. */
function designBody(r: Random): unknown {
  const partKeys = ["L", "C", "C1", "C2", "C3", "L1", "L2", "X", "R1"];
  const parts: Record<string, unknown> = {};
  for (let i = r.int(0, 4); i > 0; i--) parts[r.pick(partKeys)] = r.bool(0.8) ? { value: r.pick(["100u", "2.2n", "4.7n", "1e-9", "-1n", "0", "1e30", text(r)]), tolerance: r.pick(["5%", "1%", "-5%", "200%", text(r)]) } : jsonValue(r);
  return {
    name: text(r),
    topology: r.pick(["colpitts", "hartley", "clapp", "tank", "pierce", "", "COLPITTS", text(r)]),
    parts,
    spec: r.bool(0.7) ? { targetHz: r.pick(["411k", "0", "-1", "1e30", text(r)]), toleranceValue: jsonValue(r), toleranceUnit: r.pick(["percent", "ppm", "hz", text(r)]) } : jsonValue(r),
  };
}

const RAW_BODIES = [
  "", "{", "}", "[[[[[[", '{"name": "x",}', "{'name': 'single quotes'}", '{"name": NaN}', '{"name": Infinity}', '{"name": "\\ud800"}',
  '{"name": "\\udc00"}', '{"note": "nul\\u0000"}', '{"name\\u0000": "key with nul"}', '{"__proto__": {"role": "admin", "isAdmin": true}}',
  '{"constructor": {"prototype": {"role": "admin"}}}', "\ufeff{}", "null", "0", "true", '"just a string"', "[]", "9".repeat(400),
  '{"a":1,"a":2}', '{"name":"x"}garbage', "\u0000", '{"changes":[],"note":"\\udc00"}', '{"sizeBytes": 1e400}',
];

/** Bodies too big to draw often: made by name when picked. */
const BIG_BODIES: Record<string, () => string> = {
  "300 KB name": () => `{"name": "${"z".repeat(300_000)}"}`,
  "array nested 5 000 deep": () => "[".repeat(5_000) + "]".repeat(5_000),
  "object nested 2 000 deep": () => `{"a":${'{"a":'.repeat(2_000)}1${"}".repeat(2_000)}}`,
  "5 000 keys": () => JSON.stringify(Object.fromEntries(Array.from({ length: 5_000 }, (_, i) => [`k${i}`, i]))),
  "3 000 parts": () => JSON.stringify({ name: "wide", topology: "tank", parts: Object.fromEntries(Array.from({ length: 3_000 }, (_, i) => [`C${i}`, { value: "1n" }])) }),
};

function jsonBodyText(r: Random): { text: string; label: string } {
  return r.weighted<() => { text: string; label: string }>([
    [5, () => ({ text: JSON.stringify(jsonObject(r)), label: "" })],
    [2, () => ({ text: JSON.stringify(designBody(r)), label: "" })],
    [2, () => ({ text: r.pick(RAW_BODIES), label: "" })],
    [1, () => ({ text: r.string(r.int(0, 200)), label: "" })],
    [0.25, () => {
      const name = r.pick(Object.keys(BIG_BODIES));
      return { text: BIG_BODIES[name](), label: name };
    }],
  ])();
}

/** encodeURIComponent, with lone surrogates (which it refuses) written as U+FFFD. */
export function safeEncode(value: string): string {
  return encodeURIComponent(value.replace(/[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/g, "\ufffd"));
}

interface Target {
  method: Method;
  path: string;
  role: Role | null;
}

function writeTargets(fx: FixtureIds): Target[] {
  return [
    { method: "POST", path: "/api/v1/projects", role: "engineer" },
    { method: "PATCH", path: `/api/v1/projects/${fx.projectId}`, role: "engineer" },
    { method: "POST", path: `/api/v1/projects/${fx.projectId}/designs`, role: "engineer" },
    { method: "PUT", path: `/api/v1/projects/${fx.projectId}/follow`, role: "viewer" },
    { method: "PATCH", path: `/api/v1/designs/${fx.designId}`, role: "engineer" },
    { method: "POST", path: `/api/v1/designs/${fx.designId}/builds`, role: "technician" },
    { method: "PATCH", path: `/api/v1/builds/${fx.buildId}`, role: "technician" },
    { method: "POST", path: `/api/v1/builds/${fx.buildId}/tweaks`, role: "technician" },
    { method: "POST", path: `/api/v1/builds/${fx.buildId}/tweaks/${fx.tweakId}/apply`, role: "technician" },
    { method: "POST", path: `/api/v1/builds/${fx.buildId}/review`, role: "engineer" },
    { method: "POST", path: `/api/v1/builds/${fx.buildId}/retune`, role: "technician" },
    { method: "PUT", path: `/api/v1/builds/${fx.buildId}/follow`, role: "viewer" },
    { method: "POST", path: `/api/v1/runs/${fx.runId}/withdrawal`, role: "engineer" },
    { method: "POST", path: `/api/v1/runs/${fx.runId}/reanalyse`, role: "engineer" },
    { method: "POST", path: `/api/v1/flags/${UNKNOWN_ID}/acknowledge`, role: "engineer" },
    { method: "POST", path: "/api/v1/uploads", role: "technician" },
    { method: "POST", path: `/api/v1/uploads/${UNKNOWN_ID}/complete`, role: "technician" },
    { method: "POST", path: "/api/v1/session", role: null },
  ];
}

function listTargets(fx: FixtureIds): string[] {
  return [
    "/api/v1/projects",
    `/api/v1/projects/${fx.projectId}/designs`,
    `/api/v1/designs/${fx.designId}/builds`,
    `/api/v1/designs/${fx.designId}/prediction`,
    `/api/v1/builds/${fx.buildId}/runs`,
    `/api/v1/builds/${fx.buildId}/runs.csv`,
    `/api/v1/builds/${fx.buildId}/tweaks`,
    `/api/v1/builds/${fx.buildId}/retune`,
    "/api/v1/builds/compare",
    "/api/v1/layouts",
    `/api/v1/runs/${fx.runId}/excerpt`,
    `/api/v1/runs/${fx.runId}/plot`,
    "/api/v1/me",
    "/api/health",
  ];
}

const QUERY_KEYS = ["cursor", "limit", "q", "verdict", "status", "from", "to", "kind", "topology", "series", "page", "sort", "ids", "construction", "start", "end", "channel", "points", "__proto__", "limit[]", "a[b]"];
const QUERY_VALUES = [
  "-1", "0", "1", "1e9", "201", "NaN", "2026-13-45", "9999-12-31T25:61:00Z", "-271821-04-20", "+275760-09-13", "2026-01-01", "pass", "fail", "none",
  "E12", "E999", "breadboard", "pcb", "colpitts", UNKNOWN_ID, `${UNKNOWN_ID},${UNKNOWN_ID}`, "eyJpZCI6IngifQ", "%00", "",
];

function queryString(r: Random, fx: FixtureIds): string {
  const pairs: string[] = [];
  for (let i = r.int(0, 5); i > 0; i--) {
    const key = r.bool(0.85) ? r.pick(QUERY_KEYS) : text(r);
    const value = r.weighted<() => string>([
      [4, () => r.pick(QUERY_VALUES)],
      [1, () => r.pick([fx.buildId, fx.runId, `${fx.buildId},${fx.buildId}`, `${fx.buildId},${UNKNOWN_ID},x`])],
      [3, () => text(r)],
      [1, () => String(r.int(-1e6, 1e6))],
    ])();
    // Now and then a raw, unencoded or half-encoded pair: what a careless client sends.
    pairs.push(r.bool(0.1) ? `${key.replace(/[^\x21-\x7e]/g, "")}=${r.pick(["%", "%zz", "%E0%A4%A", "a%2", "&&", "==", "%C0%AE"])}` : `${safeEncode(key)}=${safeEncode(value)}`);
  }
  return pairs.join(r.bool(0.9) ? "&" : ";");
}

const PATH_SEGMENTS = [
  "..%2F..%2Fetc%2Fpasswd", "%2e%2e%2f%2e%2e%2fetc%2fpasswd", "%00", "%2500", "captures%2F2026%2F01%2Fx.csv", "a".repeat(3000), "'%20OR%20'1'%3D'1",
  UNKNOWN_ID, UNKNOWN_ID.toUpperCase(), `${UNKNOWN_ID}%00`, "%E2%80%AE", "%EF%BF%BD", "%E0%A4%A", "%", "%ZZ", "%C0%AE%C0%AE", "%FF", "%ED%A0%80",
  "null", "undefined", "0", "-1", "1e9", "%20", "~", "%7B%7D", "__proto__", "constructor",
];

const ID_ROUTES = [
  { method: "GET" as Method, path: "/api/v1/runs/{}" },
  { method: "GET" as Method, path: "/api/v1/runs/{}/capture" },
  { method: "GET" as Method, path: "/api/v1/runs/{}/plot" },
  { method: "GET" as Method, path: "/api/v1/runs/{}/results.json" },
  { method: "GET" as Method, path: "/api/v1/runs/{}/excerpt" },
  { method: "GET" as Method, path: "/api/v1/builds/{}" },
  { method: "GET" as Method, path: "/api/v1/builds/{}/runs" },
  { method: "GET" as Method, path: "/api/v1/builds/{}/runs.csv" },
  { method: "GET" as Method, path: "/api/v1/builds/{}/sensitivity" },
  { method: "GET" as Method, path: "/api/v1/designs/{}" },
  { method: "GET" as Method, path: "/api/v1/designs/{}/prediction" },
  { method: "GET" as Method, path: "/api/v1/projects/{}" },
  { method: "GET" as Method, path: "/api/v1/builds/{}/follow" },
  { method: "DELETE" as Method, path: "/api/v1/builds/{}/follow" },
  { method: "DELETE" as Method, path: "/api/v1/runs/{}/withdrawal" },
  { method: "POST" as Method, path: "/api/v1/runs/{}/reanalyse" },
  { method: "GET" as Method, path: "/builds/{}" },
  { method: "GET" as Method, path: "/runs/{}" },
  { method: "GET" as Method, path: "/projects/{}" },
];

function segment(r: Random): string {
  return r.weighted<() => string>([
    [4, () => r.pick(PATH_SEGMENTS)],
    [3, () => safeEncode(text(r) || "x")],
    [2, () => safeEncode(r.string(r.int(1, 40)))],
    [1, () => safeEncode(r.bytes(r.int(1, 24)).toString("latin1"))],
  ])();
}

function jsonInput(r: Random, fx: FixtureIds, index: number): FuzzInput {
  const target = r.pick(writeTargets(fx));
  const body = jsonBodyText(r);
  const type = r.weighted<string>([
    [8, "application/json"],
    [1, "application/json; charset=utf-8"],
    [1, r.pick(["text/plain", "application/x-www-form-urlencoded", "application/xml", "application/json; charset=utf-16", "", "application/merge-patch+json"])],
  ]);
  return {
    index,
    class: "json",
    method: target.method,
    path: target.path,
    caller: target.role ? caller(r, target.role) : { auth: "none" },
    headers: type ? { "content-type": type } : {},
    body: Buffer.from(body.text, "utf8"),
    summary: `${target.method} ${target.path} (${type || "no type"}) ${body.label || short(body.text)}`,
  };
}

function queryInput(r: Random, fx: FixtureIds, index: number): FuzzInput {
  const path = `${r.pick(listTargets(fx))}?${queryString(r, fx)}`;
  return { index, class: "query", method: "GET", path, caller: caller(r, "viewer"), headers: {}, summary: `GET ${short(path, 240)}` };
}

function pathInput(r: Random, index: number): FuzzInput {
  const route = r.pick(ID_ROUTES);
  const path = route.path.replace("{}", segment(r));
  const role = route.method === "GET" || route.path.includes("follow") ? "viewer" : "engineer";
  return { index, class: "path", method: route.method, path, caller: caller(r, role), headers: {}, summary: `${route.method} ${short(path, 240)}` };
}

/** Header values a careless client or an attacker sends; none has CR or LF (no client library would send it). */
function headerInput(r: Random, fx: FixtureIds, index: number): FuzzInput {
  const headers: Record<string, string> = {};
  const kinds: string[] = [];
  let who: CallerRef = caller(r, "viewer");
  for (let i = r.int(1, 3); i > 0; i--) {
    const kind = r.pick(["authorization", "cookie", "forwarded", "content-type", "origin", "accept", "misc", "idempotency"]);
    kinds.push(kind);
    switch (kind) {
      case "authorization":
        who = { auth: "none" };
        headers.authorization = r.pick([
          "Bearer", "Bearer ", "bearer x", `Bearer ${"a".repeat(5000)}`, "Basic YWRtaW46YWRtaW4=", "Token abc", "Bearer tb_", "Bearer tb_00000000000000000000000000000000",
          "Bearer \u00ff\u00fe", "Bearer a b c", "Negotiate", "Bearer .....", `Bearer ${r.string(32, "abcdef0123456789_")}`, "BEARER  double-space",
        ]);
        break;
      case "cookie":
        who = r.bool(0.5) ? who : { auth: "none" };
        headers.cookie = r.pick([
          "auth_session=", "auth_session=garbage", `auth_session=${"x".repeat(4000)}`, "auth_session=%00", "auth_session=a; auth_session=b", "=;=;=",
          `a=${"b".repeat(3000)}`, "auth_session=../../etc/passwd", "auth_session=\"quoted\"",
        ]);
        break;
      case "forwarded":
        headers["x-forwarded-for"] = r.pick([
          "not-an-ip", "999.999.999.999", "::1", "fe80::1%eth0", "1.2.3.4, 5.6.7.8, evil", ",,,", "", Array.from({ length: 500 }, (_, i) => `10.0.${i % 250}.1`).join(", "),
          "127.0.0.1", "0.0.0.0", "[::ffff:127.0.0.1]", "2001:db8::1", "unknown", "_hidden",
        ]);
        if (r.bool(0.3)) headers.forwarded = r.pick(["for=1.2.3.4", 'for="[2001:db8::1]"', "for=unknown;proto=https", "garbage"]);
        break;
      case "content-type":
        headers["content-type"] = r.pick([
          "application/json; charset=utf-7", "multipart/form-data", "multipart/form-data; boundary=", `multipart/form-data; boundary=${"b".repeat(300)}`, "text/csv",
          "application/json, text/plain", ";;;", "application/*", "x/x; a=b; a=c",
        ]);
        break;
      case "origin":
        headers.origin = r.pick(["null", "http://evil.test", "https://127.0.0.1:3100", "file://", "http://127.0.0.1:3100.evil.test", ""]);
        break;
      case "accept":
        headers.accept = r.pick(["text/csv", "*/*;q=0", "application/xml", "image/png", "text/event-stream", "x".repeat(2000)]);
        if (r.bool(0.3)) headers["accept-encoding"] = r.pick(["br;q=2", "gzip;q=-1", "identity;q=0", "*;q=0"]);
        break;
      case "idempotency":
        headers["idempotency-key"] = r.pick(["", " ", "k".repeat(300), "\u00e9t\u00e9", "same-key-for-all", `key-${r.int(0, 5)}`]);
        break;
      default:
        headers[r.pick(["range", "if-none-match", "if-modified-since", "x-http-method-override", "x-middleware-subrequest", "x-nextjs-data", "rsc", "next-router-state-tree", "next-action", "user-agent", "referer", "expect"])] =
          r.pick(["bytes=0-0,-1", "bytes=999999999-", "*", "W/\"x\"", "Thu, 01 Jan 1970 00:00:00 GMT", "DELETE", "middleware:middleware:middleware:middleware:middleware", "1", "%7B%7D", "x".repeat(3000), "100-continue", "[\"\"]"]);
    }
  }
  const target = r.weighted<() => { method: Method; path: string; body?: Buffer }>([
    [3, () => ({ method: "GET", path: r.pick(listTargets(fx)) })],
    [2, () => ({ method: "GET", path: r.pick([`/api/v1/runs/${fx.runId}`, `/api/v1/runs/${fx.runId}/capture`, `/api/v1/builds/${fx.buildId}`, "/dashboard", "/profile", `/builds/${fx.buildId}`]) })],
    [2, () => {
      const t = r.pick(writeTargets(fx));
      return { method: t.method, path: t.path, body: Buffer.from(JSON.stringify(jsonObject(r))) };
    }],
  ])();
  // A header set by the campaign (the caller's) is not overwritten by a generated one of the same name.
  if (target.body && !headers["content-type"]) headers["content-type"] = "application/json";
  const printable = Object.entries(headers).map(([k, v]) => `${k}: ${short(v, 60)}`).join(" | ");
  return { index, class: "headers", method: target.method, path: target.path, caller: who, headers, body: target.body, summary: `${target.method} ${target.path} [${kinds.join(",")}] ${printable}` };
}

/** The `index`th input of the campaign seeded `seed`; its class follows CLASS_WEIGHTS. */
export function inputAt(r: Random, fx: FixtureIds, index: number): FuzzInput {
  const cls = r.weighted(INPUT_CLASSES.map((c) => [CLASS_WEIGHTS[c], c] as const));
  switch (cls) {
    case "json":
      return jsonInput(r, fx, index);
    case "query":
      return queryInput(r, fx, index);
    case "path":
      return pathInput(r, index);
    case "headers":
      return headerInput(r, fx, index);
    case "multipart":
      return multipartInput(r, fx, index);
    case "csv":
      return csvInput(r, fx, index);
  }
}
