// Sign-in throttling rule: growing delays, never a lockout. Failed attempts are counted per
// account (from clients the account has not signed in on before), per address, and per
// trusted device (a device cookie set at a successful sign-in). After a few free failures
// each further failure makes that counter wait before the next attempt is checked: 2 s,
// 4 s, 8 s, … doubling up to 15 minutes. A device that signed in to the account before is
// judged only by its own counter, so an attacker hammering the account cannot keep its owner
// out. Failures are remembered for 24 hours after the first.
// source: OWASP Authentication Cheat Sheet ("Protect against automated attacks": account
// lockout lets an attacker deny access; use growing delays instead) and OWASP "Slow Down
// Online Guessing Attacks with Device Cookies". The numbers are common practice.

export type ThrottleCounter = "account" | "address" | "device";

/** Failures allowed before the first delay, per counter. */
export const FREE_FAILURES: Record<ThrottleCounter, number> = { account: 5, address: 20, device: 5 };
export const FIRST_DELAY_S = 2;
export const MAX_DELAY_S = 15 * 60;
export const FAILURE_MEMORY_S = 24 * 60 * 60;

/** Seconds the counter must wait after its `failures`-th failure (0 while failures are free). */
export function delayAfterFailures(failures: number, counter: ThrottleCounter): number {
  const over = failures - FREE_FAILURES[counter];
  if (!Number.isFinite(over) || over <= 0) return 0;
  return Math.min(MAX_DELAY_S, FIRST_DELAY_S * 2 ** Math.min(over - 1, 30));
}

/** "8 seconds", "2 minutes": how long to wait, rounded up, in plain words. */
export function waitInWords(ms: number): string {
  const s = Math.max(1, Math.ceil(ms / 1000));
  if (s < 120) return `${s} second${s === 1 ? "" : "s"}`;
  const m = Math.ceil(s / 60);
  return `${m} minutes`;
}
