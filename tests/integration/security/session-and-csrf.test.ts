import { randomBytes } from "node:crypto";
import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { createApiToken } from "@/lib/auth/api-tokens";
import { closeLucia, SESSION_COOKIE_NAME } from "@/lib/auth/lucia";
import { apiSignIn, appUrl, createPerson, getMe, sessionCookieFrom, sessionIdOf, sessionRow, signedInCookie, submitForm } from "../auth/helpers";
import { postForm } from "./helpers";

const EVIL = "http://evil.example";
const isSignInForm = (f: string) => f.includes('name="password"');

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("session fixation", () => {
  it("does not adopt a session id the visitor arrived with: the sign-in form issues a new one", async () => {
    const person = await createPerson("technician", "fixation-form");
    const planted = `${SESSION_COOKIE_NAME}=${randomBytes(20).toString("hex")}`;
    const res = await submitForm("/sign-in", isSignInForm, { email: person.email, password: person.password }, { cookie: planted });
    expect(res.status).toBe(303);
    const issued = sessionCookieFrom(res)!;
    expect(issued).not.toBeNull();
    expect(sessionIdOf(issued)).not.toBe(sessionIdOf(planted));
    expect(await sessionRow(sessionIdOf(planted))).toBeUndefined();
    expect((await getMe({ cookie: planted })).status).toBe(401);
    expect((await getMe({ cookie: issued })).body.email).toBe(person.email);
  });

  it("ends a real session planted by someone else when the victim signs in with it, and issues the victim a new one", async () => {
    const attacker = await createPerson("viewer", "fixation-attacker");
    const victim = await createPerson("engineer", "fixation-victim");
    const planted = await signedInCookie(attacker);
    for (const via of ["api", "form"] as const) {
      const cookie = via === "api" ? planted : await signedInCookie(attacker);
      const res =
        via === "api"
          ? await request(appUrl()).post("/api/v1/session").set("cookie", cookie).set("content-type", "application/json").send({ email: victim.email, password: victim.password })
          : // A signed-in visitor is sent away from /sign-in, so the form is read signed out and posted with the cookie.
            await postForm("/sign-in", isSignInForm, { email: victim.email, password: victim.password }, { cookie, formFrom: {} });
      const issued = sessionCookieFrom(res)!;
      expect(sessionIdOf(issued), via).not.toBe(sessionIdOf(cookie));
      expect(await sessionRow(sessionIdOf(cookie)), `${via}: the planted session is ended`).toBeUndefined();
      expect((await getMe({ cookie: issued })).body.email).toBe(victim.email);
    }
  });

  it("gives every sign-in its own id and keeps the cookie HttpOnly, SameSite=Lax and Secure", async () => {
    const person = await createPerson("viewer", "fixation-ids");
    const ids = new Set<string>();
    for (let i = 0; i < 3; i++) {
      const res = await apiSignIn(person.email, person.password);
      ids.add(sessionIdOf(sessionCookieFrom(res)!));
      const line = ([] as string[]).concat(res.headers["set-cookie"] ?? []).find((c) => c.startsWith(`${SESSION_COOKIE_NAME}=`))!;
      expect(line).toMatch(/HttpOnly/i);
      expect(line).toMatch(/SameSite=Lax/i);
      expect(line).toMatch(/Secure/i);
    }
    expect(ids.size).toBe(3);
  });
});

