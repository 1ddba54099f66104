import { COIL_STATUS_LABELS, type CoilStatus } from "@/domain/coils/statuses";

const TONES: Record<CoilStatus, string> = {
  "in-yard": "border-slate-500 bg-white text-ink",
  "on-trailer": "border-brand bg-brand-light text-brand-dark",
  "in-use": "border-pass bg-pass-light text-pass",
  "used-up": "border-slate-400 bg-slate-100 text-slate-700",
  quarantined: "border-fail bg-fail-light text-fail",
};

/** A coil's status in words, never by colour alone. */
export function CoilStatusBadge({ status }: { status: CoilStatus }) {
  return <span className={`inline-block rounded border-2 px-2 py-0.5 text-sm font-semibold ${TONES[status]}`}>{COIL_STATUS_LABELS[status]}</span>;
}
