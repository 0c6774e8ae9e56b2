import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { pruneAuthTables } from "@/lib/auth/maintenance";
import { createPerson, sessionIdOf, sessionRow, signedInCookie, uniqueEmail } from "./helpers";

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("pruneAuthTables", () => {
  it("deletes expired sessions and day-old sign-in attempts, and keeps live ones", async () => {
    const person = await createPerson("viewer");
    const [live, dead] = [await signedInCookie(person), await signedInCookie(person)];
    await db()("user_session").where({ id: sessionIdOf(dead) }).update({ expires_at: new Date(Date.now() - 1000) });
    const email = uniqueEmail("old-attempt");
    await db()("sign_in_attempts").insert([
      { email, ip: null, succeeded: false, created_at: new Date(Date.now() - 2 * 86_400_000) },
      { email, ip: null, succeeded: false },
    ]);
    const pruned = await pruneAuthTables();
    expect(pruned.sessions).toBeGreaterThanOrEqual(1);
    expect(await sessionRow(sessionIdOf(dead))).toBeUndefined();
    expect(await sessionRow(sessionIdOf(live))).toBeDefined();
    expect(await db()("sign_in_attempts").where({ email })).toHaveLength(1);
  });
});
