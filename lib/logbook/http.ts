import { BadRequestError } from "@/lib/errors";

// Small pieces the /api/v1 logbook handlers share.

/**
 * Where a NUL character (U+0000) sits in a parsed value, as a dotted path, or null when there is none.
 * PostgreSQL text cannot hold it, so it is refused at the door instead of failing the insert with a 500.
 */
export function nulPath(value: unknown): string | null {
  // Iterative, with the path kept as links to the parent: a body nested thousands deep is valid JSON and must
  // neither overflow the stack nor build a path string per level here.
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
  const pending: Node[] = [{ item: value, key: "", parent: null }];
  while (pending.length > 0) {
    const node = pending.pop()!;
    if (typeof node.item === "string") {
      if (node.item.includes("\u0000")) return pathOf(node);
      continue;
    }
    if (node.item === null || typeof node.item !== "object") continue;
    for (const [key, child] of Object.entries(node.item)) {
      const next = { item: child, key, parent: node };
      if (key.includes("\u0000")) return pathOf(next);
      pending.push(next);
    }
  }
  return null;
}

function refuseNul(value: unknown, where: string): void {
  const path = nulPath(value);
  if (path) throw new BadRequestError(`Text cannot contain the NUL character (U+0000); ${where} has one in “${path}”.`, { [path]: ["contains U+0000"] });
}

/** The JSON body of a request; a body that is not JSON is a 400, not a 500. */
export async function readJson(request: Request): Promise<unknown> {
  const type = request.headers.get("content-type") ?? "";
  if (!type.toLowerCase().includes("application/json")) {
    throw new BadRequestError("Send the body as JSON (Content-Type: application/json).");
  }
  let body: unknown;
  try {
    body = await request.json();
  } catch {
    throw new BadRequestError("The body is not valid JSON.");
  }
  refuseNul(body, "the body");
  return body;
}

/** The query string as a plain object (repeated keys keep the last value). */
export function queryObject(request: Request): Record<string, string> {
  const query = Object.fromEntries(new URL(request.url).searchParams.entries());
  refuseNul(query, "the query string");
  return query;
}

/** 201 Created with a Location header pointing at the new resource. */
export function created(body: unknown, location: string): Response {
  return Response.json(body, { status: 201, headers: { location } });
}
