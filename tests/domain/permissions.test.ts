// Who may do what, checked against the product's own role table rather than against
// domain/roles itself. Source: the Beadline product design, "People and roles":
//
//   | role           | what Beadline gives them                                                  |
//   | fuser          | scan the two coil labels, get the pressure plan, time the phases, record |
//   |                | the joint, see at once whether it is within limits                        |
//   | inspector (QA) | a review queue of out-of-limits and unreviewed joints, the evidence       |
//   |                | (values, photos, pressure trace), a decision with a note, trends per      |
//   |                | fuser, machine and procedure                                              |
//   | records clerk  | the joint register: filter, sort, search, export to a spreadsheet, print  |
//   |                | QR labels, answer lot-recall questions                                    |
//   | admin          | people, roles, qualifications, equipment, procedures, jobs                |
//
// "A person may hold more than one role." An inspector never decides a joint they made.
// Rows marked "(office read)" extend a clerk's register/trace reading to the inspector, who
// needs the evidence, and to the admin, who answers for the records; rows marked
// "(office)" give the admin what the clerk does with coils.
import { describe, expect, it } from "vitest";
import {
  PERMISSIONS,
  ROLES,
  SCREENS,
  can,
  canAttachTraceTo,
  canExportRegister,
  canManageOffice,
  canOverrideBlock,
  canReceiveCoils,
  canRecordJoint,
  canReview,
  canTrace,
  canViewTraceOf,
  screensFor,
  type Permission,
  type Role,
} from "@/domain/roles";

const Y = true;
const N = false;

//                                   fuser inspector clerk admin   why
const TABLE: Record<Permission, [boolean, boolean, boolean, boolean, string]> = {
  recordJoint: /*             */ [Y, N, N, N, "fuser: record the joint"],
  uploadPhoto: /*             */ [Y, Y, N, Y, "fuser: the joint's evidence (photos); inspector: the evidence; admin: qualification evidence"],
  attachTrace: /*             */ [Y, Y, N, N, "fuser: the phases of their joint; inspector: the evidence (pressure trace)"],
  viewTrace: /*               */ [Y, Y, N, N, "fuser: their own joint's trace; inspector: the evidence (pressure trace)"],
  anyJointTrace: /*           */ [N, Y, N, N, "inspector: the evidence of every joint (a fuser: only their own)"],
  viewProcedures: /*          */ [Y, Y, N, Y, "fuser: the pressure plan follows the procedure; inspector: trends per procedure; admin: procedures"],
  viewReview: /*              */ [N, Y, N, N, "inspector: a review queue"],
  decideJoint: /*             */ [N, Y, N, N, "inspector: a decision with a note"],
  grantOverride: /*           */ [N, Y, N, Y, "inspector: decides what may go on; admin: qualifications and equipment that block a joint"],
  viewInsights: /*            */ [N, Y, N, Y, "inspector: trends per fuser, machine and procedure; admin: people and equipment"],
  openAnyFile: /*             */ [N, Y, N, Y, "inspector: the evidence; admin: qualification evidence"],
  viewRegister: /*            */ [N, Y, Y, Y, "records clerk: the joint register (office read)"],
  exportRegister: /*          */ [N, Y, Y, Y, "records clerk: export to a spreadsheet (office read)"],
  traceLots: /*               */ [N, Y, Y, Y, "records clerk: answer lot-recall questions (office read)"],
  printJointLabels: /*        */ [N, Y, Y, Y, "records clerk: print QR labels (office read)"],
  listCoils: /*               */ [N, N, Y, Y, "records clerk: the coils behind the register (office)"],
  receiveCoils: /*            */ [N, N, Y, Y, "records clerk: receives coils (office)"],
  moveCoils: /*               */ [N, N, Y, Y, "records clerk: keeps the coil records (office)"],
  printLabels: /*             */ [N, N, Y, Y, "records clerk: print QR labels (office)"],
  manageCrew: /*              */ [N, N, N, Y, "admin: people, roles, qualifications"],
  manageEquipment: /*         */ [N, N, N, Y, "admin: equipment"],
  manageJobs: /*              */ [N, N, N, Y, "admin: jobs"],
  manageProcedures: /*        */ [N, N, N, Y, "admin: procedures"],
  viewMailbox: /*             */ [N, N, N, Y, "admin: the mail the people of the office are sent"],
  manageOrganisation: /*      */ [N, N, N, Y, "admin: the organisation's time zone (an admin setting)"],
};

