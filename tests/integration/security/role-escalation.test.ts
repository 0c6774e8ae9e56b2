import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { createApiToken } from "@/lib/auth/api-tokens";
import { closeLucia } from "@/lib/auth/lucia";
import { refusalMessage } from "@/lib/auth/require-permission";
import { api, captureCsv, createFixture, sendJson, uploadCapture, type Fixture } from "../api/helpers";
import { createPerson, getMe, linkIn, signedInCookie, submitForm, uniqueEmail, waitForMail, type TestPerson } from "../auth/helpers";
import { storedCounts } from "../hostile/helpers";
import { postForm } from "./helpers";

// Attempts to gain a role or act beyond one: through the people and profile actions, extra form fields,
// the invitation, API tokens of low roles on higher routes, and another person's token or upload slot.

let fx: Fixture;
let admin: { person: TestPerson; cookie: string };

beforeAll(async () => {
  fx = await createFixture("escalation");
  const person = await createPerson("admin", "escalation-admin");
  admin = { person, cookie: await signedInCookie(person) };
}, 120_000);

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

async function roleOf(userId: string): Promise<string> {
  return (await db()("auth_user").where({ id: userId }).first()).role;
}

describe("a technician making itself admin", () => {
  it("is refused by the role action, even with the admin's form, and by extra fields on its own profile form", async () => {
    const tech = await createPerson("technician", "climber");
    const cookie = await signedInCookie(tech);
    const viaPeople = await postForm("/people", (f) => f.includes(tech.id) && f.includes('name="role"'), { role: "admin" }, { cookie, formFrom: { cookie: admin.cookie } });
    expect(viaPeople.text).toContain(refusalMessage("technician", "people:manage").replace(/'/g, "&#x27;"));
    const viaProfile = await submitForm("/profile", (f) => f.includes('id="profile-name"'), { name: "Still a technician", role: "admin", status: "active" }, { cookie });
    expect(viaProfile.status).toBe(200);
    expect(await roleOf(tech.id)).toBe("technician");
    expect((await getMe({ cookie })).body.role).toBe("technician");
    // No API route takes a role.
    for (const method of ["patch", "put", "post"] as const) {
      const res = await api(method, "/api/v1/me", { token: (await createApiToken({ userId: tech.id, name: "climb" })).token }).send({ role: "admin" });
      expect(res.status, `${method} /api/v1/me`).toBe(405);
    }
    expect(await roleOf(tech.id)).toBe("technician");
  });

  it("cannot pick its role when accepting an invitation", async () => {
    const email = uniqueEmail("invited-viewer");
    await submitForm("/people", (f) => f.includes('id="invite-email"'), { email, role: "viewer" }, { cookie: admin.cookie });
    const path = linkIn(await waitForMail(email, /invitation/i), "/invitation/");
    const password = "a viewer who wants more";
    const accepted = await submitForm(path, (f) => f.includes('name="confirm"'), { name: "Invited Viewer", password, confirm: password, role: "admin" });
    expect(accepted.status).toBe(303);
    const user = await db()("auth_user").where({ email }).first();
    expect(user.role).toBe("viewer");
  });
});

describe("API tokens of low roles on higher routes", () => {
  it("a viewer's token cannot upload, by multipart or slot, and stores nothing", async () => {
    const before = await storedCounts();
    expect((await uploadCapture(fx.buildId, fx.team.viewer, captureCsv(411e3, 31))).status).toBe(403);
    expect((await sendJson("post", "/api/v1/uploads", fx.team.viewer, { buildId: fx.buildId, filename: "v.csv", sizeBytes: 100 })).status).toBe(403);
    expect(await storedCounts()).toEqual(before);
  });

  it("viewer and technician tokens cannot use the engineer routes", async () => {
    const engineerRoutes: [string, string, unknown][] = [
      ["post", "/api/v1/projects", { name: "Not mine to make" }],
      ["patch", `/api/v1/projects/${fx.projectId}`, { name: "Renamed by a lower role" }],
      ["post", `/api/v1/projects/${fx.projectId}/designs`, { name: "X", topology: "tank", parts: { L: { value: "10u" }, C: { value: "1n" } } }],
      ["patch", `/api/v1/designs/${fx.designId}`, { spec: { targetHz: "1M", toleranceValue: 50, toleranceUnit: "percent" } }],
      ["post", `/api/v1/builds/${fx.buildId}/review`, { decision: "accept", reason: "looks fine to me" }],
    ];
    for (const who of [fx.team.viewer, fx.team.technician]) {
      for (const [method, path, body] of engineerRoutes) {
        const res = await sendJson(method as "post", path, who, body);
        expect(res.status, `${who.role} ${method} ${path}`).toBe(403);
      }
    }
    const build = await db()("builds").where({ id: fx.buildId }).first();
    expect(build.status).toBe("open");
    const project = await db()("projects").where({ id: fx.projectId }).first();
    expect(project.name).not.toBe("Renamed by a lower role");
  });

  it("a body cannot choose the id, the creator or the time of what it creates", async () => {
    const forged = { id: "11111111-1111-4111-8111-111111111111", ownerId: fx.team.viewer.id, owner_id: fx.team.viewer.id, createdAt: "2000-01-01T00:00:00Z" };
    const res = await sendJson("post", "/api/v1/projects", fx.team.engineer, { name: `Forged ${Date.now()}`, purpose: "", ...forged });
    expect(res.status).toBe(201);
    const row = await db()("projects").where({ id: res.body.id }).first();
    expect(row.id).not.toBe(forged.id);
    expect(row.owner_id).toBe(fx.team.engineer.id);
    expect(new Date(row.created_at).getUTCFullYear()).toBeGreaterThan(2000);
  });
});

describe("someone else's credentials and uploads", () => {
  it("a person cannot revoke another person's token through the profile form", async () => {
    const victim = await createPerson("engineer", "token-victim");
    const victimToken = await createApiToken({ userId: victim.id, name: "victim's script" });
    const attacker = await createPerson("admin", "token-attacker");
    const cookie = await signedInCookie(attacker);
    await createApiToken({ userId: attacker.id, name: "attacker's own" });
    const res = await submitForm("/profile", (f) => f.includes('name="tokenId"'), { tokenId: victimToken.summary.id }, { cookie });
    expect(res.text).toMatch(/not found/i);
    const row = await db()("api_tokens").where({ id: victimToken.summary.id }).first();
    expect(row.revoked_at).toBeNull();
    expect((await getMe({ token: victimToken.token })).status).toBe(200);
  });

  it("a technician cannot complete or cancel another technician's upload slot", async () => {
    const csv = captureCsv(411e3, 77);
    const slot = await sendJson("post", "/api/v1/uploads", fx.team.technician, { buildId: fx.buildId, filename: "theirs.csv", sizeBytes: Buffer.byteLength(csv), contentType: "text/csv" });
    expect(slot.status).toBe(201);
    const other = await createPerson("technician", "slot-thief");
    const otherToken = (await createApiToken({ userId: other.id, name: "thief" })).token;
    const res = await sendJson("post", `/api/v1/uploads/${slot.body.slotId}/complete`, { token: otherToken }, {});
    expect(res.status).toBe(404);
    expect(await db()("runs").where({ id: slot.body.runId }).first()).toBeUndefined();
  });
});
