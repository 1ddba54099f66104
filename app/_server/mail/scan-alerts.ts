// The periodic alert scan: queues qualification and heater-check alerts (deduplicated, so
// running it often is harmless) and folds the daily digests. Run by the mail worker.
import "server-only";
import type { Knex } from "knex";
import { isoDateIn } from "@/domain/dates/zone";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { heaterAlerts, qualificationAlerts, type AlertMail } from "@/domain/mail/alerts";
import { db } from "@/database/client";
import { listHeatersWithLastCheck } from "@/database/queries/equipment";
import { enqueueUserEvent, foldDailyDigests, listAlertAdmins, type Recipient } from "@/database/queries/outbox";
import { qualificationStatusOverview } from "@/database/queries/qualifications";

export type ScanReport = { alerts: number; queued: number; digests: number };

async function recipientById(k: Knex, id: number): Promise<Recipient | null> {
  const row = await k("users").where({ id, is_active: true }).first("id", "email", "daily_digest");
  return row ? { id: Number(row.id), email: row.email as string, dailyDigest: Boolean(row.daily_digest) } : null;
}

/**
 * Finds the alerts owed on `now`'s local day in the organisation's time zone and queues one mail per recipient for each
 * (the person concerned and every active admin; admins only for heater plates), each with
 * its dedupe key `<kind>:<suffix>:<recipient>`; then folds digests that are due.
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
        const person = await recipientById(k, alert.personId);
        if (person) recipients.set(person.id, person);
      }
      await k.transaction(async (trx) => {
        for (const r of recipients.values()) {
          const result = await enqueueUserEvent({ recipient: r, subject: alert.subject, bodyText: alert.bodyText, kind: alert.kind, dedupeKey: `${alert.kind}:${alert.dedupeSuffix}:${r.id}` }, trx);
          if (result.queued) queued += 1;
        }
      });
    }
  }
  const digests = await foldDailyDigests({ now, timeZone }, k);
  return { alerts: alerts.length, queued, digests };
}
