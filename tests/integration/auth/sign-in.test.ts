import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { SIGN_IN_FAILED_MESSAGE } from "@/lib/auth/sign-in";
import {
  apiSignIn,
  appUrl,
  auditRows,
  createPerson,
  getMe,
  getPage,
  sessionCookieFrom,
  sessionIdOf,
  sessionRow,
  setCookieLine,
  signedInCookie,
  submitForm,
  TEST_PASSWORD,
  uniqueEmail,
  uniqueIp,
} from "./helpers";

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

const isSignInForm = (f: string) => f.includes('name="password"');

describe("POST /api/v1/session", () => {
  it("signs in with the right password and sets an HttpOnly, SameSite=Lax, Secure session cookie", async () => {
    const person = await createPerson("technician");
    const ip = uniqueIp();
    const res = await apiSignIn(person.email.toUpperCase(), person.password, ip);
    expect(res.status).toBe(201);
    expect(res.body.user).toEqual({ id: person.id, email: person.email, name: person.name, role: "technician" });
    const line = setCookieLine(res)!;
    expect(line).toMatch(/;\s*HttpOnly/i);
    expect(line).toMatch(/;\s*SameSite=Lax/i);
    expect(line).toMatch(/;\s*Secure/i); // the test app runs `next start`, NODE_ENV=production
    expect(line).toMatch(/;\s*Path=\//i);
    const me = await getMe({ cookie: sessionCookieFrom(res)! });
    expect(me.status).toBe(200);
    expect(me.body).toEqual({ id: person.id, email: person.email, name: person.name, role: "technician" });
    expect((await auditRows({ actor_id: person.id, action: "sign-in" }))[0]?.ip).toBe(ip);
  });

  it("answers an unknown address, a wrong password and a disabled account with the same 401 message", async () => {
    const person = await createPerson("viewer");
    const disabled = await createPerson("engineer", "disabled");
    await db()("auth_user").where({ id: disabled.id }).update({ status: "disabled" });
    const unknown = await apiSignIn(uniqueEmail("nobody"), TEST_PASSWORD);
    const wrong = await apiSignIn(person.email, "not the password");
    const off = await apiSignIn(disabled.email, disabled.password);
    for (const res of [unknown, wrong, off]) {
      expect(res.status).toBe(401);
      expect(res.headers["content-type"]).toMatch(/application\/problem\+json/);
      expect(res.body.detail).toBe(SIGN_IN_FAILED_MESSAGE);
      expect(sessionCookieFrom(res)).toBeNull();
    }
    expect(await auditRows({ actor_id: person.id, action: "sign-in.failed" })).toHaveLength(1);
  });

  it("rejects a body that is not JSON with 415 and a missing password with 400", async () => {
    const form = await request(appUrl()).post("/api/v1/session").type("form").send({ email: "a@b.test", password: "x" });
    expect(form.status).toBe(415);
    const missing = await request(appUrl()).post("/api/v1/session").set("content-type", "application/json").send({ email: "a@b.test" });
    expect(missing.status).toBe(400);
    expect(missing.body.fields.password).toBeDefined();
  });

  it("opens a new session id on every sign-in and ends the one the client still presented", async () => {
    const person = await createPerson("viewer");
    const first = await signedInCookie(person);
    const again = await request(appUrl())
      .post("/api/v1/session")
      .set("content-type", "application/json")
      .set("cookie", first)
      .send({ email: person.email, password: person.password });
    expect(again.status).toBe(201);
    const second = sessionCookieFrom(again)!;
    expect(sessionIdOf(second)).not.toBe(sessionIdOf(first));
    expect(await sessionRow(sessionIdOf(first))).toBeUndefined();
    expect((await getMe({ cookie: first })).status).toBe(401);
    expect((await getMe({ cookie: second })).status).toBe(200);
  });
});

describe("DELETE /api/v1/session", () => {
  it("ends the session server-side, so the old cookie is refused afterwards", async () => {
    const person = await createPerson("engineer");
    const cookie = await signedInCookie(person);
    const res = await request(appUrl()).delete("/api/v1/session").set("cookie", cookie).set("origin", new URL(appUrl()).origin);
    expect(res.status).toBe(204);
    expect(setCookieLine(res)).toMatch(/Max-Age=0|Expires=Thu, 01 Jan 1970/i);
    expect(await sessionRow(sessionIdOf(cookie))).toBeUndefined();
    expect((await getMe({ cookie })).status).toBe(401);
    expect(await auditRows({ actor_id: person.id, action: "sign-out" })).toHaveLength(1);
  });

  it("refuses a sign-out from another origin and leaves the session alone", async () => {
    const person = await createPerson("engineer");
    const cookie = await signedInCookie(person);
    const res = await request(appUrl()).delete("/api/v1/session").set("cookie", cookie).set("origin", "http://evil.example");
    expect(res.status).toBe(401);
    expect((await getMe({ cookie })).status).toBe(200);
  });
});

describe("sign-in page and its form", () => {
  it("renders the form with labelled fields for a visitor", async () => {
    const res = await getPage("/sign-in");
    expect(res.status).toBe(200);
    expect(res.text).toContain('<label for="email"');
    expect(res.text).toMatch(/id="password" type="password" autoComplete="current-password"/i);
  });

  it("signs in through the form (no JavaScript) and redirects to the dashboard with a fresh session cookie", async () => {
    const person = await createPerson("technician");
    const res = await submitForm("/sign-in", isSignInForm, { email: person.email, password: person.password });
    expect(res.status).toBe(303);
    expect(res.headers.location).toBe("/dashboard");
    const cookie = sessionCookieFrom(res)!;
    expect(setCookieLine(res)).toMatch(/HttpOnly/i);
    const dash = await getPage("/dashboard", cookie);
    expect(dash.status).toBe(200);
    expect(dash.text).toContain("Hello, Test");
    expect(dash.text).toContain("technician");
  });

  it("shows the vague message on the page for a wrong password", async () => {
    const person = await createPerson("technician");
    const res = await submitForm("/sign-in", isSignInForm, { email: person.email, password: "wrong wrong wrong" });
    expect(res.status).toBe(200);
    expect(res.text).toContain(SIGN_IN_FAILED_MESSAGE);
    expect(sessionCookieFrom(res)).toBeNull();
  });

  it("shows field errors for an empty e-mail without trying to sign in", async () => {
    const res = await submitForm("/sign-in", isSignInForm, { email: "", password: "" });
    expect(res.status).toBe(200);
    expect(res.text).toContain("Enter your e-mail address.");
    expect(res.text).toContain("Enter your password.");
  });

  it("returns to a same-site `next` path and ignores one that leaves the site", async () => {
    const person = await createPerson("viewer");
    const back = await submitForm("/sign-in?next=%2Fprofile", isSignInForm, { email: person.email, password: person.password });
    expect(back.headers.location).toBe("/profile");
    const away = await submitForm("/sign-in", isSignInForm, { email: person.email, password: person.password, next: "//evil.example/x" });
    expect(away.headers.location).toBe("/dashboard");
  });
});

describe("signed-in pages", () => {
  it("send a visitor without a session to the sign-in page", async () => {
    for (const path of ["/dashboard", "/profile", "/people", "/audit"]) {
      const res = await getPage(path);
      expect(res.status, path).toBe(307);
      expect(res.headers.location, path).toMatch(/^\/sign-in/);
    }
  });

  it("sign out through the shell's button, ending the session server-side", async () => {
    const person = await createPerson("viewer");
    const cookie = await signedInCookie(person);
    const res = await submitForm("/dashboard", (f) => f.includes("Sign out"), {}, { cookie });
    expect(res.status).toBe(303);
    expect(res.headers.location).toBe("/sign-in?signed-out=1");
    expect(await sessionRow(sessionIdOf(cookie))).toBeUndefined();
  });

  it("sign out everywhere from the profile page, ending every session of the user", async () => {
    const person = await createPerson("technician");
    const [a, b] = [await signedInCookie(person), await signedInCookie(person)];
    const res = await submitForm("/profile", (f) => f.includes("Sign out everywhere"), {}, { cookie: a });
    expect(res.status).toBe(303);
    expect(res.headers.location).toBe("/sign-in?signed-out=everywhere");
    expect((await getMe({ cookie: a })).status).toBe(401);
    expect((await getMe({ cookie: b })).status).toBe(401);
    expect(await db()("user_session").where({ user_id: person.id })).toHaveLength(0);
    expect(await auditRows({ actor_id: person.id, action: "sign-out.everywhere" })).toHaveLength(1);
  });
});

describe("session expiry", () => {
  it("refuses a session whose expires_at has passed, on the API and on pages, and deletes it", async () => {
    const person = await createPerson("engineer");
    const cookie = await signedInCookie(person);
    await db()("user_session").where({ id: sessionIdOf(cookie) }).update({ expires_at: new Date(Date.now() - 1000) });
    expect((await getMe({ cookie })).status).toBe(401);
    const page = await getPage("/dashboard", cookie);
    expect(page.status).toBe(307);
    expect(page.headers.location).toMatch(/^\/sign-in/);
    expect(await sessionRow(sessionIdOf(cookie))).toBeUndefined();
  });

  it("extends a session that is used after more than half of its 14 days", async () => {
    const person = await createPerson("engineer");
    const cookie = await signedInCookie(person);
    await db()("user_session").where({ id: sessionIdOf(cookie) }).update({ expires_at: new Date(Date.now() + 24 * 3600_000) });
    expect((await getMe({ cookie })).status).toBe(200);
    const row = await sessionRow(sessionIdOf(cookie));
    const daysLeft = (new Date(row!.expires_at).getTime() - Date.now()) / 86_400_000;
    expect(daysLeft).toBeGreaterThan(13.9); // lib/auth/lucia.ts SESSION_LIFETIME = 14 d
    expect(daysLeft).toBeLessThanOrEqual(14.0 + 1e-3);
  });
});
