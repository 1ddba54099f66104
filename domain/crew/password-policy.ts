// Password rules for new and reset passwords, following NIST SP 800-63B §5.1.1.2
// (memorized secrets): a minimum length (we require MIN_PASSWORD_LENGTH = 12, the
// guideline asks for at least 8), no composition rules, and a check against a list of
// commonly used or breached passwords. The list is passed in (domain/ reads no files);
// app/_lib/common-passwords.ts loads it from a registry package.
import { MIN_PASSWORD_LENGTH } from "./schemas";

/**
 * bcrypt work factor of every stored password: people's own (app/_lib/auth hashPassword) and
 * the demo accounts the seed creates. source: OWASP Password Storage Cheat Sheet (bcrypt with
 * a work factor of 10 or more); 12 takes about a quarter of a second here.
 */
export const BCRYPT_COST = 12;

/** Lower-cases and trims for comparison; the lists hold lower-case entries. */
export function normalisePassword(password: string): string {
  return password.normalize("NFKC").trim().toLowerCase();
}

function has(list: ReadonlySet<string> | readonly string[], value: string): boolean {
  return list instanceof Set ? list.has(value) : (list as readonly string[]).includes(value);
}

/**
 * True when the password is on the list, ignoring case, or is a listed password padded with
 * digits or punctuation at either end ("password1234", "!!qwertyuiop") or repeated
 * ("monkeymonkeymonkey"): guessing tools try those variants first.
 * `list` holds lower-case entries (a Set for speed with large lists).
 */
export function isCommonPassword(password: string, list: ReadonlySet<string> | readonly string[]): boolean {
  const p = normalisePassword(password);
  if (!p) return false;
  if (has(list, p)) return true;
  const core = p.replace(/^[\d\W_]+|[\d\W_]+$/gu, "");
  if (core.length >= 4 && core !== p && has(list, core)) return true;
  const unit = /^(.{3,}?)\1+$/u.exec(p)?.[1];
  if (unit && (has(list, unit) || unit.length <= 4)) return true;
  return false;
}

/**
 * The first reason a new password is refused, or null when it is acceptable.
 * `userInputs` are words from the account itself (name, e-mail local part): a password
 * that is one of them is refused too (NIST SP 800-63B: "context-specific words").
 */
export function passwordProblem(password: string, { commonPasswords, userInputs = [] }: { commonPasswords: ReadonlySet<string> | readonly string[]; userInputs?: readonly string[] }): string | null {
  if ([...password].length < MIN_PASSWORD_LENGTH) return `Password must be at least ${MIN_PASSWORD_LENGTH} characters.`;
  if (isCommonPassword(password, commonPasswords)) return "This password is on a list of commonly used passwords. Choose a longer phrase of your own.";
  const p = normalisePassword(password).replace(/[\W_]+/gu, "");
  for (const input of userInputs) {
    const word = normalisePassword(input).replace(/[\W_]+/gu, "");
    if (word.length >= 4 && p === word) return "The password must not be your name or e-mail address.";
  }
  return null;
}
