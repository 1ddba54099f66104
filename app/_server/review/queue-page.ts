// One page of the review queue as the screen and GET /api/v1/review/queue give it: the
// filter from the URL turned into instants (the organisation's days), the keyset cursor
// checked, items in the viewer's units, and on the first page the counts beside each
// filter choice.
import "server-only";
import { countQueueFacets, listReviewQueue, type QueueFacetCounts } from "@/database/queries/reviews";
import type { UserRecord } from "@/database/queries/users";
import { AppError } from "@/domain/result";
import { decodeQueueCursor, toQueueQuery } from "@/domain/review/queue";
import type { ReviewQueueFilter } from "@/domain/review/schemas";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { toQueueItemView, type QueueItemView } from "./queue-item-view";

export type QueuePageView = { total: number; outOfLimits: number; next: string | null; items: QueueItemView[]; facets: QueueFacetCounts | null };

export async function loadQueuePage(input: ReviewQueueFilter, { user, now = new Date() }: { user: Pick<UserRecord, "unitSystem">; now?: Date }): Promise<QueuePageView> {
  const after = input.after ? decodeQueueCursor(input.after) : null;
  if (input.after && !after) {
    const message = "The place in the queue is not valid; reload the queue";
    throw new AppError("invalid", `Check after: ${message}.`, { after: [message] });
  }
  const filter = toQueueQuery(input, { now, zone: await organisationTimeZone() });
  const [queue, facets] = await Promise.all([listReviewQueue({ filter, order: input.order, after, limit: input.limit }), input.after ? null : countQueueFacets({ filter })]);
  return { total: queue.total, outOfLimits: queue.outOfLimits, next: queue.next, items: queue.items.map((item) => toQueueItemView(item, user.unitSystem)), facets };
}
