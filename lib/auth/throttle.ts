import { accountRetryAfterSeconds, ipRetryAfterSeconds } from "@/db/queries/sign-in-attempts";
import { TooManyRequestsError } from "@/lib/errors";

/** Failed sign-ins allowed per account within the window before it must wait (since its last success). */
export const ACCOUNT_FAILURE_LIMIT = 5;
/** Failed sign-ins allowed per client address, over all accounts, within the window. */
export const IP_FAILURE_LIMIT = 30;
/** The throttling window, in seconds. */
export const THROTTLE_WINDOW_SECONDS = 15 * 60;

function waitPhrase(seconds: number): string {
  if (seconds < 90) return `${seconds} seconds`;
  return `${Math.ceil(seconds / 60)} minutes`;
}

/**
 * Refuses a sign-in attempt while the account or the client address has too many recent failures.
 * @throws TooManyRequestsError with the wait in seconds (and words) until the next attempt is allowed
 */
export async function assertSignInAllowed(email: string, ip: string | null): Promise<void> {
  const [account, address] = await Promise.all([
    accountRetryAfterSeconds(email, ACCOUNT_FAILURE_LIMIT, THROTTLE_WINDOW_SECONDS),
    ip ? ipRetryAfterSeconds(ip, IP_FAILURE_LIMIT, THROTTLE_WINDOW_SECONDS) : Promise.resolve(null),
  ]);
  const wait = Math.max(account ?? 0, address ?? 0);
  if (wait > 0) {
    throw new TooManyRequestsError(`Too many failed sign-ins. Try again in ${waitPhrase(wait)}, or reset your password.`, wait);
  }
}
