// The outbox sender: claims due mails in a transaction that commits before anything is sent
// (claimDueMails: several app instances, also on a Galera cluster, share the work without
// sending a mail twice), sends each over SMTP, then marks it sent in another short write —
// or records the failure for a retry with back-off (domain/mail/backoff.ts). A mark that
// finds its claim gone (the lease ran out and another sender took the mail over) changes
// nothing and is counted as `takenOver`.
import "server-only";
import type { Knex } from "knex";
import { retryWrite } from "@/database/client";
import { claimDueMails, claimLeaseS, markMailFailed, markMailSent, releaseClaim } from "@/database/queries/outbox";
import { createSmtpTransport, outboxMessageId, type MailTransport } from "./transport";

export type SendReport = { claimed: number; sent: number; failed: number; gaveUp: number; takenOver: number; released: number };

/**
 * One pass: claim up to `limit` due mails, send them one by one, record each result.
 * A transport that fails (server down, refused recipient) leaves the mail queued for a
 * later attempt; after the last attempt it is marked failed and stays visible.
 */
export async function sendDueMails({ now = new Date(), limit = 20, transport, knex }: { now?: Date; limit?: number; transport?: MailTransport; knex?: Knex } = {}): Promise<SendReport> {
  const leaseS = claimLeaseS();
  const mails = await claimDueMails({ now, limit, leaseS }, knex);
  // A send starts only within the first half of the lease (measured on this process's
  // clock from the claim's commit), so no send outlives the claim; the rest go back.
  const sendUntil = Date.now() + (leaseS * 1000) / 2;
  const report: SendReport = { claimed: mails.length, sent: 0, failed: 0, gaveUp: 0, takenOver: 0, released: 0 };
  if (mails.length === 0) return report;
  const t = transport ?? createSmtpTransport();
  try {
    for (const [index, mail] of mails.entries()) {
      if (Date.now() > sendUntil) {
        const rest = mails.slice(index);
        report.released += await retryWrite(() => releaseClaim({ ids: rest.map((m) => m.id), claim: mail.claim, now: new Date() }, knex));
        break;
      }
      let sendError: unknown = null;
      try {
        await t.send({ to: mail.to, subject: mail.subject, text: mail.bodyText, messageId: outboxMessageId(mail.id) });
      } catch (error) {
        sendError = error;
      }
      // The marks are single guarded UPDATEs, safe to run again after a deadlock or
      // certification failure. If the database is gone instead, the error ends the pass and
      // the mail stays "sending" until its lease runs out (then it is sent again).
      if (sendError === null) {
        if (await retryWrite(() => markMailSent({ id: mail.id, claim: mail.claim, now: new Date() }, knex))) report.sent += 1;
        else report.takenOver += 1;
        continue;
      }
      const message = sendError instanceof Error ? `${(sendError as { code?: string }).code ? `${(sendError as { code?: string }).code}: ` : ""}${sendError.message}` : String(sendError);
      const next = await retryWrite(() => markMailFailed({ id: mail.id, claim: mail.claim, attempts: mail.attempts, error: message, now: new Date() }, knex));
      if (!next.held) report.takenOver += 1;
      else if (next.status === "failed") report.gaveUp += 1;
      else report.failed += 1;
    }
  } finally {
    if (!transport) t.close();
  }
  return report;
}
