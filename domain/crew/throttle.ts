// Sign-in throttling rule: at most 5 failures per account and 20 per address in 15 minutes
// (common practice for online guessing limits; OWASP authentication guidance).
export const THROTTLE_WINDOW_MS = 15 * 60 * 1000;
export const MAX_FAILURES_PER_ACCOUNT = 5;
export const MAX_FAILURES_PER_ADDRESS = 20;

export function isSignInThrottled(failures: { byEmail: number; byAddress: number }): boolean {
  return failures.byEmail >= MAX_FAILURES_PER_ACCOUNT || failures.byAddress >= MAX_FAILURES_PER_ADDRESS;
}