const ROLE_ORDER: Role[] = ["fuser", "inspector", "clerk", "admin"];
const ROWS = (Object.entries(TABLE) as [Permission, [boolean, boolean, boolean, boolean, string]][]).flatMap(([permission, row]) =>
  ROLE_ORDER.map((role, i) => ({ permission, role, allowed: row[i] as boolean, why: row[4] })),
);

describe("permissions", () => {
  it("the table in domain/roles names exactly the permissions listed here", () => {
    expect(Object.keys(PERMISSIONS).sort()).toEqual(Object.keys(TABLE).sort());
  });

  it.each(ROWS)("$role → $permission: $allowed ($why)", ({ permission, role, allowed }) => {
    expect(can({ roles: [role] }, permission)).toBe(allowed);
  });

  it("a person with several roles holds the union of their permissions; nobody signed out holds any", () => {
    for (const permission of Object.keys(TABLE) as Permission[]) {
      const row = TABLE[permission];
      expect(can({ roles: ["fuser", "clerk"] }, permission)).toBe(row[0] || row[2]);
      expect(can({ roles: [...ROLES] }, permission)).toBe(true);
      expect(can({ roles: [] }, permission)).toBe(false);
      expect(can(null, permission)).toBe(false);
    }
  });

  it("an inspector decides joints, never their own; a fuser decides none", () => {
    expect(canReview({ id: 7, roles: ["inspector"] }, { fuserId: 8 })).toBe(true);
    expect(canReview({ id: 7, roles: ["inspector"] }, { fuserId: 7 })).toBe(false);
    expect(canReview({ id: 7, roles: ["inspector", "fuser"] }, { fuserId: 7 })).toBe(false);
    expect(canReview({ id: 7, roles: ["fuser"] }, { fuserId: 8 })).toBe(false);
    expect(canReview({ id: 7, roles: ["admin", "clerk"] }, { fuserId: 8 })).toBe(false);
  });

  it("a trace: an inspector reads and attaches one to any joint, a fuser only to their own", () => {
    for (const predicate of [canViewTraceOf, canAttachTraceTo]) {
      expect(predicate({ id: 1, roles: ["inspector"] }, { fuserId: 2 })).toBe(true);
      expect(predicate({ id: 1, roles: ["fuser"] }, { fuserId: 1 })).toBe(true);
      expect(predicate({ id: 1, roles: ["fuser"] }, { fuserId: 2 })).toBe(false);
      expect(predicate({ id: 1, roles: ["clerk", "admin"] }, { fuserId: 1 })).toBe(false);
    }
  });

  it("the named predicates agree with the table", () => {
    const cases: [(a: { roles: Role[] }) => boolean, Role[]][] = [
      [canRecordJoint, ["fuser"]],
      [canManageOffice, ["admin"]],
      [canReceiveCoils, ["clerk", "admin"]],
      [canTrace, ["inspector", "clerk", "admin"]],
      [canExportRegister, ["inspector", "clerk", "admin"]],
      [canOverrideBlock, ["inspector", "admin"]],
    ];
    for (const [predicate, holders] of cases) {
      for (const role of ROLE_ORDER) expect(predicate({ roles: [role] }), `${predicate.name} for ${role}`).toBe(holders.includes(role));
    }
  });

  it("the navigation shows each role the screens of its work", () => {
    const ids = (role: Role) => screensFor({ roles: [role] }).map((s) => s.id);
    // Everyone reads their own notifications (the mail Beadline sends them).
    expect(ids("fuser")).toEqual(["today", "notifications", "trench", "procedures"]);
    expect(ids("inspector")).toEqual(["today", "notifications", "register", "review", "overrides", "trace", "procedures", "insights"]);
    expect(ids("clerk")).toEqual(["today", "notifications", "register", "coils", "trace"]);
    expect(ids("admin")).toEqual(["today", "notifications", "register", "overrides", "coils", "trace", "jobs", "crew", "equipment", "procedures", "insights", "mailbox"]);
    expect(SCREENS.every((s) => s.permission === "signed-in" || s.permission in PERMISSIONS)).toBe(true);
  });
});
