import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { createApiToken } from "@/lib/auth/api-tokens";
import { authenticateRequest } from "@/lib/auth/authenticate-request";
import { closeLucia } from "@/lib/auth/lucia";
import { createPerson, signedInCookie } from "./helpers";

// authenticateRequest against the real database with hand-made Requests: the Origin rule for cookie-authenticated
// writes is easiest to see here, since /api/v1 write routes belong to other parts of the app.

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

/** The UPDATE statements on `table` that `work` sends through the app's Knex pool. */
async function updatesOf(table: string, work: () => Promise<unknown>): Promise<number> {
  let count = 0;
  const listener = (query: { sql: string }) => {
    if (query.sql.startsWith(`update "${table}"`)) count++;
  };
  db().on("query", listener);
  try {
    await work();
  } finally {
    db().off("query", listener);
  }
  return count;
}

function req(method: string, headers: Record<string, string>): Request {
  return new Request("http://127.0.0.1:3100/api/v1/anything", { method, headers: { host: "127.0.0.1:3100", ...headers } });
}

describe("authenticateRequest", () => {
  it("accepts the session cookie on GET without an Origin", async () => {
    const person = await createPerson("technician");
    const cookie = await signedInCookie(person);
    expect(await authenticateRequest(req("GET", { cookie }))).toMatchObject({ id: person.id, role: "technician" });
  });

  it("accepts a cookie-authenticated POST only when Origin names this host", async () => {
    const person = await createPerson("technician");
    const cookie = await signedInCookie(person);
    expect(await authenticateRequest(req("POST", { cookie, origin: "http://127.0.0.1:3100" }))).toMatchObject({ id: person.id });
    expect(await authenticateRequest(req("POST", { cookie, origin: "http://evil.example" }))).toBeNull();
    expect(await authenticateRequest(req("DELETE", { cookie }))).toBeNull();
  });

  it("records a session's last use at most once a minute, without a write on the requests in between", async () => {
    const person = await createPerson("viewer");
    const cookie = await signedInCookie(person);
    const seen = async () => (await db()("auth_user").where({ id: person.id }).first("last_seen_at")).last_seen_at as Date | null;
    const first = await updatesOf("auth_user", () => authenticateRequest(req("GET", { cookie })));
    const firstSeen = await seen();
    expect(firstSeen).not.toBeNull();
    expect(first).toBeLessThanOrEqual(1);
    // Within the minute: the stored time, read with the session, is fresh, so no UPDATE is even sent.
    expect(await updatesOf("auth_user", () => authenticateRequest(req("GET", { cookie })))).toBe(0);
    expect(await seen()).toEqual(firstSeen);
    // Aged past the minute in the database: the next request writes it again.
    await db()("auth_user").where({ id: person.id }).update({ last_seen_at: db().raw("now() - interval '2 minutes'") });
    const aged = await seen();
    expect(await updatesOf("auth_user", () => authenticateRequest(req("GET", { cookie })))).toBe(1);
    expect((await seen())!.getTime()).toBeGreaterThan(aged!.getTime() + 60_000);
  });

  it("records a token's last use at most once a minute, without a write on the requests in between", async () => {
    const person = await createPerson("viewer");
    const { token, summary } = await createApiToken({ userId: person.id, name: "last-use test" });
    const bearer = () => authenticateRequest(req("GET", { authorization: `Bearer ${token}` }));
    const used = async () => (await db()("api_tokens").where({ id: summary.id }).first("last_used_at")).last_used_at as Date | null;
    expect(await used()).toBeNull();
    expect(await updatesOf("api_tokens", bearer)).toBe(1);
    const firstUse = await used();
    expect(firstUse).not.toBeNull();
    expect(await updatesOf("api_tokens", bearer)).toBe(0);
    expect(await used()).toEqual(firstUse);
    await db()("api_tokens").where({ id: summary.id }).update({ last_used_at: db().raw("now() - interval '2 minutes'") });
    const aged = await used();
    expect(await updatesOf("api_tokens", bearer)).toBe(1);
    expect((await used())!.getTime()).toBeGreaterThan(aged!.getTime() + 60_000);
  });

  it("returns null for no credentials at all", async () => {
    expect(await authenticateRequest(req("GET", {}))).toBeNull();
  });
});
