import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { roles, type Role } from "@/lib/auth/permissions";
import { refusalMessage } from "@/lib/auth/require-permission";
import { appUrl, auditRows, createPerson, formsOf, getPage, signedInCookie, submitForm, uniqueEmail, type TestPerson } from "./helpers";

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

// The table: only admins invite, change roles, disable accounts and read the audit log;
// every signed-in role manages its own profile and tokens.
const admins = (role: Role) => role === "admin";

async function personAndCookie(role: Role): Promise<{ person: TestPerson; cookie: string }> {
  const person = await createPerson(role);
  return { person, cookie: await signedInCookie(person) };
}

/**
 * Posts a /people action as `cookie`. A non-admin's /people page has no forms, so the action reference comes
 * from an admin's view of the page: this is what a caller who learnt the action id would send.
 */
async function peopleActionAs(cookie: string, pick: (f: string) => boolean, fields: Record<string, string>, adminCookie: string) {
  const page = await getPage("/people", adminCookie);
  const form = formsOf(page.text).find((f) => pick(f.inner));
  if (!form) throw new Error("no such form on /people");
  const req = request(appUrl()).post("/people").redirects(0).set("origin", new URL(appUrl()).origin).set("cookie", cookie);
  for (const [k, v] of Object.entries({ ...form.hidden, ...fields })) req.field(k, v);
  return req;
}

describe("people:manage and audit:read, role by role", () => {
  for (const role of roles) {
    it(`${role}: ${admins(role) ? "may" : "may not"} open /people and /audit`, async () => {
      const { cookie } = await personAndCookie(role);
      for (const [path, action] of [["/people", "people:manage"], ["/audit", "audit:read"]] as const) {
        const res = await getPage(path, cookie);
        expect(res.status).toBe(200);
        if (admins(role)) expect(res.text).not.toContain("This page is not open to your role");
        else expect(res.text).toContain(refusalMessage(role, action).replace(/'/g, "&#x27;"));
      }
      const dash = await getPage("/dashboard", cookie);
      expect(dash.text.includes('href="/people"'), "People link in the shell").toBe(admins(role));
    });

    it(`${role}: ${admins(role) ? "may" : "may not"} invite, change a role or disable an account`, async () => {
      const admin = await personAndCookie("admin");
      const { cookie } = await personAndCookie(role);
      const target = await createPerson("viewer", "target");
      const email = uniqueEmail(`by-${role}`);

      const inviteRes = await peopleActionAs(cookie, (f) => f.includes('id="invite-email"'), { email, role: "viewer" }, admin.cookie);
      const roleRes = await peopleActionAs(cookie, (f) => f.includes(target.id) && f.includes('name="role"'), { role: "engineer" }, admin.cookie);
      const statusRes = await peopleActionAs(cookie, (f) => f.includes(target.id) && f.includes('name="status"'), {}, admin.cookie);

      const invited = await db()("invitations").where({ email }).first();
      const after = await db()("auth_user").where({ id: target.id }).first();
      if (admins(role)) {
        expect(invited).toBeDefined();
        expect(after.role).toBe("engineer");
        expect(after.status).toBe("disabled");
      } else {
        const refusal = refusalMessage(role, "people:manage");
        for (const res of [inviteRes, roleRes, statusRes]) expect(res.text).toContain(refusal.replace(/'/g, "&#x27;"));
        expect(invited).toBeUndefined();
        expect(after.role).toBe("viewer");
        expect(after.status).toBe("active");
      }
    });
  }

  it("anonymous: the people actions answer with the sign-in sentence and change nothing", async () => {
    const admin = await personAndCookie("admin");
    const email = uniqueEmail("anon");
    const res = await peopleActionAs("", (f) => f.includes('id="invite-email"'), { email, role: "admin" }, admin.cookie);
    expect(res.text).toContain("Sign in first");
    expect(await db()("invitations").where({ email }).first()).toBeUndefined();
  });

  it("disabling an account ends its sessions at once and writes the audit row", async () => {
    const admin = await personAndCookie("admin");
    const target = await personAndCookie("technician");
    const res = await submitForm("/people", (f) => f.includes(target.person.id) && f.includes('name="status"'), {}, { cookie: admin.cookie });
    expect(res.status).toBe(200);
    expect((await getPage("/dashboard", target.cookie)).status).toBe(307);
    expect(await auditRows({ actor_id: admin.person.id, action: "user.disabled", entity_id: target.person.id })).toHaveLength(1);
  });

  it("a role change is written to the audit log with the old and the new role", async () => {
    const admin = await personAndCookie("admin");
    const target = await createPerson("technician");
    await submitForm("/people", (f) => f.includes(target.id) && f.includes('name="role"'), { role: "engineer" }, { cookie: admin.cookie });
    const rows = await auditRows({ actor_id: admin.person.id, action: "user.role-changed", entity_id: target.id });
    expect(rows.map((r) => r.detail)).toEqual([{ from: "technician", to: "engineer" }]);
  });
});

describe("the last admin", () => {
  it("cannot demote or disable themselves; once there is a second admin, they can", async () => {
    const last = await personAndCookie("admin");
    // Make this the only active admin for the length of the test, then put the others back.
    const others: string[] = (await db()("auth_user").where({ role: "admin", status: "active" }).whereNot({ id: last.person.id }).select("id")).map((r) => r.id);
    await db()("auth_user").whereIn("id", others).update({ status: "disabled" });
    try {
      const demote = await submitForm("/people", (f) => f.includes(last.person.id) && f.includes('name="role"'), { role: "engineer" }, { cookie: last.cookie });
      expect(demote.text).toContain("You are the last admin");
      const disable = await submitForm("/people", (f) => f.includes(last.person.id) && f.includes('name="status"'), {}, { cookie: last.cookie });
      expect(disable.text).toContain("You are the last admin");
      const row = await db()("auth_user").where({ id: last.person.id }).first();
      expect([row.role, row.status]).toEqual(["admin", "active"]);

      const second = await createPerson("admin", "second-admin");
      const ok = await submitForm("/people", (f) => f.includes(last.person.id) && f.includes('name="role"'), { role: "engineer" }, { cookie: last.cookie });
      expect(ok.status).toBe(200);
      expect((await db()("auth_user").where({ id: last.person.id }).first()).role).toBe("engineer");
      await db()("auth_user").where({ id: second.id }).update({ status: "disabled" });
    } finally {
      await db()("auth_user").whereIn("id", others).update({ status: "active" });
    }
  });
});
