// Roles, the named permissions they hold, and the pure predicates that say who may do
// what. The UI uses them to hide a button; the action/route wrapper and the page guard use
// the same table to refuse (403 / not found).

import type { UnitSystem } from "@/domain/units/format";
export const ROLES = ["fuser", "inspector", "clerk", "admin"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  fuser: "Fuser",
  inspector: "QA inspector",
  clerk: "Records clerk",
  admin: "Administrator",
};

/** The signed-in person as every guard sees it (reloaded from the database on each request). */
export type Actor = { id: number; name: string; email: string; roles: Role[]; unitSystem: UnitSystem; isActive: boolean };

export function isRole(value: string): value is Role {
  return (ROLES as readonly string[]).includes(value);
}

export function hasAnyRole(actor: Pick<Actor, "roles"> | null | undefined, roles: readonly Role[]): boolean {
  if (!actor) return false;
  return roles.some((r) => actor.roles.includes(r));
}

/**
 * Who may do what: every permission the app checks, and the roles that hold it (any one
 * suffices). Actions, route handlers, pages and the navigation name a permission; none
 * lists roles itself. A person holding several roles holds the union of their permissions.
 */
export const PERMISSIONS = {
  // At the trench.
  recordJoint: ["fuser"],
  uploadPhoto: ["fuser", "inspector", "admin"],
  attachTrace: ["fuser", "inspector"],
  viewTrace: ["fuser", "inspector"],
  /** A trace of any joint, not only of a joint one made oneself. */
  anyJointTrace: ["inspector"],
  viewProcedures: ["fuser", "inspector", "admin"],
  // Review.
  viewReview: ["inspector"],
  decideJoint: ["inspector"],
  grantOverride: ["inspector", "admin"],
  viewInsights: ["inspector", "admin"],
  /** Open a file not (yet) tied to a joint, or qualification evidence, someone else uploaded. */
  openAnyFile: ["inspector", "admin"],
  // The register and traceability.
  viewRegister: ["clerk", "inspector", "admin"],
  exportRegister: ["clerk", "inspector", "admin"],
  traceLots: ["clerk", "inspector", "admin"],
  printJointLabels: ["clerk", "inspector", "admin"],
  // Coils.
  listCoils: ["clerk", "admin"],
  receiveCoils: ["clerk", "admin"],
  moveCoils: ["clerk", "admin"],
  printLabels: ["clerk", "admin"],
  // The office.
  manageCrew: ["admin"],
  manageEquipment: ["admin"],
  manageJobs: ["admin"],
  manageProcedures: ["admin"],
  viewMailbox: ["admin"],
  /** The organisation's settings (its time zone). */
  manageOrganisation: ["admin"],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

/** Does this person hold the permission (through any one of their roles)? */
export function can(actor: Pick<Actor, "roles"> | null | undefined, permission: Permission): boolean {
  return hasAnyRole(actor, PERMISSIONS[permission]);
}

export const canRecordJoint = (a: Pick<Actor, "roles">) => can(a, "recordJoint");
/** The office work of an administrator: people, equipment, jobs and procedures. */
export const canManageOffice = (a: Pick<Actor, "roles">) => (["manageCrew", "manageEquipment", "manageJobs", "manageProcedures"] as const).every((p) => can(a, p));
export const canReceiveCoils = (a: Pick<Actor, "roles">) => can(a, "receiveCoils");
export const canTrace = (a: Pick<Actor, "roles">) => can(a, "traceLots");
export const canExportRegister = (a: Pick<Actor, "roles">) => can(a, "exportRegister");
export const canOverrideBlock = (a: Pick<Actor, "roles">) => can(a, "grantOverride");

/** An inspector may decide a joint, never one they made themselves. */
export function canReview(actor: Pick<Actor, "id" | "roles">, joint: { fuserId: number }): boolean {
  return can(actor, "decideJoint") && actor.id !== joint.fuserId;
}

/** A trace of this joint may be read: any joint's for an inspector, a fuser's own joints. */
export function canViewTraceOf(actor: Pick<Actor, "id" | "roles">, joint: { fuserId: number }): boolean {
  return can(actor, "anyJointTrace") || (can(actor, "viewTrace") && actor.id === joint.fuserId);
}

/** A trace may be attached to this joint: any joint by an inspector, a fuser's own joints. */
export function canAttachTraceTo(actor: Pick<Actor, "id" | "roles">, joint: { fuserId: number }): boolean {
  return can(actor, "anyJointTrace") || (can(actor, "attachTrace") && actor.id === joint.fuserId);
}

/** The work screens and who sees each in the navigation (our own screen names); "signed-in" is everyone. */
export type Screen = { id: string; label: string; href: string; permission: Permission | "signed-in" };

export const SCREENS: readonly Screen[] = [
  { id: "today", label: "Today", href: "/", permission: "signed-in" },
  // Second, so a phone shows it without scrolling the navigation: everyone's own mail.
  { id: "notifications", label: "Notifications", href: "/notifications", permission: "signed-in" },
  { id: "trench", label: "Trench", href: "/trench", permission: "recordJoint" },
  { id: "register", label: "Register", href: "/register", permission: "viewRegister" },
  { id: "review", label: "Review", href: "/review", permission: "viewReview" },
  { id: "overrides", label: "Overrides", href: "/trench/overrides", permission: "grantOverride" },
  { id: "coils", label: "Coils", href: "/coils", permission: "listCoils" },
  { id: "trace", label: "Trace", href: "/trace", permission: "traceLots" },
  { id: "jobs", label: "Jobs", href: "/jobs", permission: "manageJobs" },
  { id: "crew", label: "Crew", href: "/crew", permission: "manageCrew" },
  { id: "equipment", label: "Equipment", href: "/equipment", permission: "manageEquipment" },
  { id: "procedures", label: "Procedures", href: "/procedures", permission: "viewProcedures" },
  { id: "insights", label: "Insights", href: "/insights", permission: "viewInsights" },
  { id: "mailbox", label: "Mailbox", href: "/mailbox", permission: "viewMailbox" },
];

/** The permission itself, or any signed-in person for "signed-in". */
export function allows(actor: Pick<Actor, "roles"> | null | undefined, permission: Permission | "signed-in"): boolean {
  if (!actor) return false;
  return permission === "signed-in" || can(actor, permission);
}

export function screensFor(actor: Pick<Actor, "roles">): Screen[] {
  return SCREENS.filter((s) => allows(actor, s.permission));
}

/** Nobody can remove the last active admin (by deactivation or by taking the role away). */
export function wouldRemoveLastAdmin(
  change: { isAdminBefore: boolean; isAdminAfter: boolean; isActiveAfter: boolean },
  activeAdminCount: number,
): boolean {
  const losesAdmin = change.isAdminBefore && (!change.isAdminAfter || !change.isActiveAfter);
  return losesAdmin && activeAdminCount <= 1;
}
