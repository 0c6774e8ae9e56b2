// Reading the generated document's JSON Schemas for display: type labels with links to named schemas, rule
// summaries, and the fields of an object (nested objects flattened into dotted names).

export type JsonSchema = {
  $ref?: string;
  type?: string | string[];
  format?: string;
  enum?: unknown[];
  const?: unknown;
  anyOf?: JsonSchema[];
  oneOf?: JsonSchema[];
  allOf?: JsonSchema[];
  items?: JsonSchema;
  properties?: Record<string, JsonSchema>;
  additionalProperties?: JsonSchema | boolean;
  required?: string[];
  description?: string;
  minimum?: number;
  maximum?: number;
  minLength?: number;
  maxLength?: number;
  pattern?: string;
  default?: unknown;
  contentMediaType?: string;
};

export type Components = Record<string, JsonSchema>;

/** A piece of a type label; `ref` names a schema of components.schemas to link to. */
export interface TypeToken {
  text: string;
  ref?: string;
}

export const refName = (ref: string): string => ref.slice(ref.lastIndexOf("/") + 1);

const join = (groups: TypeToken[][], separator: string): TypeToken[] =>
  groups.flatMap((g, i) => (i === 0 ? g : [{ text: separator }, ...g]));

/** How a schema reads as a type: `string (uuid) | null`, `RunSummary[]`, `"pass" | "fail"`, `map of Part`. */
export function typeTokens(schema: JsonSchema | undefined): TypeToken[] {
  if (!schema) return [{ text: "any" }];
  if (schema.$ref) return [{ text: refName(schema.$ref), ref: refName(schema.$ref) }];
  const union = schema.anyOf ?? schema.oneOf;
  if (union) return join(union.map(typeTokens), " | ");
  if (schema.allOf) return join(schema.allOf.map(typeTokens), " & ");
  if (schema.const !== undefined) return [{ text: JSON.stringify(schema.const) }];
  if (schema.enum) return [{ text: schema.enum.map((v) => (v === null ? "null" : JSON.stringify(v))).join(" | ") }];
  const types = Array.isArray(schema.type) ? schema.type : schema.type ? [schema.type] : [];
  const nullable = types.includes("null");
  const main = types.filter((t) => t !== "null");
  let tokens: TypeToken[];
  if (main.length === 0 && !schema.type) tokens = [{ text: "any" }];
  else if (main.length === 0) tokens = [];
  else if (main[0] === "array") {
    const inner = typeTokens(schema.items);
    tokens = inner.length > 1 ? [{ text: "(" }, ...inner, { text: ")[]" }] : [...inner, { text: "[]" }];
  } else if (main[0] === "object" && !schema.properties && typeof schema.additionalProperties === "object") {
    tokens = [{ text: "map of " }, ...typeTokens(schema.additionalProperties)];
  } else {
    const format = schema.format ?? (schema.contentMediaType ? `file, ${schema.contentMediaType}` : undefined);
    tokens = [{ text: main.join(" | ") + (format ? ` (${format})` : "") }];
  }
  return nullable ? [...tokens, ...(tokens.length ? [{ text: " | " }] : []), { text: "null" }] : tokens;
}

/** The rules a value must keep, in words: "1 to 200", "at most 120 characters", "default false". */
export function ruleText(schema: JsonSchema): string {
  const rules: string[] = [];
  if (schema.minimum !== undefined && schema.maximum !== undefined) rules.push(`${schema.minimum} to ${schema.maximum}`);
  else if (schema.minimum !== undefined) rules.push(`≥ ${schema.minimum}`);
  else if (schema.maximum !== undefined) rules.push(`≤ ${schema.maximum}`);
  if (schema.minLength !== undefined && schema.minLength > 0 && schema.maxLength !== undefined) rules.push(`${schema.minLength}–${schema.maxLength} characters`);
  else if (schema.maxLength !== undefined) rules.push(`at most ${schema.maxLength} characters`);
  if (schema.pattern && schema.pattern.length <= 40) rules.push(`matches ${schema.pattern}`);
  if (schema.default !== undefined) rules.push(`default ${JSON.stringify(schema.default)}`);
  return rules.join("; ");
}

export interface FieldRow {
  name: string;
  schema: JsonSchema;
  required: boolean;
}

/**
 * The fields of an object schema, nested inline objects and maps flattened into dotted names
 * (`spec.targetHz`, `parts.<ref>.value`); named schemas stay one row with a link.
 */
export function fieldRows(schema: JsonSchema, components: Components, prefix = "", depth = 0): FieldRow[] {
  const resolved = schema.$ref && depth === 0 ? (components[refName(schema.$ref)] ?? schema) : schema;
  const rows: FieldRow[] = [];
  for (const [name, property] of Object.entries(resolved.properties ?? {})) {
    const full = prefix + name;
    const required = (resolved.required ?? []).includes(name);
    rows.push({ name: full, schema: property, required });
    if (depth >= 2) continue;
    const inline = property.anyOf?.find((s) => s.properties) ?? property;
    if (inline.properties && !inline.$ref) rows.push(...fieldRows(inline, components, `${full}.`, depth + 1));
    const map = typeof inline.additionalProperties === "object" ? inline.additionalProperties : undefined;
    if (map?.properties && !map.$ref) rows.push(...fieldRows(map, components, `${full}.<key>.`, depth + 1));
  }
  return rows;
}
