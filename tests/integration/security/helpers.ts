// Shared by the security tests: the route handlers and signed-in pages found by walking app/, and server-action
// form posts with an Origin of our choosing.
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import request, { type Response } from "supertest";
import { appUrl, formsOf, getPage } from "../auth/helpers";

export type Method = "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
export const METHODS: Method[] = ["GET", "POST", "PUT", "PATCH", "DELETE"];

function walk(dir: string, file: string): string[] {
  const out: string[] = [];
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, entry.name);
    if (entry.isDirectory()) out.push(...walk(p, file));
    else if (entry.name === file) out.push(p);
  }
  return out;
}

/** A URL path for a file under app/: route groups dropped, every [param] filled with `fill`. */
function urlPath(file: string, fill: string): string {
  const rel = path.relative(path.join(process.cwd(), "app"), path.dirname(file));
  const segments = rel.split(path.sep).filter((s) => s !== "" && !/^\(.*\)$/.test(s));
  return `/${segments.map((s) => (/^\[.*\]$/.test(s) ? fill : s)).join("/")}`;
}

export interface RouteFile {
  file: string;
  path: string;
  methods: Method[];
}

/** Every route handler under app/api and the HTTP methods its file exports. */
export function routeHandlers(fill: string): RouteFile[] {
  return walk(path.join(process.cwd(), "app", "api"), "route.ts")
    .map((file) => {
      const source = readFileSync(file, "utf8");
      const methods = METHODS.filter((m) => new RegExp(`export\\s+(?:const\\s+${m}\\b|(?:async\\s+)?function\\s+${m}\\b)`).test(source));
      return { file: path.relative(process.cwd(), file), path: urlPath(file, fill), methods };
    })
    .sort((a, b) => a.path.localeCompare(b.path));
}

/** Every page under the signed-in shell, app/(app)/**. */
export function signedInPages(fill: string): string[] {
  return walk(path.join(process.cwd(), "app", "(app)"), "page.tsx")
    .map((file) => urlPath(file, fill))
    .sort();
}

/**
 * Posts a server-action form of `page` the way a browser without JavaScript does, with an Origin of our choosing
 * (a browser sends its page's origin; a forged cross-site form sends the attacker's).
 * @param formFrom the page to take the form from, when the caller's own view of `page` has no such form
 */
export async function postForm(
  page: string,
  pick: (inner: string) => boolean,
  fields: Record<string, string>,
  opts: { cookie?: string; origin?: string | null; formFrom?: { cookie?: string } } = {},
): Promise<Response> {
  const view = await getPage(page, opts.formFrom ? opts.formFrom.cookie : opts.cookie);
  const form = formsOf(view.text).find((f) => pick(f.inner));
  if (!form) throw new Error(`no matching form on ${page}`);
  const req = request(appUrl()).post(page).redirects(0);
  const origin = opts.origin === undefined ? new URL(appUrl()).origin : opts.origin;
  if (origin !== null) req.set("origin", origin);
  if (opts.cookie) req.set("cookie", opts.cookie);
  for (const [k, v] of Object.entries({ ...form.hidden, ...fields })) req.field(k, v);
  return req;
}

/** Hostile text put in every stored field: markup, an attribute break-out, a script URL. */
export const XSS_SCRIPT = "<script>alert(1)</script>";
export const XSS_IMG = '"><img src=x onerror=alert(2)>';
export const XSS_LINK = "javascript:alert(3)";

/** The page text holds none of the hostile strings as live markup. */
export function liveMarkup(html: string): string[] {
  const found: string[] = [];
  if (html.includes(XSS_SCRIPT)) found.push(XSS_SCRIPT);
  if (/<img src=x onerror/i.test(html)) found.push("<img src=x onerror");
  if (/href="javascript:/i.test(html)) found.push('href="javascript:');
  return found;
}
