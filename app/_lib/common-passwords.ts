// The list of common passwords new passwords are checked against: the "passwords-common"
// dictionary of the @zxcvbn-ts/language-common package (about 30,000 of the most used
// passwords from public breach corpora), loaded once per process from node_modules.
// It is required at run time by name (not bundled), so the server bundle stays small.
import { createRequire } from "node:module";
import path from "node:path";
import { passwordProblem } from "@/domain/crew/password-policy";
import { AppError, describeFieldErrors } from "@/domain/result";

export const COMMON_PASSWORDS_PACKAGE = "@zxcvbn-ts/language-common";

let cached: ReadonlySet<string> | null = null;

/** The lower-cased common-password list; throws with the install command if the package is missing. */
export function commonPasswords(): ReadonlySet<string> {
  if (cached) return cached;
  const requireFromApp = createRequire(path.join(process.cwd(), "package.json"));
  let mod: { dictionary?: Record<string, unknown> };
  try {
    mod = requireFromApp(COMMON_PASSWORDS_PACKAGE) as typeof mod;
  } catch (error) {
    throw new Error(`The common-password list is missing: install it with \`npm i -E ${COMMON_PASSWORDS_PACKAGE}@4.1.3\` (${(error as Error).message.split("\n")[0]})`);
  }
  const list = mod.dictionary?.["passwords-common"];
  if (!Array.isArray(list) || list.length < 1000) throw new Error(`${COMMON_PASSWORDS_PACKAGE} has no "passwords-common" list`);
  cached = new Set(list.map((p) => String(p).toLowerCase()));
  return cached;
}

/**
 * Refuses a new password (add person, reset password) that is too short, common, or the
 * person's own name or e-mail: throws AppError("invalid") with the problem on `field`, its
 * message naming the field by `label` (the words on the form), never by `field`.
 */
export function assertPasswordAllowed(password: string, { name, email, field = "password", label = "Password" }: { name?: string; email?: string; field?: string; label?: string } = {}): void {
  const userInputs = [name ?? "", email ?? "", (email ?? "").split("@")[0]];
  const problem = passwordProblem(password, { commonPasswords: commonPasswords(), userInputs });
  if (problem) throw new AppError("invalid", describeFieldErrors({ [field]: [problem] }, { [field]: label }), { [field]: [problem] });
}
