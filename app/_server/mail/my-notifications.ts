// A person's own notifications, for their Notifications screen: the mail Beadline made for
// them (newest first, with its delivery state) and the alerts still waiting for their next
// mail, grouped as they will be sent. Only the signed-in person's: the id comes from the
// session, never from the request.
import "server-only";
import { listMailForUser, listWaitingNotifications, type Notification, type OutboxMail } from "@/database/queries/outbox";
import { groupWaiting, type MailGroup, type MailGrouping } from "@/domain/mail/grouping";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { burstWindowS } from "./fold-notifications";

export type MyNotifications = { grouping: MailGrouping; timeZone: string; mails: OutboxMail[]; waiting: MailGroup<Notification>[] };

export async function listMyNotifications({ user, limit = 50 }: { user: { id: number; mailGrouping: MailGrouping }; limit?: number }): Promise<MyNotifications> {
  const [timeZone, mails, waiting] = await Promise.all([organisationTimeZone(), listMailForUser({ userId: user.id, limit }), listWaitingNotifications({ userId: user.id })]);
  return { grouping: user.mailGrouping, timeZone, mails, waiting: groupWaiting(waiting, user.mailGrouping, { timeZone, burstWindowS: burstWindowS() }) };
}
