// Shared by the auth integration tests: people made straight in the database, sign-in over HTTP, the
// cookie handled by hand (it is Secure and the test app is plain http on 127.0.0.1), forms submitted the way
// a browser without JavaScript submits a server-action form, and e-mails read back from the fake SMTP server.
import { randomBytes } from "node:crypto";
import { generateIdFromEntropySize } from "lucia";
import request, { type Response } from "supertest";
import { expect } from "vitest";
import { db } from "@/db/index";
import { createUser } from "@/db/queries/users";
import { hashPassword } from "@/lib/auth/password";
import type { Role } from "@/lib/auth/permissions";
import { SESSION_COOKIE_NAME } from "@/lib/auth/lucia";
import { listHeldMessages } from "@/lib/mail/outbox";
import type { HeldMessage } from "@/lib/mail";
import { appUrl } from "../../helpers/stack";

export const TEST_PASSWORD = "correct horse battery";

export function uniqueEmail(label: string): string {
  return `${label}-${randomBytes(5).toString("hex")}@auth-tests.test`;
}

/** A client address from TEST-NET-2 (RFC 5737), unique per call, so throttling by address stays per test. */
export function uniqueIp(): string {
  const b = randomBytes(2);
  return `198.51.${b[0]}.${(b[1] % 250) + 1}`;
}

export interface TestPerson {
  id: string;
  email: string;
  name: string;
  role: Role;
  password: string;
}

export async function createPerson(role: Role, label: string = role): Promise<TestPerson> {
  const email = uniqueEmail(label);
  const user = await createUser({ id: generateIdFromEntropySize(10), email, name: `Test ${label}`, role, passwordHash: await hashPassword(TEST_PASSWORD) });
  return { id: user.id, email, name: user.name, role, password: TEST_PASSWORD };
}

/** Every response of these tests goes through this: no password hash may ever appear in one. */
export function assertNoSecrets(res: Response): void {
  const body = res.text ?? JSON.stringify(res.body ?? "");
  expect(body).not.toContain("password_hash");
  expect(body).not.toContain("passwordHash");
  expect(body).not.toMatch(/\$argon2id\$/);
}

/** The session cookie the response set, as "name=value", or null. */
export function sessionCookieFrom(res: Response): string | null {
  const raw = ([] as string[]).concat(res.headers["set-cookie"] ?? []);
  const line = raw.find((c) => c.startsWith(`${SESSION_COOKIE_NAME}=`));
  if (!line) return null;
  const pair = line.split(";")[0];
  return pair.endsWith("=") ? null : pair;
}

export function setCookieLine(res: Response): string | undefined {
  return ([] as string[]).concat(res.headers["set-cookie"] ?? []).find((c) => c.startsWith(`${SESSION_COOKIE_NAME}=`));
}

export function sessionIdOf(cookie: string): string {
  return cookie.split("=")[1];
}

/** Signs in through POST /api/v1/session. */
export async function apiSignIn(email: string, password: string, ip = uniqueIp()): Promise<Response> {
  const res = await request(appUrl())
    .post("/api/v1/session")
    .set("content-type", "application/json")
    .set("x-forwarded-for", ip)
    .send({ email, password });
  assertNoSecrets(res);
  return res;
}

/** Signs in and returns the cookie to send back. */
export async function signedInCookie(person: { email: string; password: string }): Promise<string> {
  const res = await apiSignIn(person.email, person.password);
  expect(res.status, res.text).toBe(201);
  const cookie = sessionCookieFrom(res);
  expect(cookie).not.toBeNull();
  return cookie!;
}

export async function getPage(path: string, cookie?: string): Promise<Response> {
  const req = request(appUrl()).get(path).redirects(0);
  if (cookie) req.set("cookie", cookie);
  const res = await req;
  assertNoSecrets(res);
  return res;
}

export async function getMe(auth: { cookie?: string; token?: string }): Promise<Response> {
  const req = request(appUrl()).get("/api/v1/me");
  if (auth.cookie) req.set("cookie", auth.cookie);
  if (auth.token) req.set("authorization", `Bearer ${auth.token}`);
  const res = await req;
  assertNoSecrets(res);
  return res;
}

