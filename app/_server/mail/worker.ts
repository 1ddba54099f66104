// The mail worker inside each app server process (started by instrumentation.ts): every
// MAIL_SEND_INTERVAL_MS (default 2 s) it folds waiting notifications whose window has
// closed into mail and sends due outbox mail, and every MAIL_SCAN_INTERVAL_MS (default
// 10 min) it runs the alert scan. Safe with several instances, on one database server or
// a Galera cluster: a mail is claimed in a transaction that commits before it is sent
// (database/queries/outbox.ts claimDueMails), every write transaction reruns on a
// deadlock or certification failure, and alerts and mails are deduplicated by unique keys.
import "server-only";
import { foldNotifications } from "./fold-notifications";
import { scanAndEnqueueAlerts } from "./scan-alerts";
import { sendDueMails } from "./send-due-mails";

type Log = { info: (o: object, msg: string) => void; warn: (o: object, msg: string) => void };

const globalForWorker = globalThis as unknown as { beadlineMailWorker?: { stop: () => void } };

export function startMailWorker({ log, sendEveryMs = Number(process.env.MAIL_SEND_INTERVAL_MS || 2000), scanEveryMs = Number(process.env.MAIL_SCAN_INTERVAL_MS || 600_000) }: { log: Log; sendEveryMs?: number; scanEveryMs?: number }): { stop: () => void } {
  if (globalForWorker.beadlineMailWorker) return globalForWorker.beadlineMailWorker;
  let busy = false;
  let lastScan = 0;
  let lastProblem = "";
  const tick = async () => {
    if (busy) return;
    busy = true;
    try {
      const now = new Date();
      if (now.getTime() - lastScan >= scanEveryMs) {
        lastScan = now.getTime();
        const scan = await scanAndEnqueueAlerts(now);
        if (scan.queued) log.info({ ...scan }, "alert scan kept notifications");
      }
      const folded = await foldNotifications({ now });
      if (folded.mails) log.info({ ...folded }, "notifications grouped into mail");
      const report = await sendDueMails({ now });
      if (report.claimed) log.info({ ...report }, "outbox pass");
      lastProblem = "";
    } catch (error) {
      // The database may be briefly away; say so once, not every two seconds.
      const message = error instanceof Error ? error.message : String(error);
      if (message !== lastProblem) log.warn({ err: message }, "mail worker pass failed; will retry");
      lastProblem = message;
    } finally {
      busy = false;
    }
  };
  const timer = setInterval(() => void tick(), Math.max(250, sendEveryMs));
  timer.unref?.();
  const handle = {
    stop: () => {
      clearInterval(timer);
      globalForWorker.beadlineMailWorker = undefined;
    },
  };
  globalForWorker.beadlineMailWorker = handle;
  return handle;
}
