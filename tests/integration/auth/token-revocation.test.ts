import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { createApiToken } from "@/lib/auth/api-tokens";
import { closeLucia } from "@/lib/auth/lucia";
import { auditRows, createPerson, getMe, getPage, linkIn, signedInCookie, submitForm, waitForMail } from "./helpers";

// Taking an account back must end every credential of whoever was in, tokens included (OWASP Session
// Management Cheat Sheet: invalidate sessions after a password change; tokens are credentials too).

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("API tokens when the owner takes the account back", () => {
  it("are revoked by sign out everywhere with the box ticked (the default), and the audit event counts them", async () => {
    const person = await createPerson("engineer");
    const cookie = await signedInCookie(person);
    const profile = await getPage("/profile", cookie);
    // The box is ticked on the page; a browser sends "on" for it.
    expect(profile.text).toMatch(/<input[^>]*type="checkbox"[^>]*name="revokeTokens"[^>]*checked=""/);
    const { token } = await createApiToken({ userId: person.id, name: "made by an intruder" });
    const { token: second } = await createApiToken({ userId: person.id, name: "bench script" });
    expect((await getMe({ token })).status).toBe(200);
    const out = await submitForm("/profile", (f) => f.includes("Sign out everywhere"), { revokeTokens: "on" }, { cookie });
    expect(out.status).toBe(303);
    expect(out.headers.location).toContain("signed-out=everywhere-tokens");
    expect((await getMe({ token })).status).toBe(401);
    expect((await getMe({ token: second })).status).toBe(401);
    expect((await getMe({ cookie })).status).toBe(401);
    const events = await auditRows({ actor_id: person.id, action: "sign-out.everywhere" });
    expect(events.at(-1)?.detail).toEqual({ revokeTokens: true, tokensRevoked: 2 });
  });

  it("stay when sign out everywhere is sent with the box unticked, the sessions still end, and the audit event says so", async () => {
    const person = await createPerson("technician");
    const cookie = await signedInCookie(person);
    const otherDevice = await signedInCookie(person);
    const { token } = await createApiToken({ userId: person.id, name: "bench script" });
    // An unticked checkbox is not part of the form data at all.
    const out = await submitForm("/profile", (f) => f.includes("Sign out everywhere"), {}, { cookie });
    expect(out.status).toBe(303);
    expect(out.headers.location).toContain("signed-out=everywhere");
    expect(out.headers.location).not.toContain("tokens");
    expect((await getMe({ cookie })).status).toBe(401);
    expect((await getMe({ cookie: otherDevice })).status).toBe(401);
    expect((await getMe({ token })).status).toBe(200);
    const events = await auditRows({ actor_id: person.id, action: "sign-out.everywhere" });
    expect(events.at(-1)?.detail).toEqual({ revokeTokens: false, tokensRevoked: 0 });
    // A forged value is no tick: the tokens stay and the sessions still end.
    const again = await signedInCookie(person);
    const forged = await submitForm("/profile", (f) => f.includes("Sign out everywhere"), { revokeTokens: "yes please" }, { cookie: again });
    expect(forged.status).toBe(303);
    expect((await getMe({ cookie: again })).status).toBe(401);
    expect((await getMe({ token })).status).toBe(200);
  });

  it("are revoked by a password reset", async () => {
    const person = await createPerson("technician");
    const { token } = await createApiToken({ userId: person.id, name: "made by an intruder" });
    expect((await getMe({ token })).status).toBe(200);
    const asked = await submitForm("/forgot-password", (f) => f.includes('name="email"'), { email: person.email });
    expect(asked.status).toBe(200);
    const mail = await waitForMail(person.email, /Reset your Tankbook password/);
    const path = linkIn(mail, "/reset-password/");
    expect((await getPage(path)).status).toBe(200);
    const done = await submitForm(path, (f) => f.includes('name="confirm"'), { password: "the owner's new passphrase", confirm: "the owner's new passphrase" });
    expect(done.status).toBe(303);
    expect((await getMe({ token })).status).toBe(401);
    const events = await auditRows({ actor_id: person.id, action: "password-reset.completed" });
    expect(events.at(-1)?.detail.tokensRevoked).toBe(1);
  });
});