function decodeEntities(value: string): string {
  return value
    .replace(/&quot;/g, '"')
    .replace(/&#x27;|&#39;/g, "'")
    .replace(/&lt;/g, "<")
    .replace(/&gt;/g, ">")
    .replace(/&amp;/g, "&");
}

function attr(tag: string, name: string): string | undefined {
  const m = new RegExp(`\\s${name.replace(/\$/g, "\\$")}="([^"]*)"`).exec(tag);
  return m ? decodeEntities(m[1]) : undefined;
}

/** The hidden fields of every form on a page, with the form's inner HTML to pick one by. */
export function formsOf(html: string): { inner: string; hidden: Record<string, string> }[] {
  const forms: { inner: string; hidden: Record<string, string> }[] = [];
  for (const m of html.matchAll(/<form\b[^>]*>([\s\S]*?)<\/form>/g)) {
    const hidden: Record<string, string> = {};
    for (const tag of m[1].match(/<input\b[^>]*>/g) ?? []) {
      if (attr(tag, "type") !== "hidden") continue;
      const name = attr(tag, "name");
      if (name) hidden[name] = attr(tag, "value") ?? "";
    }
    forms.push({ inner: m[1], hidden });
  }
  return forms;
}

/**
 * Submits a server-action form as a browser without JavaScript does: GET the page, take the chosen form's
 * hidden fields (the action reference and its key), add `fields`, POST multipart to the same path with a
 * same-origin Origin header. Next answers with the re-rendered page (the action's state in it) or a redirect.
 * @param pick chooses the form by its inner HTML, e.g. `(f) => f.includes('name="password"')`
 */
export async function submitForm(
  path: string,
  pick: (inner: string) => boolean,
  fields: Record<string, string>,
  opts: { cookie?: string; ip?: string } = {},
): Promise<Response> {
  const page = await getPage(path, opts.cookie);
  expect(page.status, `GET ${path}`).toBe(200);
  const form = formsOf(page.text).find((f) => pick(f.inner));
  if (!form) throw new Error(`no matching form on ${path}`);
  const override = Object.fromEntries(Object.keys(fields).map((k) => [k, true]));
  const req = request(appUrl()).post(path).redirects(0).set("origin", new URL(appUrl()).origin).set("x-forwarded-for", opts.ip ?? uniqueIp());
  if (opts.cookie) req.set("cookie", opts.cookie);
  for (const [k, v] of Object.entries(form.hidden)) if (!override[k]) req.field(k, v);
  for (const [k, v] of Object.entries(fields)) req.field(k, v);
  const res = await req;
  assertNoSecrets(res);
  return res;
}

/** Waits (up to ~8 s) for the newest message to `to` whose subject matches. */
export async function waitForMail(to: string, subject: RegExp): Promise<HeldMessage> {
  for (let i = 0; i < 40; i++) {
    const found = (await listHeldMessages({ to })).find((m) => subject.test(m.subject));
    if (found) return found;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`no e-mail to ${to} with a subject matching ${subject}`);
}

/** The first link in a message's text that points at `pathPrefix` on the app, as a path. */
export function linkIn(message: HeldMessage, pathPrefix: string): string {
  const base = new URL(appUrl()).origin;
  const m = new RegExp(`${base.replace(/[.:/]/g, "\\$&")}(${pathPrefix}[A-Za-z0-9_-]+)`).exec(message.text);
  if (!m) throw new Error(`no ${pathPrefix} link in: ${message.text}`);
  return m[1];
}

export async function sessionRow(sessionId: string): Promise<{ id: string; expires_at: Date } | undefined> {
  return db()("user_session").where({ id: sessionId }).first();
}

export async function auditRows(filter: { actor_id?: string | null; action: string; entity_id?: string }): Promise<{ ip: string | null; detail: Record<string, unknown> }[]> {
  const q = db()("audit_events").where({ action: filter.action });
  if (filter.actor_id !== undefined) q.where({ actor_id: filter.actor_id });
  if (filter.entity_id) q.where({ entity_id: filter.entity_id });
  return q.select("ip", "detail");
}

export { appUrl };
