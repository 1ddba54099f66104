// Retry schedule of the mail outbox: exponential back-off with a ceiling, and the number
// of attempts after which a mail is marked failed (kept and shown, never dropped).
// common practice (no published source): doubling delays capped at an hour, as mail
// transfer agents and job queues commonly do.

/** Attempts before a mail is given up and marked failed. */
export const MAX_MAIL_ATTEMPTS = 8;
/** Delay after the first failed attempt, s. */
export const FIRST_RETRY_DELAY_S = 10;
/** Longest delay between attempts, s. */
export const MAX_RETRY_DELAY_S = 3600;

/**
 * Delay before the next attempt after `attempts` failed attempts (1-based), s:
 * 10, 20, 40, 80 … capped at 3600. Whole seconds, no jitter (SKIP LOCKED already keeps
 * several senders from taking the same mail).
 */
export function retryDelayS(attempts: number, options: { firstDelayS?: number; maxDelayS?: number } = {}): number {
  const first = options.firstDelayS ?? FIRST_RETRY_DELAY_S;
  const max = options.maxDelayS ?? MAX_RETRY_DELAY_S;
  const n = Math.max(1, Math.floor(attempts));
  return Math.min(max, first * 2 ** (n - 1));
}

export type AfterFailure = { status: "queued"; nextAttemptAt: Date } | { status: "failed"; nextAttemptAt: Date };

/** What happens to a mail whose attempt number `attempts` (1-based, this one included) failed at `now`. */
export function afterFailedAttempt(attempts: number, now: Date, options: { maxAttempts?: number; firstDelayS?: number; maxDelayS?: number } = {}): AfterFailure {
  const maxAttempts = options.maxAttempts ?? MAX_MAIL_ATTEMPTS;
  if (attempts >= maxAttempts) return { status: "failed", nextAttemptAt: now };
  return { status: "queued", nextAttemptAt: new Date(now.getTime() + retryDelayS(attempts, options) * 1000) };
}
