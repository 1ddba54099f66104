import { requireUser } from "@/app/_lib/page-guard";
import { listMyNotifications } from "@/app/_server/mail/my-notifications";
import { burstWindowS } from "@/app/_server/mail/fold-notifications";
import { publicUrl } from "@/app/_server/mail/public-url";
import { formatInstant } from "@/components/ui/display-format";
import { SectionCard } from "@/components/ui/section-card";
import { mailKindLabel } from "@/domain/mail/grouping";
import { mailStateWords } from "@/domain/mail/states";
import { MailPreference } from "../_components/mail-preference";
import { MailText } from "./_components/mail-text";

export const dynamic = "force-dynamic";

const STATE_TONE = { queued: "text-caution", sending: "", sent: "text-pass", failed: "text-fail" } as const;

// Notifications: every signed-in person's own alerts — the mail Beadline made for them,
// what it said (with links that open here) and whether it was delivered — the alerts
// waiting for their next mail, and their choice of how alerts are grouped.
export default async function NotificationsPage() {
  const user = await requireUser();
  const mine = await listMyNotifications({ user });
  const at = (d: Date) => formatInstant(d, "minute", mine.timeZone);
  const base = publicUrl();
  return (
    <div className="mx-auto flex w-full max-w-3xl flex-col gap-6">
      <h1 className="text-2xl font-bold">Notifications</h1>
      <p className="text-slate-700">
        The alerts Beadline sends you by e-mail, to <span className="break-words font-semibold">{user.email}</span>, and what became of each mail.
      </p>
      <MailPreference grouping={mine.grouping} burstWindowS={burstWindowS()} />

      <SectionCard id="waiting-heading" title="Waiting for your next mail" className="flex flex-col gap-2">
        {mine.waiting.length === 0 ? (
          <p className="text-slate-700">Nothing is waiting.</p>
        ) : (
          <ul aria-label="Alerts waiting" className="flex flex-col gap-3">
            {mine.waiting.map((group) => (
              <li key={group.items[0]!.id} className="flex flex-col gap-2 rounded-md border-2 border-slate-300 bg-white p-3">
                <p className="font-semibold">
                  {group.items.length === 1 ? "1 alert" : `${group.items.length} alerts`}, to be sent together at {at(group.closesAt)}
                </p>
                <ul className="flex flex-col gap-2">
                  {group.items.map((n) => (
                    <li key={n.id}>
                      <details>
                        <summary className="min-h-touch cursor-pointer">
                          <span className="font-semibold">{n.subject}</span>
                          <span className="block text-sm text-slate-700">
                            {mailKindLabel(n.kind)} · {at(n.createdAt)}
                          </span>
                        </summary>
                        <div className="mt-2">
                          <MailText text={n.bodyText} base={base} />
                        </div>
                      </details>
                      {n.linkPath ? (
                        <a href={n.linkPath} className="inline-flex min-h-touch items-center font-semibold text-brand underline">
                          Open it in Beadline
                        </a>
                      ) : null}
                    </li>
                  ))}
                </ul>
              </li>
            ))}
          </ul>
        )}
      </SectionCard>

      <SectionCard id="mail-heading" title="Mail to you" className="flex flex-col gap-2">
        {mine.mails.length === 0 ? (
          <p className="text-slate-700">No mail has been made for you yet.</p>
        ) : (
          <ul aria-label="Mail to you, newest first" className="flex flex-col gap-3">
            {mine.mails.map((m) => (
              <li key={m.id} className={`rounded-md border-2 bg-white p-3 ${m.status === "failed" ? "border-fail" : "border-slate-300"}`}>
                <details>
                  <summary className="min-h-touch cursor-pointer">
                    <span className="font-semibold">{m.subject}</span>
                    <span className="block text-sm text-slate-700">
                      {mailKindLabel(m.kind)} · made {at(m.createdAt)}
                    </span>
                    <span className={`block text-sm font-semibold ${STATE_TONE[m.status]}`}>{mailStateWords(m, at)}</span>
                  </summary>
                  <div className="mt-2 flex flex-col gap-2">
                    {m.status === "failed" ? <p className="text-sm text-fail">The mail server did not take it. An administrator can send it again from Mailbox; the text is here.</p> : null}
                    <MailText text={m.bodyText} base={base} />
                  </div>
                </details>
              </li>
            ))}
          </ul>
        )}
      </SectionCard>
    </div>
  );
}
