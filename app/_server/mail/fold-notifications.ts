// Grouping alerts into mail: for each person with waiting notifications, the groups whose
// window has closed (domain/mail/grouping: their choice of immediate, hourly or daily, in
// the organisation's time zone) each become one outbox mail listing every alert with its
// link. Run by the mail worker before each send pass. Safe when two workers run at once:
// a person's waiting notifications are claimed FOR UPDATE SKIP LOCKED in the transaction
// that queues the mail and ties them to it, and each mail's dedupe key
// `notice:<userId>:<first notification id>` can be queued only once. On a Galera cluster
// the row locks hold on one node only; there the unique dedupe key and the certification of
// the notifications' rows decide: two workers folding one group on two nodes write the same
// key and rows, the later COMMIT fails certification and is rerun (writeTransaction), and
// the rerun finds the notifications already tied to a mail (or the key taken: skipped).
import "server-only";
import type { Knex } from "knex";
import { db, writeTransaction } from "@/database/client";
import { enqueueMail, listPeopleWithWaitingNotifications, listWaitingNotifications, lockWaitingNotifications, markNotificationsMailed } from "@/database/queries/outbox";
import { composeGroupMail, dueGroups, type GroupingOptions } from "@/domain/mail/grouping";
import { formatInstant } from "@/components/ui/display-format";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { publicUrl } from "./public-url";

/** The burst window of "immediate", s: BURST_WINDOW_S unless MAIL_BURST_WINDOW_S sets another (tests use a short one). */
export function burstWindowS(): number | undefined {
  const set = Number(process.env.MAIL_BURST_WINDOW_S);
  return Number.isFinite(set) && set > 0 ? set : undefined;
}

/** Folds every due group into one outbox mail each; returns how many mails were queued. */
export async function foldNotifications({ now = new Date(), knex, burstWindowS: windowS = burstWindowS() }: { now?: Date; knex?: Knex; burstWindowS?: number } = {}): Promise<{ mails: number; alerts: number }> {
  const k = knex ?? db();
  const people = await listPeopleWithWaitingNotifications({}, k);
  if (people.length === 0) return { mails: 0, alerts: 0 };
  const timeZone = await organisationTimeZone(k);
  const options: GroupingOptions = { timeZone, burstWindowS: windowS };
  const at = (d: Date) => formatInstant(d, "minute", timeZone);
  const base = publicUrl();
  let mails = 0;
  let alerts = 0;
  for (const person of people) {
    // A plain read first: most passes find nothing due, and then nothing is locked.
    if (dueGroups(await listWaitingNotifications({ userId: person.userId }, k), person.grouping, now, options).length === 0) continue;
    // One writeTransaction per person: rerun as a whole on a deadlock or certification
    // failure, so it counts what it folded only through its result, after the commit.
    const folded = await writeTransaction(k, async (trx) => {
      let made = 0;
      let items = 0;
      const waiting = await lockWaitingNotifications({ userId: person.userId }, trx);
      for (const group of dueGroups(waiting, person.grouping, now, options)) {
        const mail = composeGroupMail(
          group.items.map((n) => ({ kind: n.kind, subject: n.subject, bodyText: n.bodyText, link: n.linkPath ? `${base}${n.linkPath}` : null, createdAt: n.createdAt })),
          person.grouping,
          at,
        );
        const queued = await enqueueMail({ to: person.email, ...mail, userId: person.userId, dedupeKey: `notice:${person.userId}:${group.items[0]!.id}` }, trx);
        // The dedupe key is taken: this group was folded already (by another worker whose
        // commit reached this node first). That commit tied the notifications it folded to
        // its mail; any of this group it did not hold stay waiting for the next pass.
        if (queued.duplicate) continue;
        await markNotificationsMailed({ ids: group.items.map((n) => n.id), outboxId: queued.id! }, trx);
        made += 1;
        items += group.items.length;
      }
      return { made, items };
    });
    mails += folded.made;
    alerts += folded.items;
  }
  return { mails, alerts };
}
