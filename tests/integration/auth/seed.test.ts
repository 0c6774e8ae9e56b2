import { execFile } from "node:child_process";
import { mkdtempSync, readFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { apiSignIn } from "./helpers";

const run = promisify(execFile);
const root = path.resolve(import.meta.dirname, "../../..");

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("scripts/seed.ts", () => {
  it("refuses to run with NODE_ENV=production unless --allow-production is given", async () => {
    const err = await run(process.execPath, ["--import", "tsx", "scripts/seed.ts"], { cwd: root, env: { ...process.env, NODE_ENV: "production" } as NodeJS.ProcessEnv }).catch((e) => e);
    expect(err.code).toBe(2);
    expect(err.stderr).toContain("refusing to load demo accounts with NODE_ENV=production");
  });

  it("creates one demo account per role on demo.test once, lists them with the password, and changes nothing the second time", async () => {
    const file = path.join(mkdtempSync(path.join(os.tmpdir(), "tankbook-seed-")), "demo-accounts.txt");
    const env: NodeJS.ProcessEnv = { ...process.env, NODE_ENV: "development" };
    await run(process.execPath, ["--import", "tsx", "scripts/seed.ts", "--accounts-file", file], { cwd: root, env });
    const rows = await db()("auth_user").where("email", "like", "%@demo.test").select("email", "role", "id");
    expect(rows.map((r) => r.role).sort()).toEqual(["admin", "engineer", "technician", "viewer"]);
    const listing = readFileSync(file, "utf8");
    for (const r of rows) expect(listing).toContain(r.email);
    const password = /password\s+(\S+)/.exec(listing)?.[1];
    expect(password).toBeDefined();
    expect((await apiSignIn("ada.admin@demo.test", password!)).status).toBe(201);

    await run(process.execPath, ["--import", "tsx", "scripts/seed.ts", "--accounts-file", file], { cwd: root, env });
    const again = await db()("auth_user").where("email", "like", "%@demo.test").select("id");
    expect(again.map((r) => r.id).sort()).toEqual(rows.map((r) => r.id).sort());
  });
});
