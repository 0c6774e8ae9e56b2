import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { RESET_LINK_INVALID_MESSAGE } from "@/lib/auth/password-reset";
import { listHeldMessages } from "@/lib/mail/outbox";
import {
  apiSignIn,
  auditRows,
  createPerson,
  getMe,
  getPage,
  linkIn,
  sessionCookieFrom,
  signedInCookie,
  submitForm,
  uniqueEmail,
  waitForMail,
} from "./helpers";

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

const isEmailForm = (f: string) => f.includes('name="email"');
const isNewPasswordForm = (f: string) => f.includes('name="confirm"');
const NEW_PASSWORD = "a new bench passphrase";

async function requestReset(email: string) {
  const res = await submitForm("/forgot-password", isEmailForm, { email });
  expect(res.status).toBe(200);
  return res;
}

describe("password reset by e-mail", () => {
  it("e-mails a single-use link; using it sets the password, ends every other session and signs in", async () => {
    const person = await createPerson("technician");
    const elsewhere = await signedInCookie(person);
    const answer = await requestReset(person.email);
    expect(answer.text).toContain("a reset link is on its way");

    const mail = await waitForMail(person.email, /Reset your Tankbook password/);
    const path = linkIn(mail, "/reset-password/");
    const page = await getPage(path);
    expect(page.status).toBe(200);
    expect(page.text).toContain("Choose a new password");
    expect(page.text).toContain(person.email);

    const done = await submitForm(path, isNewPasswordForm, { password: NEW_PASSWORD, confirm: NEW_PASSWORD });
    expect(done.status).toBe(303);
    expect(done.headers.location).toBe("/dashboard?welcome=password-reset");
    const fresh = sessionCookieFrom(done)!;
    expect((await getMe({ cookie: fresh })).status).toBe(200);
    expect((await getMe({ cookie: elsewhere })).status).toBe(401);

    expect((await apiSignIn(person.email, person.password)).status).toBe(401);
    expect((await apiSignIn(person.email, NEW_PASSWORD)).status).toBe(201);
    expect(await auditRows({ actor_id: person.id, action: "password-reset.completed" })).toHaveLength(1);

    const reused = await getPage(path);
    expect(reused.text).toContain(RESET_LINK_INVALID_MESSAGE);
  });

  it("answers an unknown address exactly like a known one and sends nothing", async () => {
    const email = uniqueEmail("ghost");
    const res = await requestReset(email);
    expect(res.text).toContain(`If ${email} belongs to an active account, a reset link is on its way.`);
    await new Promise((r) => setTimeout(r, 500));
    expect(await listHeldMessages({ to: email })).toHaveLength(0);
  });

  it("refuses an expired link", async () => {
    const person = await createPerson("viewer");
    await requestReset(person.email);
    const path = linkIn(await waitForMail(person.email, /Reset your Tankbook password/), "/reset-password/");
    await db()("password_resets").where({ user_id: person.id }).update({ expires_at: new Date(Date.now() - 1000) });
    const page = await getPage(path);
    expect(page.status).toBe(200);
    expect(page.text).toContain(RESET_LINK_INVALID_MESSAGE);
    expect(page.text).not.toContain('name="confirm"');
  });

  it("keeps the form and explains when the two passwords differ or are too short", async () => {
    const person = await createPerson("viewer");
    await requestReset(person.email);
    const path = linkIn(await waitForMail(person.email, /Reset your Tankbook password/), "/reset-password/");
    const res = await submitForm(path, isNewPasswordForm, { password: "short", confirm: "other" });
    expect(res.status).toBe(200);
    expect(res.text).toContain("Use at least 10 characters.");
    expect(res.text).toContain("The two passwords differ.");
    expect((await apiSignIn(person.email, person.password)).status).toBe(201);
  });
});
