import { db } from "@/db/index";
import { pruneSignInAttempts } from "@/db/queries/sign-in-attempts";
import { THROTTLE_WINDOW_SECONDS } from "./throttle";

/**
 * Deletes what the auth tables no longer need: expired sessions (lucia drops one only when it is presented),
 * sign-in attempts older than a day (throttling looks back 15 minutes), and reset links closed or expired
 * more than 30 days ago. Safe to run from any number of workers at any time.
 * @returns how many rows of each kind were deleted
 */
export async function pruneAuthTables(): Promise<{ sessions: number; signInAttempts: number; passwordResets: number }> {
  const sessions = await db()("user_session").where("expires_at", "<=", db().fn.now()).delete();
  const signInAttempts = await pruneSignInAttempts(Math.max(86_400, THROTTLE_WINDOW_SECONDS));
  const passwordResets = await db()("password_resets")
    .where("expires_at", "<", db().raw("now() - interval '30 days'"))
    .orWhere("used_at", "<", db().raw("now() - interval '30 days'"))
    .delete();
  return { sessions, signInAttempts, passwordResets };
}
