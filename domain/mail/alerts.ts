// Which alert mails the periodic scan owes: qualifications that lapse within 30 days or
// have lapsed (49 CFR 192.285(c) status from domain/qualifications), and heater plates whose
// temperature check is overdue. Each alert has a dedupe key, so the scan can run as often
// as it likes and every alert still goes out once per person, procedure, date and kind.
// The text is made per reader: values in the reader's unit system, and the link (about)
// chosen for the reader's role by domain/mail/links.
import type { QualificationState } from "@/domain/qualifications/status";
import type { MailAbout } from "@/domain/mail/links";
import { formatRange, type UnitSystem } from "@/domain/units/format";

export type AlertMail = { kind: string; audience: "person-and-admins" | "admins"; personId: number | null; dedupeSuffix: string; about: MailAbout; subject: string; bodyText: (system: UnitSystem) => string };

export type QualificationAlertInput = {
  userId: number;
  userName: string;
  userIsActive: boolean;
  procedureId: number;
  procedureCode: string;
  procedureName: string;
  state: QualificationState;
  until: string | null;
  reason: string;
};

/**
 * Alerts for qualification states: due soon → "qualification-lapsing", lapsed or ended by
 * a failed test → "qualification-lapsed". Inactive people get none. Dedupe suffix
 * `<userId>:<procedureId>:<until or "ended">:<kind>` — a new qualification moves the until
 * date, so the next lapse alerts again.
 */
export function qualificationAlerts(rows: readonly QualificationAlertInput[], on: string): AlertMail[] {
  const out: AlertMail[] = [];
  for (const r of rows) {
    if (!r.userIsActive) continue;
    const lapsing = r.state === "due-soon";
    const lapsed = r.state === "lapsed" || r.state === "requalification-needed";
    if (!lapsing && !lapsed) continue;
    const kind = lapsing ? "qualification-lapsing" : "qualification-lapsed";
    const what = `${r.userName}'s qualification for ${r.procedureCode}`;
    const subject = lapsing ? `Qualification lapses ${r.until}: ${r.userName}, ${r.procedureCode}` : `Qualification lapsed: ${r.userName}, ${r.procedureCode}`;
    const bodyText = [
      lapsing ? `${what} (${r.procedureName}) runs out on ${r.until}, within 30 days of ${on}.` : `${what} (${r.procedureName}) is no longer current as of ${on}.`,
      "",
      `Status: ${r.reason}.`,
      "",
      lapsing
        ? "Book a requalification joint before that date; after it the fuser may not make joints under this procedure."
        : "The fuser may not make joints under this procedure until requalified (49 CFR 192.285).",
    ].join("\n");
    out.push({ kind, audience: "person-and-admins", personId: r.userId, dedupeSuffix: `${r.userId}:${r.procedureId}:${r.until ?? "ended"}:${kind}`, about: { kind: "qualification", userId: r.userId }, subject, bodyText: () => bodyText });
  }
  return out;
}

export type HeaterAlertInput = { id: number; assetTag: string; description: string | null; isActive: boolean; isCheckOverdue: boolean; nextDueOn: string | null; lastCheckedAt: Date | null };

/** Alerts to admins for active heater plates whose check is overdue (or that were never checked). Dedupe suffix `<heaterId>:<due date or "never">`. */
export function heaterAlerts(rows: readonly HeaterAlertInput[], on: string): AlertMail[] {
  return rows
    .filter((h) => h.isActive && h.isCheckOverdue)
    .map((h) => ({
      kind: "heater-check-overdue",
      audience: "admins" as const,
      personId: null,
      dedupeSuffix: `${h.id}:${h.nextDueOn ?? "never"}`,
      about: { kind: "heater" as const, heaterId: h.id },
      subject: h.nextDueOn ? `Heater check overdue: ${h.assetTag} (due ${h.nextDueOn})` : `Heater check missing: ${h.assetTag} was never checked`,
      bodyText: (system: UnitSystem) => [
        h.nextDueOn
          ? `The temperature check of heater plate ${h.assetTag}${h.description ? ` (${h.description})` : ""} was due on ${h.nextDueOn}; on ${on} it has not been done.`
          : `Heater plate ${h.assetTag}${h.description ? ` (${h.description})` : ""} has no temperature check on record.`,
        "",
        "Check both faces with a surface pyrometer before the plate is used again, and record the check on the Equipment screen.",
        `Caution: a heater plate runs near ${formatRange(200, 230, "temperature", system)} and burns; let it reach temperature on its stand and handle it by its insulated grips.`,
      ].join("\n"),
    }));
}
