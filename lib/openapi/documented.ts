import { zodToOpenAPIRegistry } from "@asteasolutions/zod-to-openapi";
import type { z } from "zod";

/**
 * Every named schema, by component name (the latest copy wins). The generator is handed these before the paths:
 * otherwise a component first met through `.nullable()` is written as nullable everywhere it is referenced.
 */
export const namedSchemas = new Map<string, z.ZodType>();

export interface DocumentedMeta {
  /** Name under components/schemas; the schema is then referenced, not inlined. */
  refId?: string;
  description?: string;
  example?: unknown;
  /** Extra OpenAPI schema keywords (format, contentMediaType…) for types zod cannot express. */
  openapi?: Record<string, unknown>;
}

/**
 * A copy of `schema` carrying OpenAPI metadata. The copy shares the original's definition, so it validates
 * exactly as the handler's schema does; the original (owned by lib/validations) is left untouched, and the
 * metadata lives in zod-to-openapi's own registry instead of zod's global one, whose ids must be unique per
 * process (a dev reload would re-register them).
 *
 * @param schema - any zod schema, e.g. a request schema from lib/validations
 * @param meta - component name, description, example
 * @returns the documented copy (same type as `schema`)
 */
export function documented<T extends z.ZodType>(schema: T, meta: DocumentedMeta): T {
  const copy = schema.clone() as T;
  if (meta.refId) namedSchemas.set(meta.refId, copy);
  zodToOpenAPIRegistry.add(copy, {
    ...(meta.refId ? { _internal: { refId: meta.refId } } : {}),
    ...(meta.description ? { description: meta.description } : {}),
    ...(meta.example !== undefined ? { example: meta.example } : {}),
    ...meta.openapi,
  } as never);
  return copy;
}
