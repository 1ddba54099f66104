// What the Trench screen keeps on the device, so nothing is lost when the signal drops or
// the page reloads: the draft (form values, phase-timer start/end instants, chosen coils,
// photo references), the outbox of joints waiting to be sent and the screen's folded
// sections and safety acknowledgement live in localStorage
// under keys starting "beadline.trench."; photo bytes live in IndexedDB (idb-keyval),
// because localStorage holds only text. Browser-only module (used by client components).
import { del, get, set } from "idb-keyval";
import { TRENCH_KEY_PREFIX, trenchDraftKey as draftKey, trenchOutboxKey as outboxKey, trenchPhotoKeyPrefix, trenchRememberKey as rememberKey } from "@/components/offline/names";
import type { PhaseTiming } from "@/domain/joints/timer";
import type { RecordJointFormInput, RecordJointRawInput, TimedPhase } from "@/domain/joints/schemas";
import type { RecordedJoint } from "@/app/_server/joints/record-joint";
import type { TrenchCoil } from "@/app/_server/trench/setup-types";

// The key names are shared with sign-out, which clears them (components/offline/names.ts).
export { draftKey, outboxKey, rememberKey };
const photoKey = (id: string) => `${trenchPhotoKeyPrefix}${id}`;

export type PhotoRef = { key: string; name: string; type: string; size: number; uploadedId: number | null };

export type Draft = {
  version: 1;
  values: RecordJointFormInput;
  timers: Record<TimedPhase, PhaseTiming>;
  coils: { A: TrenchCoil | null; B: TrenchCoil | null };
  photos: PhotoRef[];
  savedAt: string;
};

export type OutboxState = "waiting" | "sending" | "sent" | "refused";

export type OutboxEntry = {
  /**
   * This device's own id of the entry (entries stored before it existed go by clientId).
   * Two entries may carry one client id (a draft recorded in two tabs); they stay apart.
   */
  localId?: string;
  clientId: string;
  createdAt: string;
  jobCode: string;
  /** "LV-C0001 + LV-C0002" */
  label: string;
  payload: Omit<RecordJointRawInput, "photoIds">;
  photos: PhotoRef[];
  state: OutboxState;
  attempts: number;
  lastTriedAt: string | null;
  /** What the screen says about this entry (why it waits, why it was refused). */
  message: string | null;
  fields?: Record<string, string[]>;
  /** The device's own check when it was recorded (the server's verdict is final). */
  preliminary: { outcome: string; findings: string[] } | null;
  result?: RecordedJoint;
  /**
   * Refused because its client id already recorded another joint (409 naming the client id):
   * the values are kept here and can go as a new joint with a fresh client id.
   */
  isReusedId?: boolean;
};

/** The entry's identity on this device. */
export const entryKey = (entry: Pick<OutboxEntry, "localId" | "clientId">) => entry.localId ?? entry.clientId;

export type Remembered = { jobId?: number; machineId?: number; heaterId?: number };

function readJson<T>(key: string, fallback: T): T {
  try {
    const text = window.localStorage.getItem(key);
    return text ? (JSON.parse(text) as T) : fallback;
  } catch {
    return fallback;
  }
}

function writeJson(key: string, value: unknown): void {
  try {
    window.localStorage.setItem(key, JSON.stringify(value));
  } catch {
    // Storage full or disabled: the screen keeps working from memory.
  }
}

export const loadDraft = (userId: number) => readJson<Draft | null>(draftKey(userId), null);
export const saveDraft = (userId: number, draft: Draft) => writeJson(draftKey(userId), draft);
export const clearDraft = (userId: number) => window.localStorage.removeItem(draftKey(userId));

export const loadOutbox = (userId: number) => readJson<OutboxEntry[]>(outboxKey(userId), []);
export const saveOutbox = (userId: number, entries: OutboxEntry[]) => writeJson(outboxKey(userId), entries);

/** Which sections of the screen the fuser folded away, and the local day the safety box was read. */
export type ScreenPrefs = { closed: string[]; safetyReadOn: string | null };
export const prefsKey = (userId: number) => `${TRENCH_KEY_PREFIX}screen.${userId}`;
export const loadScreenPrefs = (userId: number): ScreenPrefs => ({ closed: [], safetyReadOn: null, ...readJson<Partial<ScreenPrefs>>(prefsKey(userId), {}) });
export const saveScreenPrefs = (userId: number, prefs: ScreenPrefs) => writeJson(prefsKey(userId), prefs);

export const loadRemembered = (userId: number) => readJson<Remembered>(rememberKey(userId), {});
export const saveRemembered = (userId: number, value: Remembered) => writeJson(rememberKey(userId), value);

/** Keeps a photo's bytes on the device until its joint is sent. */
export async function storePhoto(blob: Blob, name: string): Promise<PhotoRef> {
  const key = photoKey(crypto.randomUUID());
  await set(key, blob);
  return { key, name, type: blob.type, size: blob.size, uploadedId: null };
}

export const readPhoto = (ref: PhotoRef) => get<Blob>(ref.key);
export const dropPhoto = (ref: PhotoRef) => del(ref.key).catch(() => undefined);

export function emptyTimers(): Record<TimedPhase, PhaseTiming> {
  return { heatSoak: { startedAt: null, endedAt: null }, changeover: { startedAt: null, endedAt: null }, cooling: { startedAt: null, endedAt: null } };
}
