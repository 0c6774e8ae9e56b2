import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { linkIn, uniqueEmail, waitForMail } from "../../integration/auth/helpers";
import { launchBrowser } from "../../helpers/browser";
import { appUrl } from "../../helpers/stack";
import { checkFinalPage, freshPage, journeyPerson, signIn, tabTo, type JourneyPerson } from "./helpers";

// An admin invites a person from the People page; the invitee opens the link in the e-mail the fake SMTP
// server holds, chooses a name and password, lands signed in, signs out and signs in again with them.

let browser: Browser;
let admin: JourneyPerson;

beforeAll(async () => {
  admin = await journeyPerson("admin", "journey-admin");
  browser = await launchBrowser();
}, 60_000);

afterAll(async () => {
  await browser?.close();
  await closeDb();
  await closeLucia();
});

describe("admin journey", () => {
  it("invites a technician, who accepts from the e-mail and signs in", async () => {
    const email = uniqueEmail("journey-invitee");
    const password = "a bench of my own 2026";
    const adminSide = await freshPage(browser);
    await signIn(adminSide.page, admin);
    await adminSide.page.getByRole("link", { name: "People", exact: true }).first().click();
    await adminSide.page.waitForURL(/\/people$/);
    await adminSide.page.locator("#invite-email").fill(email);
    await adminSide.page.locator("#invite-role").selectOption("technician");
    // The send button is reached by keyboard from the role.
    await adminSide.page.locator("#invite-role").focus();
    await tabTo(adminSide.page, (el) => el.tag === "button" && /Send invitation/.test(el.text), "the send button", 5);
    await adminSide.page.keyboard.press("Enter");
    await adminSide.page.getByText(`Invitation sent to ${email} as technician.`).waitFor({ timeout: 20_000 });
    await checkFinalPage(adminSide.page, "admin-people");
    expect(adminSide.errors).toEqual([]);
    await adminSide.context.close();

    const mail = await waitForMail(email, /invitation/i);
    expect(mail.text).toContain(`${admin.name} invited you`);
    const link = linkIn(mail, "/invitation/");

    const invitee = await freshPage(browser, 390);
    await invitee.page.goto(`${appUrl()}${link}`);
    await invitee.page.getByLabel("Your name").fill("Noor Haddad");
    await invitee.page.locator('input[name="password"]').fill(password);
    await invitee.page.locator('input[name="confirm"]').fill(password);
    await invitee.page.getByRole("button", { name: "Create my account" }).click();
    await invitee.page.waitForURL(/\/dashboard/, { timeout: 20_000 });
    const user = await db()("auth_user").where({ email }).first();
    expect([user.name, user.role]).toEqual(["Noor Haddad", "technician"]);

    await invitee.page.getByRole("button", { name: "Sign out" }).click();
    await invitee.page.waitForURL((url) => !url.pathname.startsWith("/dashboard"), { timeout: 20_000 });
    await signIn(invitee.page, { email, password });
    const me = await invitee.page.evaluate(async () => (await fetch("/api/v1/me")).json());
    expect(me).toMatchObject({ email, name: "Noor Haddad", role: "technician" });
    await checkFinalPage(invitee.page, "invitee-dashboard");
    expect(invitee.errors).toEqual([]);
    await invitee.context.close();
  }, 180_000);
});
