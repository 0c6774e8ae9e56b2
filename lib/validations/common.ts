import "./zod-config";
import { z } from "zod";
import { parseTempco, parseTolerance, parseValue, type QuantityUnit } from "@/lib/oscillator";
import { withinLimit } from "./limits";

// Building blocks shared by the logbook schemas. Forms send text, the API may send numbers; both land here.

const UUID_RULE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** An id of a project, design, build, tweak or run (a UUID). */
export const idSchema = z.string().trim().regex(UUID_RULE, "This is not an id Tankbook made.").transform((v) => v.toLowerCase());

function blankToUndefined(value: unknown): unknown {
  if (value === null || value === undefined) return undefined;
  if (typeof value === "string" && value.trim() === "") return undefined;
  return value;
}

/** Form text that is optional: "" becomes undefined. */
export function optionalText(max: number, label: string) {
  return z.preprocess(
    blankToUndefined,
    z.string().trim().max(max, `${label} takes at most ${max} characters.`).optional(),
  );
}

/** A plain decimal number from a form field or JSON, with a message naming the field. */
export function numberField(label: string, range: { min?: number; max?: number } = {}) {
  let schema = z.number({ error: `${label} must be a number.` }).finite(`${label} must be a finite number.`);
  if (range.min !== undefined) schema = schema.min(range.min, `${label} must be at least ${range.min}.`);
  if (range.max !== undefined) schema = schema.max(range.max, `${label} must be at most ${range.max}.`);
  return z.preprocess((v) => {
    if (typeof v !== "string") return v;
    const text = v.trim().replace(",", ".");
    return text === "" ? undefined : /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(text) ? Number(text) : v;
  }, schema);
}

export function optionalNumberField(label: string, range: { min?: number; max?: number } = {}) {
  return z.preprocess(blankToUndefined, numberField(label, range).optional());
}

/**
 * A component value or frequency written the way people write it ("4n7", "4.7 nF", "412.3k", "1.5 MHz"), or a
 * number already in SI units (API). Parsed with lib/oscillator's parser; its message is the error.
 */
export function engineeringValue(unit: QuantityUnit, label: string) {
  return z.union([z.number(), z.string()], { error: `${label} is missing.` }).transform((value, ctx) => {
    if (typeof value === "number") {
      if (!Number.isFinite(value)) {
        ctx.addIssue({ code: "custom", message: `${label} must be a finite number.` });
        return z.NEVER;
      }
      return value;
    }
    if (value.trim() === "") {
      ctx.addIssue({ code: "custom", message: `${label} is missing.` });
      return z.NEVER;
    }
    try {
      return parseValue(value, unit);
    } catch (err) {
      ctx.addIssue({ code: "custom", message: err instanceof Error ? err.message : `${label} is not a value.` });
      return z.NEVER;
    }
  });
}

export function optionalEngineeringValue(unit: QuantityUnit, label: string) {
  return z.preprocess(blankToUndefined, engineeringValue(unit, label).optional());
}

/** A part tolerance: text such as "5%", "±1 %", "J", or a fraction (0.05) from the API. */
export const toleranceField = z.preprocess(
  blankToUndefined,
  z
    .union([z.number(), z.string()])
    .transform((value, ctx) => {
      if (typeof value === "number") {
        if (!Number.isFinite(value)) {
          ctx.addIssue({ code: "custom", message: `A tolerance given as a number is a fraction (0.05 = 5 %); got ${value}.` });
          return z.NEVER;
        }
        return value;
      }
      try {
        return parseTolerance(value);
      } catch (err) {
        ctx.addIssue({ code: "custom", message: err instanceof Error ? err.message : "This is not a tolerance." });
        return z.NEVER;
      }
    })
    .superRefine(withinLimit("tolerance", "the tolerance"))
    .optional(),
);

/** A temperature coefficient: text such as "C0G", "N750", "±30ppm/°C", or ppm/K as a number from the API. */
export const tempcoField = z.preprocess(
  blankToUndefined,
  z
    .union([z.number(), z.string()])
    .transform((value, ctx) => {
      if (typeof value === "number") {
        if (!Number.isFinite(value)) {
          ctx.addIssue({ code: "custom", message: "A tempco must be a finite number of ppm/K." });
          return z.NEVER;
        }
        return { ppmPerK: value, spreadPpmPerK: 0 };
      }
      try {
        return parseTempco(value);
      } catch (err) {
        ctx.addIssue({ code: "custom", message: err instanceof Error ? err.message : "This is not a tempco." });
        return z.NEVER;
      }
    })
    .superRefine((t, ctx) => {
      withinLimit("tempcoPpmPerK", "the tempco")(t.ppmPerK, ctx);
      withinLimit("tempcoSpreadPpmPerK", "the tempco spread")(t.spreadPpmPerK, ctx);
    })
    .optional(),
);

/** A checkbox or JSON boolean: "on", "true", "1", true. */
export const booleanField = z.preprocess((v) => {
  if (typeof v === "string") return ["on", "true", "1", "yes"].includes(v.trim().toLowerCase());
  return v ?? false;
}, z.boolean());

/** `?cursor=&limit=` on list routes. */
export const pageQuerySchema = z.object({
  cursor: optionalText(500, "cursor"),
  limit: optionalNumberField("limit", { min: 1, max: 200 }).transform((v) => (v === undefined ? undefined : Math.floor(v))),
});

/** An ISO 8601 time in a query string. */
const EARLIEST_TIME_MS = Date.UTC(1900, 0, 1);
const LATEST_TIME_MS = Date.UTC(9999, 11, 31, 23, 59, 59, 999);

export const optionalTimeField = (label: string) =>
  z.preprocess(
    blankToUndefined,
    z
      .string()
      .refine((v) => !Number.isNaN(Date.parse(v)), `${label} must be an ISO 8601 time such as 2026-12-01T09:30:00Z.`)
      // JavaScript reads years up to ±275,760 that PostgreSQL's timestamptz cannot hold; a logbook needs far less.
      .refine((v) => {
        const ms = Date.parse(v);
        return Number.isNaN(ms) || (ms >= EARLIEST_TIME_MS && ms <= LATEST_TIME_MS);
      }, `${label} must lie between 1900-01-01 and 9999-12-31.`)
      .transform((v) => new Date(v))
      .optional(),
  );

const FORBIDDEN_KEYS = new Set(["__proto__", "constructor", "prototype"]);

/**
 * FormData to a plain object, turning dotted names into nesting: `parts.C1.value` → `{ parts: { C1: { value } } }`.
 * Files are kept as File objects; repeated names keep the last value.
 */
export function formDataToObject(form: FormData): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [name, value] of form.entries()) {
    if (name.startsWith("$ACTION")) continue;
    const path = name.split(".");
    if (path.some((key) => FORBIDDEN_KEYS.has(key) || key === "")) continue;
    let node = out;
    for (const key of path.slice(0, -1)) {
      if (typeof node[key] !== "object" || node[key] === null || node[key] instanceof Blob) node[key] = {};
      node = node[key] as Record<string, unknown>;
    }
    node[path[path.length - 1]] = value;
  }
  return out;
}
