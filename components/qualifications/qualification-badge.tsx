// A qualification state in words and colour (never colour alone).
import { QUALIFICATION_STATE_LABELS } from "@/domain/qualifications/overview";
import type { QualificationStatus } from "@/domain/qualifications/status";

const STYLE: Record<QualificationStatus["state"], string> = {
  current: "border-pass bg-pass-light text-pass",
  "due-soon": "border-caution bg-caution-light text-caution",
  lapsed: "border-fail bg-fail-light text-fail",
  "requalification-needed": "border-fail bg-fail-light text-fail",
  "never-qualified": "border-slate-400 bg-white text-ink",
  "needs-legacy-data": "border-caution bg-caution-light text-caution",
};

export function QualificationBadge({ status }: { status: Pick<QualificationStatus, "state" | "until"> }) {
  return <span className={`inline-block rounded-md border-2 px-2 py-0.5 text-sm font-semibold ${STYLE[status.state]}`}>{qualificationText(status)}</span>;
}

/** "Qualified until 2027-03-01", "Qualified until … (lapses within 30 days)", "Lapsed after …". */
export function qualificationText(status: Pick<QualificationStatus, "state" | "until">): string {
  switch (status.state) {
    case "current":
      return `Qualified until ${status.until}`;
    case "due-soon":
      return `Qualified until ${status.until} (lapses within 30 days)`;
    case "lapsed":
      return `Lapsed after ${status.until}`;
    default:
      return QUALIFICATION_STATE_LABELS[status.state];
  }
}
