// Which coil a scanned or typed text means, among coils already at hand: the Trench
// screen's device-side lookup (the coils the page brought, so a scan works without
// signal) and the server's lookup for record-joint and the fusion plan use this one
// resolver, so the offline preview shows the coil that will be recorded. The text is read
// the way coil labels are written (readScannedCoilText): the label QR's /coils/<id>
// address, our coil id, or the manufacturer's ASTM F2897 code. Pure.
import { readScannedCoilText } from '@/domain/coils/life';
import type { CoilStatus } from '@/domain/coils/statuses';

export interface ScannableCoil {
  id: number;
  /** Our coil id (LV-C0001); matched without regard to case. */
  code: string;
  /** The ASTM F2897 16-character code; case-sensitive (its characters differ by case). */
  traceCode: string | null;
  status: CoilStatus;
  crewId: number | null;
}

/** Among coils of one lot sharing a code, the one most likely at the trench comes first. */
const STATUS_PREFERENCE: Record<CoilStatus, number> = { 'in-use': 0, 'on-trailer': 1, 'in-yard': 2, 'used-up': 3, quarantined: 4 };

/**
 * The coil `text` names, or null. Preference order: our coil id first (exact, ignoring
 * case; a label address or a typed id names nothing else); otherwise an F2897 code,
 * shared by every coil of one lot and size, picks the preferred crew's coil, then in use,
 * on a trailer, in the yard (used up and quarantined last, so the caller can refuse them
 * by status), then the lowest id.
 */
export function resolveScannedCoil<C extends ScannableCoil>(text: string, coils: readonly C[], { preferCrewId = null }: { preferCrewId?: number | null } = {}): C | null {
  const scanned = readScannedCoilText(text);
  if (scanned.kind === 'empty') return null;
  const wanted = scanned.code.trim().toLowerCase();
  const byCode = coils.find((c) => c.code.trim().toLowerCase() === wanted) ?? null;
  if (byCode || scanned.kind === 'coil-code') return byCode;
  const candidates = coils.filter((c) => c.traceCode === scanned.code);
  candidates.sort(
    (a, b) =>
      Number(preferCrewId != null && b.crewId === preferCrewId) - Number(preferCrewId != null && a.crewId === preferCrewId) ||
      STATUS_PREFERENCE[a.status] - STATUS_PREFERENCE[b.status] ||
      a.id - b.id,
  );
  return candidates[0] ?? null;
}
