// The current version of each procedure, with its parsed definition: the same for every
// request until a version is published, so read once (one query, each definition parsed
// once) and kept for PROCEDURE_VERSIONS_TTL_MS. Creating a procedure, publishing a tightened
// version or editing a version's notes clears it on this instance (app/_server/procedures).
// The Trench screen takes the plan of every open job from here.
import "server-only";
import { listCurrentVersionOfEveryProcedure, type ProcedureVersionRecord } from "@/database/queries/procedures";
import { cachedValue } from "@/app/_server/cache";

/** How long a version published on another instance (or outside the app) may take to show here. */
export const PROCEDURE_VERSIONS_TTL_MS = 30_000;

const versions = cachedValue(
  "current-procedure-versions",
  async () => new Map((await listCurrentVersionOfEveryProcedure()).map((v) => [v.procedureId, v] as const)),
  { ttlMs: PROCEDURE_VERSIONS_TTL_MS },
);

/** The current version of each procedure asked for, in the same order (null for a procedure with none). Shared objects: read, never change them. */
export async function currentProcedureVersions(procedureIds: number[]): Promise<(ProcedureVersionRecord | null)[]> {
  const byProcedure = await versions.get();
  return procedureIds.map((id) => byProcedure.get(id) ?? null);
}

/** A procedure or one of its versions was added or changed: the next read loads them again. */
export function procedureVersionsChanged(): void {
  versions.clear();
}
