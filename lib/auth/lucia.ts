import { NodePostgresAdapter } from "@lucia-auth/adapter-postgresql";
import { Lucia, TimeSpan } from "lucia";
import pg from "pg";
import type { Role } from "./permissions";

// lucia's Postgres adapter wants a pg Pool; Knex keeps its own. This second pool stays small and is made on
// first use from the same DATABASE_URL, cached on globalThis (dev reloads) and remade when the URL changes (tests).

/** How long a session lives without use; lucia extends it when more than half of it has passed. */
export const SESSION_LIFETIME = new TimeSpan(14, "d");
export const SESSION_COOKIE_NAME = "tankbook_session";

function createLucia(pool: pg.Pool) {
  return new Lucia(new NodePostgresAdapter(pool, { user: "auth_user", session: "user_session" }), {
    sessionExpiresIn: SESSION_LIFETIME,
    sessionCookie: {
      name: SESSION_COOKIE_NAME,
      // Server components cannot set cookies, so the cookie cannot follow each extension of the session.
      // It is long-lived instead and the session's expires_at in PostgreSQL decides (lucia's advice for App Router).
      expires: false,
      // Secure everywhere but development: `next start` (the test stack too) runs with NODE_ENV=production, and
      // curl, Chromium and our own tests send Secure cookies back to http://127.0.0.1 (STACK-NOTES §6).
      attributes: { secure: process.env.NODE_ENV !== "development", sameSite: "lax", path: "/" },
    },
    // Only these columns ever leave the adapter; password_hash never does.
    // last_seen_at comes with the row lucia already reads, so the once-a-minute "seen" write needs no extra query.
    getUserAttributes: (row) => ({ email: row.email, name: row.name, role: row.role, status: row.status, lastSeenAt: row.last_seen_at }),
  });
}

declare module "lucia" {
  interface Register {
    Lucia: ReturnType<typeof createLucia>;
    DatabaseUserAttributes: { email: string; name: string; role: Role; status: "active" | "disabled"; last_seen_at: Date | null };
    DatabaseSessionAttributes: { ip: string | null; user_agent: string | null };
  }
}

const globalForLucia = globalThis as unknown as {
  tankbookLucia?: { url: string; pool: pg.Pool; lucia: ReturnType<typeof createLucia> };
};

function databaseUrl(): string {
  return process.env.DATABASE_URL ?? "postgres://postgres@127.0.0.1:54329/tankbook";
}

/** The lucia instance for the current DATABASE_URL. */
export function lucia(): ReturnType<typeof createLucia> {
  const url = databaseUrl();
  const cached = globalForLucia.tankbookLucia;
  if (cached?.url === url) return cached.lucia;
  if (cached) void cached.pool.end();
  const pool = new pg.Pool({ connectionString: url, max: Number(process.env.AUTH_POOL_MAX ?? 4) });
  // An idle client that loses its server (a restart of PostgreSQL) must not crash the process.
  pool.on("error", (err) => console.error("auth session pool:", err.message));
  const instance = createLucia(pool);
  globalForLucia.tankbookLucia = { url, pool, lucia: instance };
  return instance;
}

/** Closes the session pool (scripts and tests call this before exiting). */
export async function closeLucia(): Promise<void> {
  const cached = globalForLucia.tankbookLucia;
  globalForLucia.tankbookLucia = undefined;
  if (cached) await cached.pool.end();
}
