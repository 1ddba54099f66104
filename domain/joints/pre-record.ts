// What the Trench screen (on the device, before a joint goes to the outbox) and the
// record-joint use case (on the server) both decide before a joint is recorded: the job's
// procedure has a published version, the two sides are two coils of one size, the
// machine's clamps take the pipe, and the pressure plan's inputs. Written once so the
// device's preview and the server's verdict cannot drift apart. Pure.
//
// Sources: butt fusion joins ends of the same OD and wall (ASTM F2620-20 §1 scope); the
// gauge pressure comes from the machine's total effective piston area (ASTM F2620-20 §8.2,
// domain/fusion/plan.ts).
import type { PlanButtFusionInput } from '@/domain/fusion/plan';
import type { ProcedureDefinition } from '@/domain/procedures';
import { componentMismatch, type Mismatch } from '@/domain/joints/rules';
import { formatQuantity, type UnitSystem } from '@/domain/units/format';

// ---------------------------------------------------------------------------------------
// The job's procedure

/** The one wording for a job whose procedure has no published version (refusal and screen). */
export function noPublishedVersionMessage(jobCode: string): string {
  return `Job ${jobCode} has no published procedure version; ask an administrator.`;
}

/** The same, short, for the job field. */
export const NO_PUBLISHED_VERSION_FIELD_MESSAGE = "The job's procedure has no published version.";

// ---------------------------------------------------------------------------------------
// Machine size range

/**
 * How far, in mm, a pipe's OD may lie outside a machine's stated range and still count as
 * inside it. ODs and ranges are stored at 0.01 mm, and both are often converted from inch
 * sizes (2.375 in = 60.325 mm, stored 60.33), so a pipe at the edge of the range can differ
 * from the bound by a rounding step; 0.05 mm absorbs that and is far below the gap between
 * neighbouring catalogue ODs (several mm), so it never lets a wrong size through. Common
 * practice (no published source); the same figure as the size-match tolerance of
 * componentMismatch.
 */
export const MACHINE_OD_TOLERANCE_MM = 0.05;

export interface MachineRange {
  assetTag: string;
  /** Smallest and largest pipe OD the clamps take, mm; null = no limit stated. */
  minOdMm: number | null;
  maxOdMm: number | null;
}

/** Whether the machine takes pipe of this OD (mm), within MACHINE_OD_TOLERANCE_MM. */
export function machineTakesPipe(machine: Pick<MachineRange, 'minOdMm' | 'maxOdMm'>, outsideDiameterMm: number): boolean {
  if (machine.minOdMm !== null && outsideDiameterMm < machine.minOdMm - MACHINE_OD_TOLERANCE_MM) return false;
  if (machine.maxOdMm !== null && outsideDiameterMm > machine.maxOdMm + MACHINE_OD_TOLERANCE_MM) return false;
  return true;
}

/** The refusal when the machine does not take the pipe, in `system` units; null when it does. */
export function machineSizeProblem(machine: MachineRange, outsideDiameterMm: number, system: UnitSystem = 'si'): string | null {
  if (machineTakesPipe(machine, outsideDiameterMm)) return null;
  const fmt = (v: number | null) => (v === null ? 'any' : formatQuantity(v, 'length-mm', system));
  return `Machine ${machine.assetTag} takes pipe from ${fmt(machine.minOdMm)} to ${fmt(machine.maxOdMm)} OD; this pipe is ${fmt(outsideDiameterMm)}.`;
}

// ---------------------------------------------------------------------------------------
// The two sides

export interface SideCoil {
  id: number;
  code: string;
  outsideDiameterMm: number;
  sdr: number;
}

/** A coil cannot be fused to itself: side B names the coil side A already names. */
export function isSameCoil(a: Pick<SideCoil, 'id'> | null, b: Pick<SideCoil, 'id'> | null): boolean {
  return a !== null && b !== null && a.id === b.id;
}

export function sameCoilMessage(code: string): string {
  return `Side B is the same coil as side A (${code}).`;
}

export type PreRecordProblem =
  | { kind: 'same-coil'; field: 'coilB'; message: string }
  | { kind: 'size-mismatch'; field: 'coilB'; message: string; mismatches: Mismatch[] }
  | { kind: 'machine-size'; field: 'machineId'; message: string };

/**
 * The problems that stop a joint before it is recorded, in the order the server reports
 * them (it refuses with the first): side B the same coil as side A, the two sides of
 * different sizes, the machine not taking side A's pipe. `sideB` is null for a tie-in or a
 * fitting; `machine` null while none is chosen. Messages in `system` units.
 */
export function preRecordProblems(
  { sideA, sideB, machine }: { sideA: SideCoil | null; sideB: SideCoil | null; machine: MachineRange | null },
  system: UnitSystem = 'si',
): PreRecordProblem[] {
  const out: PreRecordProblem[] = [];
  if (sideA && sideB) {
    if (isSameCoil(sideA, sideB)) {
      out.push({ kind: 'same-coil', field: 'coilB', message: sameCoilMessage(sideA.code) });
    } else {
      const mismatches = componentMismatch(
        { label: `Side A (${sideA.code})`, outsideDiameterMm: sideA.outsideDiameterMm, sdr: sideA.sdr },
        { label: `side B (${sideB.code})`, outsideDiameterMm: sideB.outsideDiameterMm, sdr: sideB.sdr },
        system,
      );
      if (mismatches.length) out.push({ kind: 'size-mismatch', field: 'coilB', message: mismatches.map((m) => m.message).join(' '), mismatches });
    }
  }
  if (sideA && machine) {
    const problem = machineSizeProblem(machine, sideA.outsideDiameterMm, system);
    if (problem) out.push({ kind: 'machine-size', field: 'machineId', message: problem });
  }
  return out;
}

// ---------------------------------------------------------------------------------------
// The pressure plan's inputs

/**
 * planButtFusion's arguments from what the job, machine and coil say: the job's current
 * procedure version, side A's OD (mm) and SDR (the joint's pipe), the machine's total
 * effective piston area (mm²) and the drag pressure the fuser measured (MPa).
 */
export function buttFusionPlanInput({
  procedure,
  pipe,
  machine,
  dragPressureMpa,
}: {
  procedure: ProcedureDefinition;
  pipe: { outsideDiameterMm: number; sdr: number };
  machine: { pistonAreaMm2: number };
  dragPressureMpa: number;
}): PlanButtFusionInput {
  return { procedure, outsideDiameterMm: pipe.outsideDiameterMm, sdr: pipe.sdr, pistonAreaMm2: machine.pistonAreaMm2, dragPressureMpa };
}
