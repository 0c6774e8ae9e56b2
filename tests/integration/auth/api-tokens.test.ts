import { execFile } from "node:child_process";
import path from "node:path";
import { promisify } from "node:util";
import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { createApiToken } from "@/lib/auth/api-tokens";
import { hashSecretToken } from "@/lib/auth/secret-token";
import { closeLucia } from "@/lib/auth/lucia";
import { roles } from "@/lib/auth/permissions";
import { appUrl, auditRows, createPerson, getMe, getPage, signedInCookie, submitForm } from "./helpers";

const run = promisify(execFile);
const root = path.resolve(import.meta.dirname, "../../..");

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("API tokens", () => {
  for (const role of roles) {
    it(`a ${role}'s token, made on the profile page, acts with the ${role} role and is shown only once`, async () => {
      const person = await createPerson(role);
      const cookie = await signedInCookie(person);
      const res = await submitForm("/profile", (f) => f.includes('id="token-name"'), { name: "bench 3 capture script" }, { cookie });
      expect(res.status).toBe(200);
      const token = /value="(tbk_[A-Za-z0-9_-]{43})"/.exec(res.text)?.[1];
      expect(token).toBeDefined();
      const me = await getMe({ token });
      expect(me.status).toBe(200);
      expect(me.body).toEqual({ id: person.id, email: person.email, name: person.name, role });

      const row = await db()("api_tokens").where({ user_id: person.id }).first();
      expect(row.token_hash).toBe(hashSecretToken(token!));
      expect(JSON.stringify(row)).not.toContain(token!);
      expect(row.last_used_at).not.toBeNull();
      const later = await getPage("/profile", cookie);
      expect(later.text).toContain("bench 3 capture script");
      expect(later.text).not.toContain(token!);
      expect(await auditRows({ actor_id: person.id, action: "token.created", entity_id: row.id })).toHaveLength(1);
    });
  }

  it("refuses a revoked token, a token of a disabled owner, a made-up token and a non-Bearer scheme", async () => {
    const person = await createPerson("engineer");
    const cookie = await signedInCookie(person);
    const { token, summary } = await createApiToken({ userId: person.id, name: "to revoke" });
    expect((await getMe({ token })).status).toBe(200);
    const revoked = await submitForm("/profile", (f) => f.includes(summary.id), {}, { cookie });
    expect(revoked.status).toBe(200);
    expect((await getMe({ token })).status).toBe(401);
    expect(await auditRows({ actor_id: person.id, action: "token.revoked", entity_id: summary.id })).toHaveLength(1);

    const other = await createPerson("technician");
    const live = await createApiToken({ userId: other.id, name: "owner disabled" });
    await db()("auth_user").where({ id: other.id }).update({ status: "disabled" });
    expect((await getMe({ token: live.token })).status).toBe(401);

    expect((await getMe({ token: "tbk_" + "A".repeat(43) })).status).toBe(401);
    const basic = await request(appUrl()).get("/api/v1/me").set("authorization", `Basic ${Buffer.from("a:b").toString("base64")}`);
    expect(basic.status).toBe(401);
  });

  it("does not fall back to the session cookie when a Bearer token is sent and is bad", async () => {
    const person = await createPerson("viewer");
    const cookie = await signedInCookie(person);
    const res = await request(appUrl()).get("/api/v1/me").set("cookie", cookie).set("authorization", "Bearer tbk_nope");
    expect(res.status).toBe(401);
  });
});

describe("npm run -s create-token", () => {
  it("prints only the token, which then authenticates as that user", async () => {
    const person = await createPerson("technician");
    const { stdout, stderr } = await run(process.execPath, ["--import", "tsx", "scripts/create-token.ts", "--email", person.email, "--name", "ci check"], { cwd: root, env: process.env });
    expect(stdout).toMatch(/^tbk_[A-Za-z0-9_-]{43}\n$/);
    expect(stderr).toBe("");
    const me = await getMe({ token: stdout.trim() });
    expect(me.body.role).toBe("technician");
    expect((await db()("api_tokens").where({ user_id: person.id }).first()).name).toBe("ci check");
  });

  it("exits 1 with a message on stderr and nothing on stdout for an unknown address", async () => {
    const err = await run(process.execPath, ["--import", "tsx", "scripts/create-token.ts", "--email", "nobody@auth-tests.test"], { cwd: root, env: process.env }).catch((e) => e);
    expect(err.code).toBe(1);
    expect(err.stdout).toBe("");
    expect(err.stderr).toContain("no account has the e-mail address nobody@auth-tests.test");
  });
});
