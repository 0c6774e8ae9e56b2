import { accountRetryAfterSeconds, ipRetryAfterSeconds, isKnownAddress } from "@/db/queries/sign-in-attempts";
import { TooManyRequestsError } from "@/lib/errors";

// The rule (OWASP Authentication Cheat Sheet, "Account lockout": lockouts must not let an attacker lock the
// owner out):
// - one account from one address: 5 failures in 15 minutes (since its last success) and that address waits;
//   someone guessing elsewhere cannot lock the owner's own address out with it;
// - one address over all accounts: 30 failures and it waits (guessing across many accounts);
// - one account over all addresses: 50 failures and every address waits, except an address the account
//   has a live session from (a device its owner signed in from), so spread-out guessing is stopped and the
//   owner with the right password still gets in from a known device.

/** Failed sign-ins allowed per account and address within the window before that address must wait. */
export const ACCOUNT_FAILURE_LIMIT = 5;
/** Failed sign-ins allowed per account over all addresses before unknown addresses must wait. */
export const ACCOUNT_WIDE_FAILURE_LIMIT = 50;
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
  const [account, address, accountWide, known] = await Promise.all([
    accountRetryAfterSeconds(email, ACCOUNT_FAILURE_LIMIT, THROTTLE_WINDOW_SECONDS, ip),
    ip ? ipRetryAfterSeconds(ip, IP_FAILURE_LIMIT, THROTTLE_WINDOW_SECONDS) : Promise.resolve(null),
    accountRetryAfterSeconds(email, ACCOUNT_WIDE_FAILURE_LIMIT, THROTTLE_WINDOW_SECONDS),
    ip ? isKnownAddress(email, ip) : Promise.resolve(false),
  ]);
  const wait = Math.max(account ?? 0, address ?? 0, known ? 0 : (accountWide ?? 0));
  if (wait > 0) {
    throw new TooManyRequestsError(`Too many failed sign-ins. Try again in ${waitPhrase(wait)}, or reset your password.`, wait);
  }
}
