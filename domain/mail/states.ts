// The delivery states of a mail in the outbox and how the screens say them.
export const MAIL_STATUSES = ["queued", "sending", "sent", "failed"] as const;
export type MailStatus = (typeof MAIL_STATUSES)[number];

export const MAIL_STATUS_LABELS: Record<MailStatus, string> = { queued: "Waiting", sending: "Sending", sent: "Sent", failed: "Failed" };

/** A mail's state in words; `at` formats an instant for the reader. */
export function mailStateWords(m: { status: MailStatus; attempts: number; nextAttemptAt: Date; sentAt: Date | null }, at: (d: Date) => string): string {
  switch (m.status) {
    case "queued":
      return m.attempts === 0 ? "Waiting to send" : `Not delivered yet; retrying (attempt ${m.attempts + 1} at ${at(m.nextAttemptAt)})`;
    case "sending":
      return "Being sent now";
    case "sent":
      return m.sentAt ? `Sent ${at(m.sentAt)}` : "Sent";
    case "failed":
      return `Failed after ${m.attempts} attempts`;
  }
}
