// Checks shared by the people use cases: the house password policy and that a crew exists.
import "server-only";
import { listCrews } from "@/database/queries/users";
import { passwordProblem } from "@/domain/crew/password-policy";
import { AppError } from "@/domain/result";
import { assertPasswordAllowed } from "@/app/_lib/common-passwords";
import { logger } from "@/app/_lib/log";

/**
 * The house password policy (length, common passwords, own name). If the common-password
 * list is not installed, the length and own-name rules still apply and a warning is logged.
 */
export function checkPassword(password: string, who: { name: string; email: string }): void {
  try {
    assertPasswordAllowed(password, who);
  } catch (error) {
    if (error instanceof AppError) throw error;
    logger.warn({ err: String((error as Error).message) }, "common-password list unavailable; checking length and own name only");
    const problem = passwordProblem(password, { commonPasswords: [], userInputs: [who.name, who.email, who.email.split("@")[0] ?? ""] });
    if (problem) throw new AppError("invalid", `Check Password: ${problem}`, { password: [problem] });
  }
}

export async function checkCrew(crewId: number | null | undefined): Promise<void> {
  if (!crewId) return;
  const crews = await listCrews();
  if (!crews.some((c) => c.id === crewId)) throw new AppError("invalid", "Check Crew: Crew does not exist.", { crewId: ["Crew does not exist."] });
}
