// The periodic alert scan: keeps qualification and heater-check alerts as notifications
// (deduplicated, so running it often is harmless). Run by the mail worker, which also folds
// notifications into mail (fold-notifications.ts).
import "server-only";
import type { Knex } from "knex";
import { isoDateIn } from "@/domain/dates/zone";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { heaterAlerts, qualificationAlerts, type AlertMail } from "@/domain/mail/alerts";
import { mailLinkPath } from "@/domain/mail/links";
import { db, writeTransaction } from "@/database/client";
import { listHeatersWithLastCheck } from "@/database/queries/equipment";
import { findRecipient, insertNotification, listAlertAdmins, type Recipient } from "@/database/queries/outbox";
import { qualificationStatusOverview } from "@/database/queries/qualifications";
import { publicUrl } from "./public-url";

export type ScanReport = { alerts: number; queued: number };

/**
 * Finds the alerts owed on `now`'s local day in the organisation's time zone and keeps one
 * notification per recipient for each (the person concerned and every active admin; admins
 * only for heater plates) — in the recipient's units, linking to a page they may open —
 * each with its dedupe key `<kind>:<suffix>:<recipient>`.
 */
export async function scanAndEnqueueAlerts(now: Date = new Date(), knex?: Knex): Promise<ScanReport> {
  const k = knex ?? db();
  const timeZone = await organisationTimeZone(k);
  const on = isoDateIn(now, timeZone);
  const qualifications = await qualificationStatusOverview({ now, timeZone }, k);
  const heaters = await listHeatersWithLastCheck({ now, timeZone, activeOnly: true }, k);
  const alerts: AlertMail[] = [
    ...qualificationAlerts(
      qualifications.map((q) => ({ userId: q.userId, userName: q.userName, userIsActive: q.userIsActive, procedureId: q.procedureId, procedureCode: q.procedureCode, procedureName: q.procedureName, state: q.status.state, until: q.status.until, reason: q.status.reason })),
      on,
    ),
    ...heaterAlerts(
      heaters.map((h) => ({ id: h.id, assetTag: h.assetTag, description: h.description, isActive: h.isActive, isCheckOverdue: h.isCheckOverdue, nextDueOn: h.nextDueOn, lastCheckedAt: h.lastCheck?.checkedAt ?? null })),
      on,
    ),
  ];
  let queued = 0;
  if (alerts.length) {
    const admins = await listAlertAdmins({}, k);
    for (const alert of alerts) {
      const recipients = new Map<number, Recipient>(admins.map((a) => [a.id, a]));
      if (alert.personId !== null) {
        const person = await findRecipient({ userId: alert.personId }, k);
        if (person) recipients.set(person.id, person);
      }
      // Rerun as a whole on a deadlock or certification failure (two instances scanning at
      // once on two nodes): the count comes out of the committed run only.
      queued += await writeTransaction(k, async (trx) => {
        let kept = 0;
        for (const r of recipients.values()) {
          const linkPath = mailLinkPath(alert.about, r);
          const bodyText = `${alert.bodyText(r.unitSystem)}\n\nOpen in Beadline: ${publicUrl()}${linkPath}`;
          const result = await insertNotification({ userId: r.id, subject: alert.subject, bodyText, linkPath, kind: alert.kind, dedupeKey: `${alert.kind}:${alert.dedupeSuffix}:${r.id}` }, trx);
          if (result.queued) kept += 1;
        }
        return kept;
      });
    }
  }
  return { alerts: alerts.length, queued };
}
