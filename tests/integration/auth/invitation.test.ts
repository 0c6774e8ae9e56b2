import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { INVITATION_INVALID_MESSAGE } from "@/lib/auth/invitations";
import { closeLucia } from "@/lib/auth/lucia";
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

const isInviteForm = (f: string) => f.includes('id="invite-email"');
const isAcceptForm = (f: string) => f.includes('name="confirm"');
const PASSWORD = "invited bench passphrase";

async function invite(adminCookie: string, email: string, role: string) {
  return submitForm("/people", isInviteForm, { email, role }, { cookie: adminCookie });
}

describe("invitations by e-mail", () => {
  it("lets an invited person accept by e-mail, choose name and password, and sign in with the invited role", async () => {
    const admin = await createPerson("admin");
    const cookie = await signedInCookie(admin);
    const email = uniqueEmail("newcomer");
    const sent = await invite(cookie, email, "engineer");
    expect(sent.status).toBe(200);
    expect(sent.text).toContain(`Invitation sent to ${email} as engineer.`);
    expect(await auditRows({ actor_id: admin.id, action: "invitation.created" }).then((r) => r[0]?.detail)).toEqual({ email, role: "engineer" });

    const mail = await waitForMail(email, /Your invitation to Tankbook/);
    expect(mail.text).toContain(`${admin.name} invited you`);
    const path = linkIn(mail, "/invitation/");
    const page = await getPage(path);
    expect(page.status).toBe(200);
    expect(page.text).toContain(email);
    expect(page.text).toContain("engineer");

    const accepted = await submitForm(path, isAcceptForm, { name: "Nadia Ferreira", password: PASSWORD, confirm: PASSWORD });
    expect(accepted.status).toBe(303);
    expect(accepted.headers.location).toBe("/dashboard?welcome=invited");
    const me = await getMe({ cookie: sessionCookieFrom(accepted)! });
    expect(me.body).toMatchObject({ email, name: "Nadia Ferreira", role: "engineer" });

    const signIn = await apiSignIn(email, PASSWORD);
    expect(signIn.status).toBe(201);
    expect(signIn.body.user.role).toBe("engineer");

    const again = await getPage(path);
    expect(again.text).toContain(INVITATION_INVALID_MESSAGE);
  });

  it("makes the old link useless when the invitation is resent, and every link useless once revoked", async () => {
    const admin = await createPerson("admin");
    const cookie = await signedInCookie(admin);
    const email = uniqueEmail("resend");
    await invite(cookie, email, "viewer");
    const firstPath = linkIn(await waitForMail(email, /invitation/i), "/invitation/");
    const invitation = await db()("invitations").where({ email }).first();

    const resent = await submitForm("/people", (f) => f.includes(invitation.id) && f.includes("Resend"), {}, { cookie });
    expect(resent.status).toBe(200);
    let secondPath = firstPath;
    for (let i = 0; i < 40 && secondPath === firstPath; i++) {
      const links = (await listHeldMessages({ to: email })).map((m) => linkIn(m, "/invitation/"));
      secondPath = links.find((l) => l !== firstPath) ?? firstPath;
      if (secondPath === firstPath) await new Promise((r) => setTimeout(r, 200));
    }
    expect(secondPath).not.toBe(firstPath);
    expect((await getPage(firstPath)).text).toContain(INVITATION_INVALID_MESSAGE);
    expect((await getPage(secondPath)).text).toContain("Welcome to Tankbook");

    const revoked = await submitForm("/people", (f) => f.includes(invitation.id) && f.includes("Revoke"), {}, { cookie });
    expect(revoked.status).toBe(200);
    expect((await getPage(secondPath)).text).toContain(INVITATION_INVALID_MESSAGE);
    expect(await auditRows({ actor_id: admin.id, action: "invitation.revoked", entity_id: invitation.id })).toHaveLength(1);
  });

  it("refuses an expired invitation link", async () => {
    const admin = await createPerson("admin");
    const cookie = await signedInCookie(admin);
    const email = uniqueEmail("late");
    await invite(cookie, email, "technician");
    const path = linkIn(await waitForMail(email, /invitation/i), "/invitation/");
    await db()("invitations").where({ email }).update({ expires_at: new Date(Date.now() - 1000) });
    expect((await getPage(path)).text).toContain(INVITATION_INVALID_MESSAGE);
  });

  it("says so when the address already has an account or an open invitation", async () => {
    const admin = await createPerson("admin");
    const cookie = await signedInCookie(admin);
    const existing = await createPerson("viewer");
    expect((await invite(cookie, existing.email, "viewer")).text).toContain(`${existing.email} already has an account.`);
    const email = uniqueEmail("twice");
    await invite(cookie, email, "viewer");
    expect((await invite(cookie, email, "viewer")).text).toContain(`${email} is already invited; resend that invitation instead.`);
  });

  it("shows field errors for a bad address and an unknown role", async () => {
    const admin = await createPerson("admin");
    const cookie = await signedInCookie(admin);
    const res = await invite(cookie, "not-an-address", "overlord");
    expect(res.text).toContain("Enter an e-mail address like name@lab.example.");
    expect(res.text).toContain("Choose a role: viewer, technician, engineer or admin.");
  });
});
