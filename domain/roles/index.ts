// Roles and the pure predicates that say who may do what. The UI uses them to hide a
// button; the action/route wrapper uses the same predicates to refuse (403).

export const ROLES = ["fuser", "inspector", "clerk", "admin"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  fuser: "Fuser",
  inspector: "QA inspector",
  clerk: "Records clerk",
  admin: "Administrator",
};

/** The signed-in person as every guard sees it (reloaded from the database on each request). */
export type Actor = { id: number; name: string; email: string; roles: Role[]; unitSystem: "si" | "us"; isActive: boolean };

export function isRole(value: string): value is Role {
  return (ROLES as readonly string[]).includes(value);
}

export function hasAnyRole(actor: Pick<Actor, "roles"> | null | undefined, roles: readonly Role[]): boolean {
  if (!actor) return false;
  return roles.some((r) => actor.roles.includes(r));
}

export const canRecordJoint = (a: Pick<Actor, "roles">) => hasAnyRole(a, ["fuser"]);
export const canManageOffice = (a: Pick<Actor, "roles">) => hasAnyRole(a, ["admin"]);
export const canReceiveCoils = (a: Pick<Actor, "roles">) => hasAnyRole(a, ["clerk", "admin"]);
export const canTrace = (a: Pick<Actor, "roles">) => hasAnyRole(a, ["clerk", "inspector", "admin"]);
export const canExportRegister = (a: Pick<Actor, "roles">) => hasAnyRole(a, ["clerk", "inspector", "admin"]);
export const canOverrideBlock = (a: Pick<Actor, "roles">) => hasAnyRole(a, ["inspector", "admin"]);

/** An inspector may decide a joint, never one they made themselves. */
export function canReview(actor: Pick<Actor, "id" | "roles">, joint: { fuserId: number }): boolean {
  return hasAnyRole(actor, ["inspector"]) && actor.id !== joint.fuserId;
}

/** The work screens and who sees each in the navigation (our own screen names). */
export type Screen = { id: string; label: string; href: string; roles: readonly Role[] };

export const SCREENS: readonly Screen[] = [
  { id: "today", label: "Today", href: "/", roles: ROLES },
  { id: "trench", label: "Trench", href: "/trench", roles: ["fuser"] },
  { id: "register", label: "Register", href: "/register", roles: ["clerk", "inspector", "admin"] },
  { id: "review", label: "Review", href: "/review", roles: ["inspector"] },
  { id: "overrides", label: "Overrides", href: "/trench/overrides", roles: ["inspector", "admin"] },
  { id: "coils", label: "Coils", href: "/coils", roles: ["clerk", "admin"] },
  { id: "trace", label: "Trace", href: "/trace", roles: ["clerk", "inspector", "admin"] },
  { id: "jobs", label: "Jobs", href: "/jobs", roles: ["admin"] },
  { id: "crew", label: "Crew", href: "/crew", roles: ["admin"] },
  { id: "equipment", label: "Equipment", href: "/equipment", roles: ["admin"] },
  { id: "procedures", label: "Procedures", href: "/procedures", roles: ["admin", "inspector", "fuser"] },
  { id: "insights", label: "Insights", href: "/insights", roles: ["inspector", "admin"] },
  { id: "mailbox", label: "Mailbox", href: "/mailbox", roles: ["admin"] },
];

export function screensFor(actor: Pick<Actor, "roles">): Screen[] {
  return SCREENS.filter((s) => hasAnyRole(actor, s.roles));
}

/** Nobody can remove the last active admin (by deactivation or by taking the role away). */
export function wouldRemoveLastAdmin(
  change: { isAdminBefore: boolean; isAdminAfter: boolean; isActiveAfter: boolean },
  activeAdminCount: number,
): boolean {
  const losesAdmin = change.isAdminBefore && (!change.isAdminAfter || !change.isActiveAfter);
  return losesAdmin && activeAdminCount <= 1;
}
