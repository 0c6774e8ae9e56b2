// Two corrections to what zod-to-openapi 8 writes, applied to the generated JSON:
// - a nullable reference comes out as allOf[$ref, {type: [..., "null"]}], which no null satisfies (the $ref
//   still demands an object); it becomes anyOf[$ref, {type: "null"}];
// - a regex with flags comes out as its toString() minus the slashes ("…$/i"), which JSON Schema reads as
//   a literal "/i"; the flags are dropped and an i flag is spelt out as letter classes.

type Json = unknown;

/**
 * The source of a case-insensitive ECMAScript regex rewritten to match the same strings without the flag
 * (ASCII letters only: "[0-9a-f]" → "[0-9a-fA-F]", "x" → "[xX]").
 * Named groups and property escapes carry letters that are not literal; such a source is returned unchanged.
 * @param source - regex source, without slashes or flags
 */
export function caseInsensitivePattern(source: string): string {
  if (/\(\?<|\\[pPk][{<]/.test(source)) return source;
  let out = "";
  let inClass = false;
  for (let i = 0; i < source.length; i++) {
    const c = source[i];
    if (c === "\\") {
      // An escape (\d, \x21, \u0041, \/) stands as written: its letters are not literal letters.
      const hex = source[i + 1] === "x" ? 2 : source[i + 1] === "u" ? 4 : 0;
      out += source.slice(i, i + 2 + hex);
      i += 1 + hex;
      continue;
    }
    if (inClass) {
      if (c === "]") {
        inClass = false;
        out += c;
        continue;
      }
      if (/[a-z]/i.test(c) && source[i + 1] === "-" && /[a-z]/i.test(source[i + 2] ?? "")) {
        const range = source.slice(i, i + 3);
        out += range + (c === c.toLowerCase() ? range.toUpperCase() : range.toLowerCase());
        i += 2;
        continue;
      }
      out += /[a-z]/i.test(c) ? c + (c === c.toLowerCase() ? c.toUpperCase() : c.toLowerCase()) : c;
      continue;
    }
    if (c === "[") {
      inClass = true;
      out += c;
      // A negated class stays negated; the letters after ^ are doubled like any others.
      if (source[i + 1] === "^") {
        out += "^";
        i++;
      }
      continue;
    }
    out += /[a-z]/i.test(c) ? `[${c.toLowerCase()}${c.toUpperCase()}]` : c;
  }
  return out;
}

function fixPattern(pattern: string): string {
  const m = /^(.*[^\\])\/([dgimsuvy]+)$/s.exec(pattern);
  if (!m) return pattern;
  return m[2].includes("i") ? caseInsensitivePattern(m[1]) : m[1];
}

function isNullableRef(node: Record<string, unknown>): boolean {
  const all = node.allOf;
  if (!Array.isArray(all) || all.length !== 2) return false;
  const [ref, nullable] = all as Record<string, unknown>[];
  if (typeof ref?.$ref !== "string" || !nullable || typeof nullable !== "object") return false;
  const type = nullable.type;
  return Array.isArray(type) && type.includes("null") && Object.keys(nullable).every((k) => k === "type");
}

/** Applies both corrections to a generated document, in place. */
export function normaliseDocument(node: Json): void {
  if (Array.isArray(node)) {
    node.forEach(normaliseDocument);
    return;
  }
  if (!node || typeof node !== "object") return;
  const object = node as Record<string, unknown>;
  if (isNullableRef(object)) {
    const [ref] = object.allOf as Record<string, unknown>[];
    delete object.allOf;
    object.anyOf = [ref, { type: "null" }];
  }
  if (typeof object.pattern === "string") object.pattern = fixPattern(object.pattern);
  for (const value of Object.values(object)) normaliseDocument(value);
}
