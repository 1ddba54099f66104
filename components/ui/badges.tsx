// State badges: the word from the domain's label map first, a shape beside it, colour last,
// so the state reads in sunlight, in greyscale and to a screen reader alike.
import { COIL_STATUS_LABELS, type CoilStatus } from "@/domain/coils/statuses";
import { OUTCOME_LABELS } from "@/domain/joints/outcomes";
import { REVIEW_STATE_LABELS, type ReviewState } from "@/domain/joints/review-states";

type Shape = "circle" | "square" | "diamond" | "ring";

/** A small decorative shape; the badge's words carry the meaning. */
function ShapeIcon({ shape }: { shape: Shape }) {
  return (
    <svg aria-hidden="true" focusable="false" viewBox="0 0 10 10" className="h-2.5 w-2.5 shrink-0 fill-current">
      {shape === "circle" ? <circle cx="5" cy="5" r="4.5" /> : null}
      {shape === "square" ? <rect x="0.5" y="0.5" width="9" height="9" /> : null}
      {shape === "diamond" ? <path d="M5 0 10 5 5 10 0 5Z" /> : null}
      {shape === "ring" ? <circle cx="5" cy="5" r="3.5" fill="none" stroke="currentColor" strokeWidth="2" /> : null}
    </svg>
  );
}

function Badge({ tone, shape, size = "sm", children }: { tone: string; shape: Shape; size?: "sm" | "lg"; children: string }) {
  const box = size === "lg" ? "rounded-md px-3 py-1 font-bold" : "rounded px-2 py-0.5 text-sm font-semibold";
  return (
    <span className={`inline-flex items-center gap-1.5 border-2 ${box} ${tone}`}>
      <ShapeIcon shape={shape} />
      {children}
    </span>
  );
}

export type Outcome = keyof typeof OUTCOME_LABELS;

/** A joint's check outcome: a circle within limits, a square out of limits (as the run schematic). */
export function OutcomeBadge({ outcome, size }: { outcome: Outcome; size?: "sm" | "lg" }) {
  const within = outcome === "within-limits";
  return (
    <Badge tone={within ? "border-pass bg-pass-light text-pass" : "border-fail bg-fail-light text-fail"} shape={within ? "circle" : "square"} size={size}>
      {OUTCOME_LABELS[outcome]}
    </Badge>
  );
}

const REVIEW_STYLE: Record<ReviewState, { tone: string; shape: Shape }> = {
  "pending-review": { tone: "border-caution bg-caution-light text-caution", shape: "ring" },
  accepted: { tone: "border-pass bg-pass-light text-pass", shape: "circle" },
  "cut-out": { tone: "border-fail bg-fail-light text-fail", shape: "square" },
};

/** A joint's review state: an open ring while it waits, filled once decided. */
export function ReviewStateBadge({ state, size }: { state: ReviewState; size?: "sm" | "lg" }) {
  return (
    <Badge {...REVIEW_STYLE[state]} size={size}>
      {REVIEW_STATE_LABELS[state]}
    </Badge>
  );
}

const COIL_STYLE: Record<CoilStatus, { tone: string; shape: Shape }> = {
  "in-yard": { tone: "border-slate-500 bg-white text-ink", shape: "ring" },
  "on-trailer": { tone: "border-brand bg-brand-light text-brand-dark", shape: "diamond" },
  "in-use": { tone: "border-pass bg-pass-light text-pass", shape: "circle" },
  "used-up": { tone: "border-slate-400 bg-slate-100 text-slate-700", shape: "ring" },
  quarantined: { tone: "border-fail bg-fail-light text-fail", shape: "square" },
};

/** A coil's status in words, never by colour alone. */
export function CoilStatusBadge({ status }: { status: CoilStatus }) {
  return <Badge {...COIL_STYLE[status]}>{COIL_STATUS_LABELS[status]}</Badge>;
}
