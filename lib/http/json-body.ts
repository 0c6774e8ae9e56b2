import { BadRequestError, PayloadTooLargeError } from "@/lib/errors";

/** Largest JSON body a signed-in route reads, in bytes (designs with notes stay far below it). */
export const JSON_BODY_LIMIT_BYTES = 256 * 1024;
/** Largest JSON body an unauthenticated route (sign-in) reads, in bytes: an e-mail and a password. */
export const ANONYMOUS_JSON_BODY_LIMIT_BYTES = 4 * 1024;
/** Most object keys one JSON body may hold, over all levels. */
export const JSON_KEY_LIMIT = 2_000;
/** Deepest nesting of objects and arrays one JSON body may have. */
export const JSON_DEPTH_LIMIT = 32;

export interface JsonLimits {
  maxBytes: number;
  maxKeys: number;
  maxDepth: number;
}

export const SIGNED_IN_JSON_LIMITS: JsonLimits = { maxBytes: JSON_BODY_LIMIT_BYTES, maxKeys: JSON_KEY_LIMIT, maxDepth: JSON_DEPTH_LIMIT };
export const ANONYMOUS_JSON_LIMITS: JsonLimits = { maxBytes: ANONYMOUS_JSON_BODY_LIMIT_BYTES, maxKeys: 16, maxDepth: 4 };

function kib(bytes: number): string {
  return `${bytes / 1024} KiB (${bytes} bytes)`;
}

/**
 * The body as text, read chunk by chunk and given up as soon as it passes `maxBytes`, so a huge body never
 * sits in memory whole (OWASP API Security Top 10 2023, API4 "Unrestricted Resource Consumption").
 * A Content-Length over the limit is refused before a byte is read (RFC 9110 §15.5.14, 413 Content Too Large).
 */
export async function readBodyText(request: Request, maxBytes: number): Promise<string> {
  const tooLarge = () => new PayloadTooLargeError(`The JSON body is over the limit of ${kib(maxBytes)} for this route.`);
  const declared = Number(request.headers.get("content-length") ?? Number.NaN);
  if (declared > maxBytes) throw tooLarge();
  if (!request.body) return "";
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > maxBytes) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge();
    }
    chunks.push(value);
  }
  const bytes = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    bytes.set(c, at);
    at += c.byteLength;
  }
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw new BadRequestError("The body is not valid UTF-8 (RFC 8259 §8.1 requires JSON to be UTF-8).");
  }
}

/**
 * Counts keys and nesting in JSON text without building it, so a body with a million keys is refused in one
 * linear pass instead of making a million-key object first. Counts `:` outside strings as keys and brackets as
 * nesting; the text need not be valid JSON (JSON.parse judges that afterwards).
 * @throws BadRequestError naming the limit that was passed
 */
export function assertJsonShape(text: string, limits: Pick<JsonLimits, "maxKeys" | "maxDepth">): void {
  let depth = 0;
  let keys = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 0x5c) i++; // backslash: skip the escaped character
      else if (c === 0x22) inString = false;
      continue;
    }
    if (c === 0x22) inString = true;
    else if (c === 0x7b || c === 0x5b) {
      if (++depth > limits.maxDepth) throw new BadRequestError(`The JSON body nests deeper than ${limits.maxDepth} levels.`);
    } else if (c === 0x7d || c === 0x5d) depth--;
    else if (c === 0x3a && ++keys > limits.maxKeys) throw new BadRequestError(`The JSON body has more than ${limits.maxKeys} keys.`);
  }
}

/** A high surrogate not followed by a low one, or a low one not preceded by a high one (UTF-16 code units). */
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** Dotted path of the first string (value or key) holding a lone UTF-16 surrogate or a NUL, else null. */
export function badTextPath(value: unknown): { path: string; problem: "nul" | "surrogate" } | null {
  interface Node {
    item: unknown;
    key: string;
    parent: Node | null;
  }
  const pathOf = (node: Node): string => {
    const keys: string[] = [];
    for (let n: Node | null = node; n?.parent; n = n.parent) keys.push(n.key);
    return keys.reverse().join(".") || "(body)";
  };
  const judge = (s: string) => (s.includes("\u0000") ? "nul" : LONE_SURROGATE.test(s) ? "surrogate" : null);
  // Iterative with parent links: deep bodies neither overflow the stack nor build a path string per level.
  const pending: Node[] = [{ item: value, key: "", parent: null }];
  while (pending.length > 0) {
    const node = pending.pop()!;
    if (typeof node.item === "string") {
      const problem = judge(node.item);
      if (problem) return { path: pathOf(node), problem };
      continue;
    }
    if (node.item === null || typeof node.item !== "object") continue;
    for (const [key, child] of Object.entries(node.item)) {
      const next = { item: child, key, parent: node };
      const problem = judge(key);
      if (problem) return { path: pathOf(next), problem };
      pending.push(next);
    }
  }
  return null;
}

/**
 * Refuses text PostgreSQL cannot store: NUL (U+0000) and lone surrogates (U+D800–U+DFFF unpaired), which are
 * not Unicode scalar values and cannot be encoded as UTF-8 (RFC 8259 §8.2, RFC 3629 §3).
 * @throws BadRequestError naming the field
 */
export function refuseBadText(value: unknown, where: string): void {
  const bad = badTextPath(value);
  if (!bad) return;
  const what = bad.problem === "nul" ? "the NUL character (U+0000)" : "a lone UTF-16 surrogate (not a Unicode character)";
  throw new BadRequestError(`Text cannot contain ${what}; ${where} has one in “${bad.path}”.`, {
    [bad.path]: [bad.problem === "nul" ? "contains U+0000" : "contains a lone surrogate"],
  });
}

/**
 * A JSON request body within `limits`: size while streaming, then keys and depth before parsing, then text
 * PostgreSQL can store. Bad JSON is a 400, a body over the size a 413.
 */
export async function readLimitedJson(request: Request, limits: JsonLimits): Promise<unknown> {
  const text = await readBodyText(request, limits.maxBytes);
  assertJsonShape(text, limits);
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch {
    throw new BadRequestError("The body is not valid JSON.");
  }
  refuseBadText(body, "the body");
  return body;
}