describe("CSRF on server actions (Next's origin check)", () => {
  it("refuses a form action posted from another origin and does not run it, and runs the same form from the page", async () => {
    const engineer = await createPerson("engineer", "csrf-action");
    const cookie = await signedInCookie(engineer);
    const isRename = (f: string) => f.includes('id="profile-name"');
    const forged = await postForm("/profile", isRename, { name: "Renamed by evil.example" }, { cookie, origin: EVIL });
    // Next answers its refusal with a 500 ("Invalid Server Actions request."); what matters is that nothing ran.
    expect(forged.status).toBeGreaterThanOrEqual(400);
    expect((await db()("auth_user").where({ id: engineer.id }).first()).name).toBe(engineer.name);
    const same = await postForm("/profile", isRename, { name: "Renamed on the page" }, { cookie });
    expect(same.status).toBe(200);
    expect((await db()("auth_user").where({ id: engineer.id }).first()).name).toBe("Renamed on the page");
  });

  it("refuses a forged sign-in form (login CSRF) and a forged change of the notification choice", async () => {
    const person = await createPerson("viewer", "csrf-login");
    const forgedSignIn = await postForm("/sign-in", isSignInForm, { email: person.email, password: person.password }, { origin: EVIL });
    expect(forgedSignIn.status).toBeGreaterThanOrEqual(400);
    expect(sessionCookieFrom(forgedSignIn)).toBeNull();
    const cookie = await signedInCookie(person);
    const before = await db()("notification_preferences").where({ user_id: person.id }).first();
    const forged = await postForm("/profile", (f) => f.includes('name="flagEmails"'), { flagEmails: "none" }, { cookie, origin: EVIL });
    expect(forged.status).toBeGreaterThanOrEqual(400);
    expect(await db()("notification_preferences").where({ user_id: person.id }).first()).toEqual(before);
  });
});

describe("CSRF on route handlers (the Origin check for cookie-authenticated writes)", () => {
  it("refuses a cookie-authenticated write from another origin or with no Origin, and takes the same-origin one", async () => {
    const engineer = await createPerson("engineer", "csrf-route");
    const cookie = await signedInCookie(engineer);
    const write = (origin: string | null) => {
      const req = request(appUrl()).post("/api/v1/projects").set("cookie", cookie).set("content-type", "application/json");
      if (origin) req.set("origin", origin);
      return req.send({ name: `Route CSRF ${randomBytes(3).toString("hex")}`, purpose: "" });
    };
    expect((await write(EVIL)).status).toBe(401);
    expect((await write(null)).status).toBe(401);
    expect((await write("null")).status).toBe(401);
    expect((await write(new URL(appUrl()).origin)).status).toBe(201);
    // Reads need no Origin: GET is safe.
    expect((await request(appUrl()).get("/api/v1/me").set("cookie", cookie).set("origin", EVIL)).status).toBe(200);
    // A sign-out from another origin is refused and leaves the session alone.
    expect((await request(appUrl()).delete("/api/v1/session").set("cookie", cookie).set("origin", EVIL)).status).toBe(401);
    expect((await getMe({ cookie })).status).toBe(200);
  });

  it("does not apply to bearer tokens, which a browser never sends on its own", async () => {
    const engineer = await createPerson("engineer", "csrf-bearer");
    const { token } = await createApiToken({ userId: engineer.id, name: "bench script" });
    const res = await request(appUrl()).post("/api/v1/projects").set("authorization", `Bearer ${token}`).set("origin", EVIL).set("content-type", "application/json").send({ name: `Bearer ${randomBytes(3).toString("hex")}`, purpose: "" });
    expect(res.status).toBe(201);
  });

  it("takes a sign-in only as JSON, so a cross-site form cannot post one", async () => {
    const person = await createPerson("viewer", "csrf-session");
    for (const type of ["application/x-www-form-urlencoded", "multipart/form-data; boundary=x", "text/plain"]) {
      const body = type.startsWith("multipart") ? `--x\r\nContent-Disposition: form-data; name="email"\r\n\r\n${person.email}\r\n--x--\r\n` : `email=${encodeURIComponent(person.email)}&password=${encodeURIComponent(person.password)}`;
      const res = await request(appUrl()).post("/api/v1/session").set("origin", EVIL).set("content-type", type).send(body);
      expect(res.status, type).toBe(415);
      expect(sessionCookieFrom(res), type).toBeNull();
    }
  });
});
