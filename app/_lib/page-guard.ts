// Page-level convenience: send signed-out visitors to sign-in and show "not allowed" for
// the wrong role. The real guard is in every action and route handler (guard.ts).
import { notFound, redirect } from "next/navigation";
import type { UserRecord } from "@/database/queries/users";
import { hasAnyRole, type Role } from "@/domain/roles";
import { currentUser } from "./session";

export async function requireUser(roles?: readonly Role[]): Promise<UserRecord> {
  const user = await currentUser();
  if (!user) redirect("/sign-in");
  if (roles && !hasAnyRole(user, roles)) notFound();
  return user;
}
