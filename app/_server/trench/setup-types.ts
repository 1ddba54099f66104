// Plain, serialisable data the Trench page hands to its client components (and that the
// device keeps in its draft for offline use). Dates are ISO strings; values canonical SI.
// Client code imports these as types only (erased in the bundle).
import "server-only";
import type { Coil } from "@/database/queries/coils";
import type { ProcedureDefinition } from "@/domain/procedures";
import type { CoilStatus } from "@/domain/coils/statuses";
import type { JointOutcome } from "@/domain/joints/outcomes";
import type { ReviewState } from "@/domain/joints/review-states";
import type { UnitSystem } from "@/domain/units/format";
import type { CoilPairJoint } from "@/domain/joints/same-coils";

export type TrenchCoil = {
  id: number;
  code: string;
  traceCode: string | null;
  manufacturer: string;
  lot: string;
  material: string;
  series: string;
  nominalSize: string;
  outsideDiameterMm: number;
  sdr: number;
  remainingM: number;
  status: CoilStatus;
  statusReason: string | null;
  crewId: number | null;
  /** The job the coil is assigned to and that job's crew (a coil of another crew's job is blocked). */
  assignedJob?: { id: number; code: string; name: string; crewId: number | null; crewName: string | null } | null;
};

export function toTrenchCoil(c: Coil): TrenchCoil {
  return {
    id: c.id,
    code: c.coilCode,
    traceCode: c.traceCode,
    manufacturer: c.manufacturer,
    lot: c.lot,
    material: c.material,
    series: c.series,
    nominalSize: c.nominalSize,
    outsideDiameterMm: c.outsideDiameterMm,
    sdr: c.sdr,
    remainingM: c.remainingM,
    status: c.status,
    statusReason: c.statusReason,
    crewId: c.crewId,
    assignedJob: c.jobId === null ? null : { id: c.jobId, code: c.jobCode ?? `job ${c.jobId}`, name: c.jobName ?? "", crewId: c.jobCrewId, crewName: c.jobCrewName },
  };
}

export type TrenchJob = {
  id: number;
  code: string;
  name: string;
  place: string | null;
  /** The job's crew (null: any crew may record on it). */
  crewId: number | null;
  procedure: { versionId: number; code: string; name: string; versionNo: number; definition: ProcedureDefinition } | null;
  /** The fuser's qualification dates for this job's procedure (status is computed on the joint's date). */
  qualifiedOn: string[];
  failedOn: string[];
};

export type TrenchMachine = { id: number; assetTag: string; description: string | null; pistonAreaMm2: number | null; gaugeResolutionMpa: number | null; thermometerResolutionC: number | null; minOdMm: number | null; maxOdMm: number | null; isUsable: boolean; problems: string[] };

export type TrenchHeater = { id: number; assetTag: string; description: string | null; isActive: boolean; lastCheck: { passed: boolean; nextDueOn: string; checkedAt: string } | null };

export type TrenchOverride = { id: number; jobId: number; subjectType: "heater" | "coil"; subjectId: number; subjectLabel: string; reason: string; grantedById: number; grantedByName: string; grantedAt: string; expiresAt: string };

export type TrenchRemake = { id: number; jobId: number; jointNo: number; madeAt: string; reviewState: string; coilACode: string | null; findings: string[] };

export type TrenchRecent = { id: number; jobCode: string; jointNo: number; madeAt: string; outcome: JointOutcome; reviewState: ReviewState };

/** A joint between two coils of the crew's list (the same two coils again needs a question). */
export type TrenchCoilPair = CoilPairJoint;

export type TrenchSetup = {
  user: { id: number; name: string; unitSystem: UnitSystem; crewId: number | null };
  jobs: TrenchJob[];
  machines: TrenchMachine[];
  heaters: TrenchHeater[];
  coils: TrenchCoil[];
  overrides: TrenchOverride[];
  remakes: TrenchRemake[];
  recent: TrenchRecent[];
  /** Joints already made between two of `coils` (newest first). */
  pairs: TrenchCoilPair[];
  inspectors: string[];
  admins: string[];
  /** The organisation's IANA zone: the device shows times and takes "today" in it, as the server does. */
  timeZone: string;
  loadedAt: string;
};
