// Today for an inspector: how many joints wait for review and which has waited longest.
import { reviewQueueSummary } from "@/database/queries/today";
import { TimeDisplay } from "@/components/ui/time-display";
import { TodayPanel } from "./today-panel";

export async function TodayInspector() {
  const queue = await reviewQueueSummary();
  return (
    <TodayPanel id="today-review" title="Review queue" href="/review" linkText="Open the review queue" tone={queue.count ? "attention" : "plain"}>
      <p>
        <span className="text-2xl font-bold">{queue.count}</span> joint{queue.count === 1 ? "" : "s"} waiting for review.
      </p>
      {queue.oldest ? (
        <p>
          Oldest: job {queue.oldest.jobCode} joint {queue.oldest.jointNo}, made <TimeDisplay at={queue.oldest.madeAt} /> ({queue.oldest.outcome === "out-of-limits" ? "out of limits" : "within limits"}).
        </p>
      ) : null}
    </TodayPanel>
  );
}
