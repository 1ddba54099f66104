// What the review screen shows of a joint, in the viewer's units: findings in plain words,
// plan next to recorded values, the trace's values next to the typed ones, photo links.
// Plain JSON (dates as ISO strings) for the queue API and the page.
import "server-only";
import type { ReviewItem } from "@/database/queries/reviews";
import type { JointFinding } from "@/domain/fusion/check";
import type { JointOutcome } from "@/domain/joints/outcomes";
import { findingsForViewer, planVersusRecorded, type ComparisonRow } from "@/domain/review/queue";
import { checkTraceReading, traceVersusTyped, type TraceValueRow } from "@/domain/pressure-trace/check";
import type { UnitSystem } from "@/domain/units/format";

export type QueueItemView = Omit<ReviewItem, "madeAt" | "trace" | "findings" | "photos"> & {
  madeAt: string;
  findings: JointFinding[];
  comparison: ComparisonRow[];
  photos: { id: number; name: string; url: string }[];
  trace: null | {
    id: number;
    attachmentId: number;
    url: string;
    sampleCount: number;
    outcome: JointOutcome;
    findings: JointFinding[];
    rows: TraceValueRow[];
    uploadedAt: string;
    uploadedByName: string;
  };
};

export function toQueueItemView(item: ReviewItem, system: UnitSystem): QueueItemView {
  const { trace, photos, madeAt, findings, ...rest } = item;
  const shown = findingsForViewer(item.plan, item.recorded, findings, system, item.conditions);
  let traceView: QueueItemView["trace"] = null;
  if (trace && trace.reading) {
    // Checked again in the viewer's units (and with the current rules, e.g. typed values
    // against the trace), so the outcome shown agrees with the findings listed.
    const again = item.plan ? checkTraceReading(item.plan, trace.reading, item.recorded, system) : null;
    traceView = {
      id: trace.id,
      attachmentId: trace.attachmentId,
      url: `/api/v1/attachments/${trace.attachmentId}`,
      sampleCount: trace.sampleCount,
      outcome: again ? again.outcome : trace.outcome,
      findings: again ? again.findings : trace.findings,
      rows: traceVersusTyped(item.plan ?? {}, trace.reading, item.recorded),
      uploadedAt: trace.uploadedAt.toISOString(),
      uploadedByName: trace.uploadedByName,
    };
  }
  return {
    ...rest,
    madeAt: madeAt.toISOString(),
    findings: shown,
    comparison: item.plan ? planVersusRecorded(item.plan, item.recorded, shown, system, item.conditions) : [],
    photos: photos.map((p, i) => ({ id: p.id, name: p.originalName ?? `Bead photo ${i + 1}`, url: `/api/v1/attachments/${p.id}` })),
    trace: traceView,
  };
}
