// The Outbox page outside development (the test app is `next start`, NODE_ENV=production): an admin sees every
// held e-mail, but the password-reset links of other accounts are hidden, because reading one is enough to take
// the account over (OWASP Forgot Password Cheat Sheet: a reset token is a credential). The admin's own mail shows whole.
import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { RESET_LINK_HIDDEN } from "@/lib/mail/outbox-view";
import { createPerson, getPage, linkIn, signedInCookie, submitForm, waitForMail } from "../auth/helpers";

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

const isEmailForm = (f: string) => f.includes('name="email"');

async function resetLinkFor(email: string): Promise<string> {
  const res = await submitForm("/forgot-password", isEmailForm, { email });
  expect(res.status).toBe(200);
  return linkIn(await waitForMail(email, /Reset your Tankbook password/), "/reset-password/");
}

describe("Outbox page outside development", () => {
  it("shows another account's reset e-mail with the link hidden, and the admin's own reset link whole", async () => {
    const admin = await createPerson("admin", "outbox-admin");
    const victim = await createPerson("technician", "outbox-victim");
    const victimLink = await resetLinkFor(victim.email);
    const ownLink = await resetLinkFor(admin.email);

    const page = await getPage("/outbox", await signedInCookie(admin));
    expect(page.status).toBe(200);
    expect(page.text).toContain(victim.email);
    expect(page.text).toContain(RESET_LINK_HIDDEN);
    expect(page.text).not.toContain(victimLink);
    expect(page.text).not.toContain(victimLink.split("/").pop());
    expect(page.text).toContain(ownLink);

    // The link still works for its owner: hiding it changed the page, not the mail.
    expect((await getPage(victimLink)).status).toBe(200);
  });
});
