// Butt-fusion procedures as data: parameter windows of ASTM F2620, ISO 21307 (single
// low-pressure, dual low-pressure, single high-pressure) and DVS 2207-1, each value with
// its source and status (standards.md §1, §3, §4), plus operator-derived procedures that
// may only tighten a base procedure.
//
// Everything here is plain JSON-compatible data (numbers, strings, arrays, null), so a
// procedure version's windows can be stored as JSON and rebuilt with
// parseProcedureDefinition. Canonical units: °C, MPa (interfacial pressure), mm, s.

import { DomainError } from '@/domain/errors';
import type { Sourced, ValueStatus } from '@/domain/sources';
import { describeStatus } from '@/domain/sources';
import { fToC, inToMm, MM_PER_IN, psiToMpa } from '@/domain/units/conversions';
import {
  formatDuration,
  formatQuantity,
  formatRange,
  roundTo,
  type QuantityKind,
  type UnitSystem,
} from '@/domain/units/format';

/** Built-in published procedures. */
export type FusionStandard =
  | 'astm-f2620'
  | 'iso-21307-slp'
  | 'iso-21307-dlp'
  | 'iso-21307-shp'
  | 'dvs-2207-1';

export const FUSION_STANDARDS = [
  'astm-f2620',
  'iso-21307-slp',
  'iso-21307-dlp',
  'iso-21307-shp',
  'dvs-2207-1',
] as const satisfies readonly FusionStandard[];

/** What a size-dependent rule is a function of. */
export type SizeBasis = 'wall-mm' | 'outside-diameter-mm';

/**
 * One band of a banded table. Bands are listed in ascending order; a band runs from the
 * previous band's upper bound (or the rule's `startMm`) to `upToMm`. Membership: the
 * first band with x < upToMm, or x = upToMm when `upperInclusive`. So the DVS convention
 * "lower exclusive, upper inclusive" is `upperInclusive: true` throughout, and the
 * F2620 bead row "< 2.37 in" is `upperInclusive: false`.
 */
export interface SizeBand {
  upToMm: number;
  upperInclusive: boolean;
  /** Value at the band's lower bound (the whole band's value when flat). */
  from: number;
  /** Value at the band's upper bound; equal to `from` for a flat band. */
  to: number;
}

/**
 * A value that depends on pipe size. Units of the value are the field's (mm, s).
 * - constant: the same at every size.
 * - linear: offset + perMm × basis (e.g. 11 min per inch of wall → perMm = 660/25.4 s).
 * - bands: table look-up; `startMm` is the inclusive lower end of the table (below it,
 *   undefined); with `interpolate`, linear between a band's `from` and `to`.
 * - adjusted: an operator's tightening of another rule: value × factor, then raised to
 *   `atLeast` and/or lowered to `atMost`.
 */
export type SizeRule =
  | { kind: 'constant'; value: number }
  | { kind: 'linear'; basis: SizeBasis; perMm: number; offset: number }
  | { kind: 'bands'; basis: SizeBasis; interpolate: boolean; startMm: number; bands: SizeBand[] }
  | { kind: 'adjusted'; rule: SizeRule; factor: number; atLeast: number | null; atMost: number | null };

export interface Window {
  min: number;
  max: number;
}

export interface SourcedWindow extends Window, Sourced {}

export interface SourcedRule extends Sourced {
  rule: SizeRule;
}

/** An applicability range; either end may be open (null). */
export interface SourcedRange extends Sourced {
  min: number | null;
  max: number | null;
}

/** Heat-soak time: a target, and optionally a window around it (all in s). */
export interface SourcedHeatSoak extends Sourced {
  target: SizeRule | null;
  min: SizeRule | null;
  max: SizeRule | null;
}

/**
 * Parameter windows of one procedure. Pressures are interfacial (at the pipe end), not
 * gauge; the plan turns them into gauge readings for a machine. null = not defined by
 * this procedure.
 */
export interface ProcedureWindows {
  heaterTemperatureC: SourcedWindow;
  beadUpInterfacialPressureMpa: SourcedWindow;
  fusionInterfacialPressureMpa: SourcedWindow;
  /** Reduced pressure held while cooling (ISO 21307 dual low-pressure only). */
  coolingInterfacialPressureMpa: SourcedWindow | null;
  /** Minimum melt-bead size (F2620 by OD; DVS bead height by wall), mm. */
  minBeadMm: SourcedRule | null;
  heatSoakS: SourcedHeatSoak | null;
  /** Maximum heater-removal (changeover) time, s. */
  maxChangeoverS: SourcedRule | null;
  /** Maximum time to build up joining pressure after the ends meet, s. */
  maxPressureBuildUpS: SourcedRule | null;
  /** Minimum cooling time under pressure in the machine, s. */
  minCoolingS: SourcedRule | null;
  /** Walls the procedure applies to, mm. */
  wallRangeMm: SourcedRange | null;
  /** Outside diameters the procedure applies to, mm (operators often limit this). */
  outsideDiameterRangeMm: SourcedRange | null;
}

/** A procedure version as stored: the standard it is based on, its windows, notes. */
export interface ProcedureDefinition {
  standard: FusionStandard;
  label: string;
  windows: ProcedureWindows;
  notes: string[];
}

// ---------------------------------------------------------------------------------------
// Built-in values. Status tags copied from shared/reference/standards.md.

const inBand = (upToIn: number, upperInclusive: boolean, fromValue: number, toValue = fromValue): SizeBand => ({
  upToMm: inToMm(upToIn),
  upperInclusive,
  from: fromValue,
  to: toValue,
});

const mmBand = (upToMm: number, fromValue: number, toValue = fromValue): SizeBand => ({
  upToMm,
  upperInclusive: true,
  from: fromValue,
  to: toValue,
});

const F2620_SOURCE = 'ASTM F2620 butt-fusion procedure';
const ISO_SOURCE = 'ISO 21307:2017';
const DVS_SOURCE = 'DVS 2207-1 (2005 edition, 2007 English translation), heated-tool butt welding of PE-HD';
const ISO_WALL_RANGE: SourcedRange = {
  min: null,
  max: 70,
  source: 'ISO 21307:2009/2011 scope: walls up to and including 70 mm',
  status: 'confirmed',
};

const ASTM_F2620: ProcedureDefinition = {
  standard: 'astm-f2620',
  label: 'ASTM F2620 butt fusion',
  windows: {
    heaterTemperatureC: {
      min: fToC(400),
      max: fToC(450),
      source: `${F2620_SOURCE}: heater surface 400–450 °F (PPI "Melt Procedure" page)`,
      status: 'confirmed',
    },
    beadUpInterfacialPressureMpa: {
      min: psiToMpa(60),
      max: psiToMpa(90),
      source: `${F2620_SOURCE}: bead-up at fusion pressure, interfacial pressure 60–90 psi`,
      status: 'from-memory',
    },
    fusionInterfacialPressureMpa: {
      min: psiToMpa(60),
      max: psiToMpa(90),
      source: `${F2620_SOURCE}: interfacial pressure 60–90 psi`,
      status: 'from-memory',
    },
    coolingInterfacialPressureMpa: null,
    minBeadMm: {
      rule: {
        kind: 'bands',
        basis: 'outside-diameter-mm',
        interpolate: false,
        startMm: 0,
        bands: [
          inBand(2.37, false, inToMm(1 / 32)),
          inBand(3.5, true, inToMm(1 / 16)),
          inBand(8.63, true, inToMm(3 / 16)),
          inBand(12.75, true, inToMm(1 / 4)),
          inBand(24, true, inToMm(3 / 8)),
          inBand(36, true, inToMm(7 / 16)),
          inBand(65, true, inToMm(9 / 16)),
        ],
      },
      source: `${F2620_SOURCE}: minimum melt-bead size by pipe OD`,
      status: 'from-memory',
    },
    heatSoakS: null,
    maxChangeoverS: {
      rule: {
        kind: 'bands',
        basis: 'wall-mm',
        interpolate: false,
        startMm: inToMm(0.17),
        bands: [
          inBand(0.36, true, 8),
          inBand(0.55, true, 10),
          inBand(1.18, true, 15),
          inBand(2.5, true, 20),
          inBand(4.5, true, 25),
        ],
      },
      source: `${F2620_SOURCE}: maximum heater-plate removal time by wall`,
      status: 'from-memory',
    },
    maxPressureBuildUpS: null,
    minCoolingS: {
      rule: { kind: 'linear', basis: 'wall-mm', perMm: (11 * 60) / MM_PER_IN, offset: 0 },
      source: `${F2620_SOURCE}: cooling under pressure 11 min per inch of wall`,
      status: 'from-memory',
    },
    wallRangeMm: null,
    outsideDiameterRangeMm: null,
  },
  notes: [
    'Heat soak is ended by bead size, not by a fixed time (PPI "Melt Procedure" page, confirmed).',
    'After cooling in the machine, avoid pulling, installation or rough handling for another 30 minutes (confirmed in a reproduction).',
    'For walls under 0.17 in the heater-removal table gives no value: remove the heater as fast as possible.',
  ],
};

const ISO_21307_SLP: ProcedureDefinition = {
  standard: 'iso-21307-slp',
  label: 'ISO 21307 single low-pressure',
  windows: {
    heaterTemperatureC: { min: 200, max: 245, source: `${ISO_SOURCE} single low-pressure: heater plate 200–245 °C`, status: 'from-memory' },
    beadUpInterfacialPressureMpa: { min: 0.15, max: 0.19, source: `${ISO_SOURCE} single low-pressure: bead-up P1 = 0.17 ± 0.02 MPa`, status: 'from-memory' },
    fusionInterfacialPressureMpa: { min: 0.15, max: 0.19, source: `${ISO_SOURCE} single low-pressure: fusion P4 = 0.17 ± 0.02 MPa`, status: 'from-memory' },
    coolingInterfacialPressureMpa: null,
    minBeadMm: null,
    heatSoakS: {
      target: { kind: 'linear', basis: 'wall-mm', perMm: 11, offset: 0 },
      min: { kind: 'linear', basis: 'wall-mm', perMm: 10, offset: 0 },
      max: { kind: 'linear', basis: 'wall-mm', perMm: 12, offset: 0 },
      source: `${ISO_SOURCE} single low-pressure: heat soak t2 = (11 ± 1) × e_n s`,
      status: 'from-memory',
    },
    maxChangeoverS: {
      rule: { kind: 'linear', basis: 'wall-mm', perMm: 0.3, offset: 4 },
      source: `${ISO_SOURCE} single low-pressure: heater removal t3 ≤ 4 + 0.3 × e_n s`,
      status: 'from-memory',
    },
    maxPressureBuildUpS: null,
    minCoolingS: {
      rule: { kind: 'linear', basis: 'wall-mm', perMm: 60, offset: 180 },
      source: `${ISO_SOURCE} single low-pressure: cooling in the machine e_n + 3 min`,
      status: 'from-memory',
    },
    wallRangeMm: ISO_WALL_RANGE,
    outsideDiameterRangeMm: null,
  },
  notes: ['Heat-soak pressure is drag only (≈ 0 interfacial).', 'Every ISO 21307 value here is from memory: check against ISO 21307:2017+A1:2020 before use.'],
};

const ISO_21307_DLP: ProcedureDefinition = {
  standard: 'iso-21307-dlp',
  label: 'ISO 21307 dual low-pressure',
  windows: {
    heaterTemperatureC: { min: 230, max: 250, source: `${ISO_SOURCE} dual low-pressure: heater plate 230–250 °C`, status: 'from-memory' },
    beadUpInterfacialPressureMpa: { min: 0.13, max: 0.17, source: `${ISO_SOURCE} dual low-pressure: bead-up P1 = 0.15 ± 0.02 MPa`, status: 'from-memory' },
    fusionInterfacialPressureMpa: { min: 0.13, max: 0.17, source: `${ISO_SOURCE} dual low-pressure: fusion P4 = 0.15 ± 0.02 MPa for about 10 s`, status: 'from-memory' },
    coolingInterfacialPressureMpa: { min: 0.025, max: 0.025, source: `${ISO_SOURCE} dual low-pressure: reduced cooling pressure P5 = 0.025 MPa`, status: 'from-memory' },
    minBeadMm: null,
    heatSoakS: null,
    maxChangeoverS: {
      rule: { kind: 'constant', value: 10 },
      source: `${ISO_SOURCE} dual low-pressure: heater removal about 10 s`,
      status: 'from-memory',
    },
    maxPressureBuildUpS: null,
    minCoolingS: {
      rule: { kind: 'linear', basis: 'wall-mm', perMm: 60, offset: 180 },
      source: `${ISO_SOURCE} dual low-pressure: cooling e_n + 3 min at P5`,
      status: 'from-memory',
    },
    wallRangeMm: {
      min: 20,
      max: 70,
      source: `${ISO_SOURCE} dual low-pressure: walls of 20 mm and more (from memory), up to 70 mm (2009/2011 scope, confirmed)`,
      status: 'from-memory',
    },
    outsideDiameterRangeMm: null,
  },
  notes: [
    'Fusion pressure P4 is held for about 10 s, then reduced to P5 for cooling.',
    'Every ISO 21307 value here is from memory: check against ISO 21307:2017+A1:2020 before use.',
  ],
};

const ISO_21307_SHP: ProcedureDefinition = {
  standard: 'iso-21307-shp',
  label: 'ISO 21307 single high-pressure',
  windows: {
    heaterTemperatureC: { min: 215, max: 235, source: `${ISO_SOURCE} single high-pressure: heater plate 215–235 °C`, status: 'from-memory' },
    beadUpInterfacialPressureMpa: { min: 0.42, max: 0.62, source: `${ISO_SOURCE} single high-pressure: bead-up P1 = 0.52 ± 0.10 MPa`, status: 'from-memory' },
    fusionInterfacialPressureMpa: { min: 0.42, max: 0.62, source: `${ISO_SOURCE} single high-pressure: fusion P4 = 0.52 ± 0.10 MPa`, status: 'from-memory' },
    coolingInterfacialPressureMpa: null,
    minBeadMm: null,
    heatSoakS: null,
    maxChangeoverS: {
      rule: { kind: 'linear', basis: 'wall-mm', perMm: 0.1, offset: 8 },
      source: `${ISO_SOURCE} single high-pressure: heater removal t3 ≤ 8 + 0.1 × e_n s`,
      status: 'from-memory',
    },
    maxPressureBuildUpS: null,
    minCoolingS: {
      rule: { kind: 'linear', basis: 'wall-mm', perMm: 0.43 * 60, offset: 0 },
      source: `${ISO_SOURCE} single high-pressure: cooling 0.43 × e_n min (11 min per inch)`,
      status: 'from-memory',
    },
    wallRangeMm: ISO_WALL_RANGE,
    outsideDiameterRangeMm: null,
  },
  notes: [
    'Heat soak is ended by bead size (recalled as about 11 × e_n s; not used as a limit).',
    'Every ISO 21307 value here is from memory: check against ISO 21307:2017+A1:2020 before use.',
  ],
};

const DVS_2207_1: ProcedureDefinition = {
  standard: 'dvs-2207-1',
  label: 'DVS 2207-1 heated-tool butt welding',
  windows: {
    heaterTemperatureC: { min: 200, max: 220, source: `${DVS_SOURCE}: heated tool 200–220 °C (upper for thin walls, lower for thick)`, status: 'from-memory' },
    beadUpInterfacialPressureMpa: {
      min: 0.14,
      max: 0.16,
      source: `${DVS_SOURCE}: bead-up 0.15 N/mm² (tolerance ± 0.01 taken from the joining pressure, our choice)`,
      status: 'from-memory',
    },
    fusionInterfacialPressureMpa: { min: 0.14, max: 0.16, source: `${DVS_SOURCE}: joining pressure 0.15 ± 0.01 N/mm²`, status: 'from-memory' },
    coolingInterfacialPressureMpa: null,
    minBeadMm: {
      rule: {
        kind: 'bands',
        basis: 'wall-mm',
        interpolate: false,
        startMm: 0,
        bands: [mmBand(4.5, 0.5), mmBand(7, 1.0), mmBand(12, 1.5), mmBand(19, 2.0), mmBand(26, 2.5), mmBand(37, 3.0), mmBand(50, 3.5), mmBand(70, 4.0)],
      },
      source: `${DVS_SOURCE}: minimum bead height at the end of bead-up, by wall`,
      status: 'from-memory',
    },
    heatSoakS: {
      target: { kind: 'linear', basis: 'wall-mm', perMm: 10, offset: 0 },
      min: { kind: 'linear', basis: 'wall-mm', perMm: 10, offset: 0 },
      max: null,
      source: `${DVS_SOURCE}: heating time 10 × s (taken as a minimum, our choice)`,
      status: 'from-memory',
    },
    maxChangeoverS: {
      rule: {
        kind: 'bands',
        basis: 'wall-mm',
        interpolate: true,
        startMm: 0,
        bands: [mmBand(4.5, 5), mmBand(7, 5, 6), mmBand(12, 6, 8), mmBand(19, 8, 10), mmBand(26, 10, 12), mmBand(37, 12, 16), mmBand(50, 16, 20), mmBand(70, 20, 25)],
      },
      source: `${DVS_SOURCE}: maximum changeover time by wall (linear within a band)`,
      status: 'from-memory',
    },
    maxPressureBuildUpS: {
      rule: {
        kind: 'bands',
        basis: 'wall-mm',
        interpolate: true,
        startMm: 0,
        bands: [mmBand(4.5, 5), mmBand(7, 5, 6), mmBand(12, 6, 8), mmBand(19, 8, 11), mmBand(26, 11, 14), mmBand(37, 14, 19), mmBand(50, 19, 25), mmBand(70, 25, 35)],
      },
      source: `${DVS_SOURCE}: time to build up joining pressure by wall (linear within a band)`,
      status: 'from-memory',
    },
    minCoolingS: {
      rule: {
        kind: 'bands',
        basis: 'wall-mm',
        interpolate: true,
        startMm: 0,
        bands: [
          mmBand(4.5, 6 * 60),
          mmBand(7, 6 * 60, 10 * 60),
          mmBand(12, 10 * 60, 16 * 60),
          mmBand(19, 16 * 60, 24 * 60),
          mmBand(26, 24 * 60, 32 * 60),
          mmBand(37, 32 * 60, 45 * 60),
          mmBand(50, 45 * 60, 60 * 60),
          mmBand(70, 60 * 60, 80 * 60),
        ],
      },
      source: `${DVS_SOURCE}: minimum cooling under joining pressure by wall (linear within a band)`,
      status: 'from-memory',
    },
    wallRangeMm: { min: null, max: 70, source: `${DVS_SOURCE}: table ends at 70 mm wall`, status: 'from-memory' },
    outsideDiameterRangeMm: null,
  },
  notes: [
    'Guide values for PE-HD at about 20 °C and moderate air flow.',
    'Bands are lower exclusive, upper inclusive (a 7 mm wall is in the 4.5–7 mm row); range columns are interpolated linearly within a band (our choice).',
    'Heat-soak pressure at most 0.02 N/mm². Misalignment at most 0.1 × wall.',
    'Every DVS 2207-1 table value here is from memory: check against the current edition before use.',
  ],
};

const BUILT_IN: Readonly<Record<FusionStandard, ProcedureDefinition>> = {
  'astm-f2620': ASTM_F2620,
  'iso-21307-slp': ISO_21307_SLP,
  'iso-21307-dlp': ISO_21307_DLP,
  'iso-21307-shp': ISO_21307_SHP,
  'dvs-2207-1': DVS_2207_1,
};

/** A deep copy, so callers can never change the built-in tables. */
function clone<T>(value: T): T {
  return JSON.parse(JSON.stringify(value)) as T;
}

/** True for one of the five built-in standard ids. */
export function isFusionStandard(value: unknown): value is FusionStandard {
  return typeof value === 'string' && (FUSION_STANDARDS as readonly string[]).includes(value);
}

/**
 * The published procedure for a standard, as a fresh plain-JSON copy.
 * Throws DomainError('unknown-standard') for an unknown id.
 */
export function builtInProcedure(standard: FusionStandard): ProcedureDefinition {
  if (!isFusionStandard(standard)) {
    throw new DomainError('unknown-standard', `Unknown fusion standard "${String(standard)}"; use one of ${FUSION_STANDARDS.join(', ')}`);
  }
  return clone(BUILT_IN[standard]);
}

/** All built-in procedures, in FUSION_STANDARDS order. */
export function builtInProcedures(): ProcedureDefinition[] {
  return FUSION_STANDARDS.map((standard) => builtInProcedure(standard));
}

// ---------------------------------------------------------------------------------------
// Evaluating rules

export interface PipeSizeForRule {
  wallMm: number;
  outsideDiameterMm: number;
}

const BOUNDARY_TOLERANCE_MM = 1e-9;

/**
 * Value of a size rule for a pipe, in the field's unit, not rounded; null where the rule
 * has no value (below `startMm` or above the last band of a table).
 */
export function evaluateSizeRule(rule: SizeRule, pipe: PipeSizeForRule): number | null {
  switch (rule.kind) {
    case 'constant':
      return rule.value;
    case 'linear':
      return rule.offset + rule.perMm * basisValue(rule.basis, pipe);
    case 'bands':
      return evaluateBands(rule, basisValue(rule.basis, pipe));
    case 'adjusted': {
      const base = evaluateSizeRule(rule.rule, pipe);
      let value = base === null ? null : base * rule.factor;
      if (rule.atLeast !== null) value = value === null ? rule.atLeast : Math.max(value, rule.atLeast);
      if (rule.atMost !== null) value = value === null ? rule.atMost : Math.min(value, rule.atMost);
      return value;
    }
  }
}

function basisValue(basis: SizeBasis, pipe: PipeSizeForRule): number {
  return basis === 'wall-mm' ? pipe.wallMm : pipe.outsideDiameterMm;
}

function evaluateBands(rule: Extract<SizeRule, { kind: 'bands' }>, x: number): number | null {
  if (x < rule.startMm - BOUNDARY_TOLERANCE_MM) return null;
  let lower = rule.startMm;
  for (const band of rule.bands) {
    const inside = band.upperInclusive
      ? x <= band.upToMm + BOUNDARY_TOLERANCE_MM
      : x < band.upToMm - BOUNDARY_TOLERANCE_MM;
    if (inside) {
      if (!rule.interpolate || band.from === band.to || band.upToMm === lower) return band.from;
      const fraction = Math.min(1, Math.max(0, (x - lower) / (band.upToMm - lower)));
      return band.from + (band.to - band.from) * fraction;
    }
    lower = band.upToMm;
  }
  return null;
}

/** The basis a rule is expressed in (for messages "for a 15.3 mm wall"); adjusted rules inherit. */
export function ruleBasis(rule: SizeRule): SizeBasis | null {
  switch (rule.kind) {
    case 'constant':
      return null;
    case 'linear':
    case 'bands':
      return rule.basis;
    case 'adjusted':
      return ruleBasis(rule.rule);
  }
}

// ---------------------------------------------------------------------------------------
// Deriving an operator's procedure

/** Narrow a window: a new minimum may only be higher, a new maximum only lower. */
export interface WindowTightening {
  min?: number;
  max?: number;
}

/** Raise a minimum-type rule: scale by factor ≥ 1 and/or never below `atLeast`. */
export interface MinimumTightening {
  factor?: number;
  atLeast?: number;
}

/** Lower a maximum-type rule: scale by factor ≤ 1 and/or never above `atMost`. */
export interface MaximumTightening {
  factor?: number;
  atMost?: number;
}

/** What an operator may change in a base procedure (all optional; absent = unchanged). */
export interface ProcedureTightening {
  heaterTemperatureC?: WindowTightening;
  beadUpInterfacialPressureMpa?: WindowTightening;
  fusionInterfacialPressureMpa?: WindowTightening;
  coolingInterfacialPressureMpa?: WindowTightening;
  minBeadMm?: MinimumTightening;
  heatSoakMinS?: MinimumTightening;
  heatSoakMaxS?: MaximumTightening;
  maxChangeoverS?: MaximumTightening;
  maxPressureBuildUpS?: MaximumTightening;
  minCoolingS?: MinimumTightening;
  wallRangeMm?: WindowTightening;
  outsideDiameterRangeMm?: WindowTightening;
}

/** One refused change, named by field path (e.g. 'heaterTemperatureC.min'). */
export interface ProcedureFieldError {
  field: string;
  message: string;
}

export type DeriveProcedureResult =
  | { ok: true; procedure: ProcedureDefinition }
  | { ok: false; errors: ProcedureFieldError[] };

export interface DeriveProcedureOptions {
  label?: string;
  /** Notes added to the base procedure's notes. */
  notes?: string[];
  /** Units of the error messages; SI by default. */
  system?: UnitSystem;
  /** Source text for tightened values, e.g. 'Operator procedure GP-7 rev 3'. */
  source?: string;
}

const WINDOW_FIELDS = [
  { key: 'heaterTemperatureC', label: 'Heater temperature', kind: 'temperature' },
  { key: 'beadUpInterfacialPressureMpa', label: 'Bead-up interfacial pressure', kind: 'pressure' },
  { key: 'fusionInterfacialPressureMpa', label: 'Fusion interfacial pressure', kind: 'pressure' },
  { key: 'coolingInterfacialPressureMpa', label: 'Cooling interfacial pressure', kind: 'pressure' },
] as const;

const RANGE_FIELDS = [
  { key: 'wallRangeMm', label: 'Wall range', kind: 'length-mm' },
  { key: 'outsideDiameterRangeMm', label: 'Outside-diameter range', kind: 'length-mm' },
] as const;

function isNumber(value: unknown): value is number {
  return typeof value === 'number' && Number.isFinite(value);
}

/**
 * Derive an operator's procedure from a base (built-in or already derived) by tightening
 * it. Every change must narrow: a window's min may only rise and its max only fall, a
 * minimum rule (bead, heat-soak minimum, cooling) may only be scaled up (factor ≥ 1) or
 * given a floor, a maximum rule (heat-soak maximum, changeover, pressure build-up) only
 * scaled down (factor ≤ 1) or given a cap. Anything that would loosen is refused and all
 * refusals are listed, one per field. Values in canonical SI (°C, MPa, mm, s).
 * Tightened values keep the base's status when only narrowed by the operator, and carry
 * `options.source` (default "operator tightening of <base label>").
 */
export function deriveProcedure(
  base: ProcedureDefinition,
  tightening: ProcedureTightening,
  options: DeriveProcedureOptions = {},
): DeriveProcedureResult {
  const system = options.system ?? 'si';
  const errors: ProcedureFieldError[] = [];
  const windows = clone(base.windows);
  const operatorSource = options.source ?? `operator tightening of ${base.label}`;
  const fmt = (value: number, kind: QuantityKind) => formatQuantity(value, kind, system);

  for (const field of WINDOW_FIELDS) {
    const change = tightening[field.key];
    if (!change) continue;
    const current = windows[field.key];
    if (!current) {
      errors.push({ field: field.key, message: `${field.label} is not part of ${base.label}, so it cannot be tightened` });
      continue;
    }
    const next = narrowWindow(field.key, field.label, field.kind, current, change, base.label, fmt, errors);
    if (next) windows[field.key] = { ...next, source: `${operatorSource}; within ${current.source}`, status: current.status };
  }

  for (const field of RANGE_FIELDS) {
    const change = tightening[field.key];
    if (!change) continue;
    const current = windows[field.key];
    const merged = narrowRange(field.key, field.label, field.kind, current, change, base.label, fmt, errors);
    if (merged) {
      windows[field.key] = {
        ...merged,
        source: current ? `${operatorSource}; within ${current.source}` : operatorSource,
        status: current ? current.status : 'confirmed',
      };
    }
  }

  const minimumRule = (key: 'minBeadMm' | 'minCoolingS', label: string): void => {
    const change = tightening[key];
    if (!change) return;
    const rule = raiseRule(key, label, windows[key]?.rule ?? null, change, base.label, errors);
    if (rule) {
      const current = windows[key];
      windows[key] = {
        rule,
        source: current ? `${operatorSource}; within ${current.source}` : operatorSource,
        status: current ? current.status : 'confirmed',
      };
    }
  };
  const maximumRule = (key: 'maxChangeoverS' | 'maxPressureBuildUpS', label: string): void => {
    const change = tightening[key];
    if (!change) return;
    const rule = lowerRule(key, label, windows[key]?.rule ?? null, change, base.label, errors);
    if (rule) {
      const current = windows[key];
      windows[key] = {
        rule,
        source: current ? `${operatorSource}; within ${current.source}` : operatorSource,
        status: current ? current.status : 'confirmed',
      };
    }
  };
  minimumRule('minBeadMm', 'Minimum bead');
  minimumRule('minCoolingS', 'Minimum cooling');
  maximumRule('maxChangeoverS', 'Maximum changeover');
  maximumRule('maxPressureBuildUpS', 'Maximum pressure build-up');

  if (tightening.heatSoakMinS || tightening.heatSoakMaxS) {
    const current = windows.heatSoakS;
    const min = tightening.heatSoakMinS
      ? raiseRule('heatSoakMinS', 'Heat-soak minimum', current?.min ?? null, tightening.heatSoakMinS, base.label, errors)
      : (current?.min ?? null);
    const max = tightening.heatSoakMaxS
      ? lowerRule('heatSoakMaxS', 'Heat-soak maximum', current?.max ?? null, tightening.heatSoakMaxS, base.label, errors)
      : (current?.max ?? null);
    windows.heatSoakS = {
      target: current?.target ?? null,
      min,
      max,
      source: current ? `${operatorSource}; within ${current.source}` : operatorSource,
      status: current ? current.status : 'confirmed',
    };
  }

  if (errors.length > 0) return { ok: false, errors };
  return {
    ok: true,
    procedure: {
      standard: base.standard,
      label: options.label ?? `${base.label} (tightened)`,
      windows,
      notes: [...base.notes, ...(options.notes ?? [])],
    },
  };
}

function narrowWindow(
  key: string,
  label: string,
  kind: QuantityKind,
  current: Window,
  change: WindowTightening,
  baseLabel: string,
  fmt: (value: number, kind: QuantityKind) => string,
  errors: ProcedureFieldError[],
): Window | null {
  const before = errors.length;
  const min = change.min ?? current.min;
  const max = change.max ?? current.max;
  if (change.min !== undefined && !isNumber(change.min)) errors.push({ field: `${key}.min`, message: `${label} minimum must be a number` });
  else if (change.min !== undefined && change.min < current.min) {
    errors.push({ field: `${key}.min`, message: `${label} minimum ${fmt(change.min, kind)} is below the ${fmt(current.min, kind)} of ${baseLabel}; a derived procedure may only raise it` });
  }
  if (change.max !== undefined && !isNumber(change.max)) errors.push({ field: `${key}.max`, message: `${label} maximum must be a number` });
  else if (change.max !== undefined && change.max > current.max) {
    errors.push({ field: `${key}.max`, message: `${label} maximum ${fmt(change.max, kind)} is above the ${fmt(current.max, kind)} of ${baseLabel}; a derived procedure may only lower it` });
  }
  if (errors.length === before && min > max) {
    errors.push({ field: key, message: `${label} minimum ${fmt(min, kind)} is above its maximum ${fmt(max, kind)}` });
  }
  return errors.length === before ? { min, max } : null;
}

function narrowRange(
  key: string,
  label: string,
  kind: QuantityKind,
  current: SourcedRange | null,
  change: WindowTightening,
  baseLabel: string,
  fmt: (value: number, kind: QuantityKind) => string,
  errors: ProcedureFieldError[],
): { min: number | null; max: number | null } | null {
  const before = errors.length;
  const baseMin = current?.min ?? null;
  const baseMax = current?.max ?? null;
  if (change.min !== undefined) {
    if (!isNumber(change.min) || change.min < 0) errors.push({ field: `${key}.min`, message: `${label} minimum must be a number of 0 or more` });
    else if (baseMin !== null && change.min < baseMin) {
      errors.push({ field: `${key}.min`, message: `${label} minimum ${fmt(change.min, kind)} is below the ${fmt(baseMin, kind)} of ${baseLabel}; a derived procedure may only raise it` });
    }
  }
  if (change.max !== undefined) {
    if (!isNumber(change.max) || change.max <= 0) errors.push({ field: `${key}.max`, message: `${label} maximum must be a number above 0` });
    else if (baseMax !== null && change.max > baseMax) {
      errors.push({ field: `${key}.max`, message: `${label} maximum ${fmt(change.max, kind)} is above the ${fmt(baseMax, kind)} of ${baseLabel}; a derived procedure may only lower it` });
    }
  }
  const min = change.min ?? baseMin;
  const max = change.max ?? baseMax;
  if (errors.length === before && min !== null && max !== null && min > max) {
    errors.push({ field: key, message: `${label} minimum ${fmt(min, kind)} is above its maximum ${fmt(max, kind)}` });
  }
  return errors.length === before ? { min, max } : null;
}

function raiseRule(
  key: string,
  label: string,
  current: SizeRule | null,
  change: MinimumTightening,
  baseLabel: string,
  errors: ProcedureFieldError[],
): SizeRule | null {
  const before = errors.length;
  if (change.factor !== undefined) {
    if (!isNumber(change.factor) || change.factor <= 0) errors.push({ field: `${key}.factor`, message: `${label} factor must be a number above 0` });
    else if (change.factor < 1) {
      errors.push({ field: `${key}.factor`, message: `${label} factor ${change.factor} would lower the minimum of ${baseLabel}; use a factor of 1 or more` });
    } else if (current === null) {
      errors.push({ field: `${key}.factor`, message: `${baseLabel} has no ${label.toLowerCase()} to scale; give a fixed minimum instead` });
    }
  }
  if (change.atLeast !== undefined && (!isNumber(change.atLeast) || change.atLeast < 0)) {
    errors.push({ field: `${key}.atLeast`, message: `${label} must be a number of 0 or more (got ${String(change.atLeast)})` });
  }
  if (errors.length > before) return null;
  if (current === null) {
    return change.atLeast !== undefined ? { kind: 'constant', value: change.atLeast } : null;
  }
  return { kind: 'adjusted', rule: current, factor: change.factor ?? 1, atLeast: change.atLeast ?? null, atMost: null };
}

function lowerRule(
  key: string,
  label: string,
  current: SizeRule | null,
  change: MaximumTightening,
  baseLabel: string,
  errors: ProcedureFieldError[],
): SizeRule | null {
  const before = errors.length;
  if (change.factor !== undefined) {
    if (!isNumber(change.factor) || change.factor <= 0) errors.push({ field: `${key}.factor`, message: `${label} factor must be a number above 0` });
    else if (change.factor > 1) {
      errors.push({ field: `${key}.factor`, message: `${label} factor ${change.factor} would raise the maximum of ${baseLabel}; use a factor of 1 or less` });
    } else if (current === null) {
      errors.push({ field: `${key}.factor`, message: `${baseLabel} has no ${label.toLowerCase()} to scale; give a fixed maximum instead` });
    }
  }
  if (change.atMost !== undefined && (!isNumber(change.atMost) || change.atMost <= 0)) {
    errors.push({ field: `${key}.atMost`, message: `${label} must be a number above 0 (got ${String(change.atMost)})` });
  }
  if (errors.length > before) return null;
  if (current === null) {
    return change.atMost !== undefined ? { kind: 'constant', value: change.atMost } : null;
  }
  return { kind: 'adjusted', rule: current, factor: change.factor ?? 1, atLeast: null, atMost: change.atMost ?? null };
}

// ---------------------------------------------------------------------------------------
// Describing a procedure for the Procedures screen

export type ProcedureParameter =
  | 'heaterTemperature'
  | 'beadUpPressure'
  | 'fusionPressure'
  | 'coolingPressure'
  | 'bead'
  | 'heatSoak'
  | 'changeover'
  | 'pressureBuildUp'
  | 'cooling'
  | 'wallRange'
  | 'outsideDiameterRange';

export interface ProcedureWindowRow {
  parameter: ProcedureParameter;
  label: string;
  /** The value in the user's units, in words ("204–232 °C", "11 min per inch of wall"). */
  value: string;
  /** Table rows for banded values, one line per band; empty otherwise. */
  details: string[];
  source: string;
  status: ValueStatus;
  statusText: string;
}

/**
 * Rows for the read-only Procedures screen: each defined window of a procedure with its
 * value in the user's units, its source and status. Undefined windows are left out.
 */
export function describeProcedureWindows(definition: ProcedureDefinition, system: UnitSystem): ProcedureWindowRow[] {
  const w = definition.windows;
  const rows: ProcedureWindowRow[] = [];
  const push = (parameter: ProcedureParameter, label: string, value: string, details: string[], sourced: Sourced) =>
    rows.push({ parameter, label, value, details, source: sourced.source, status: sourced.status, statusText: describeStatus(sourced.status) });

  push('heaterTemperature', 'Heater surface temperature', formatRange(w.heaterTemperatureC.min, w.heaterTemperatureC.max, 'temperature', system), [], w.heaterTemperatureC);
  push('beadUpPressure', 'Bead-up interfacial pressure', formatRange(w.beadUpInterfacialPressureMpa.min, w.beadUpInterfacialPressureMpa.max, 'pressure', system), [], w.beadUpInterfacialPressureMpa);
  push('fusionPressure', 'Fusion interfacial pressure', formatRange(w.fusionInterfacialPressureMpa.min, w.fusionInterfacialPressureMpa.max, 'pressure', system), [], w.fusionInterfacialPressureMpa);
  if (w.coolingInterfacialPressureMpa) {
    push('coolingPressure', 'Reduced cooling interfacial pressure', formatRange(w.coolingInterfacialPressureMpa.min, w.coolingInterfacialPressureMpa.max, 'pressure', system), [], w.coolingInterfacialPressureMpa);
  }
  if (w.minBeadMm) push('bead', 'Minimum bead size', ...describeRule(w.minBeadMm.rule, 'length-mm', system), w.minBeadMm);
  if (w.heatSoakS) {
    const parts: string[] = [];
    if (w.heatSoakS.target) parts.push(`target ${describeRule(w.heatSoakS.target, 'duration', system)[0]}`);
    if (w.heatSoakS.min) parts.push(`at least ${describeRule(w.heatSoakS.min, 'duration', system)[0]}`);
    if (w.heatSoakS.max) parts.push(`at most ${describeRule(w.heatSoakS.max, 'duration', system)[0]}`);
    push('heatSoak', 'Heat-soak time', parts.join('; '), [], w.heatSoakS);
  }
  if (w.maxChangeoverS) push('changeover', 'Maximum changeover (heater removal) time', ...describeRule(w.maxChangeoverS.rule, 'duration', system), w.maxChangeoverS);
  if (w.maxPressureBuildUpS) push('pressureBuildUp', 'Maximum pressure build-up time', ...describeRule(w.maxPressureBuildUpS.rule, 'duration', system), w.maxPressureBuildUpS);
  if (w.minCoolingS) push('cooling', 'Minimum cooling time under pressure', ...describeRule(w.minCoolingS.rule, 'duration', system), w.minCoolingS);
  if (w.wallRangeMm) push('wallRange', 'Walls covered', formatRange(w.wallRangeMm.min, w.wallRangeMm.max, 'length-mm', system), [], w.wallRangeMm);
  if (w.outsideDiameterRangeMm) {
    push('outsideDiameterRange', 'Outside diameters covered', formatRange(w.outsideDiameterRangeMm.min, w.outsideDiameterRangeMm.max, 'length-mm', system), [], w.outsideDiameterRangeMm);
  }
  return rows;
}

function basisWord(basis: SizeBasis): string {
  return basis === 'wall-mm' ? 'wall' : 'OD';
}

function trimNumber(value: number, decimals: number): string {
  return String(roundTo(value, decimals));
}

function formatValue(value: number, kind: QuantityKind, system: UnitSystem): string {
  return kind === 'duration' ? formatDuration(value) : formatQuantity(value, kind, system);
}

/** [summary, band lines] for a rule in the user's units. */
export function describeRule(rule: SizeRule, kind: QuantityKind, system: UnitSystem): [string, string[]] {
  switch (rule.kind) {
    case 'constant':
      return [formatValue(rule.value, kind, system), []];
    case 'linear': {
      // Per inch in US units, per mm in SI; durations per unit of length in s or min.
      const perUnit = system === 'us' ? rule.perMm * MM_PER_IN : rule.perMm;
      const unit = system === 'us' ? 'inch' : 'mm';
      const perText = kind === 'duration'
        ? perUnit >= 60 ? formatDuration(perUnit) : `${trimNumber(perUnit, 2)} s`
        : `${trimNumber(system === 'us' ? perUnit / MM_PER_IN : perUnit, 3)} ${kind === 'length-mm' && system === 'us' ? 'in' : 'mm'}`;
      const offsetText = rule.offset !== 0 ? `${formatValue(rule.offset, kind, system)} + ` : '';
      return [`${offsetText}${perText} per ${unit} of ${basisWord(rule.basis)}`, []];
    }
    case 'bands': {
      const lines: string[] = [];
      let lower = rule.startMm;
      // The table's start is inclusive; after a band that excludes its upper bound, the
      // next band includes it ("from"); otherwise the next band starts just over it.
      let lowOp = rule.startMm > 0 ? 'from' : '';
      for (const band of rule.bands) {
        const lowText = formatQuantity(lower, 'length-mm', system);
        const highText = formatQuantity(band.upToMm, 'length-mm', system);
        const highOp = band.upperInclusive ? 'up to' : 'under';
        const where = lowOp === '' ? `${basisWord(rule.basis)} ${highOp} ${highText}` : `${basisWord(rule.basis)} ${lowOp} ${lowText} ${highOp} ${highText}`;
        const value = band.from === band.to || !rule.interpolate
          ? formatValue(band.from, kind, system)
          : `${formatValue(band.from, kind, system)} to ${formatValue(band.to, kind, system)} (linear)`;
        lines.push(`${where}: ${value}`);
        lower = band.upToMm;
        lowOp = band.upperInclusive ? 'over' : 'from';
      }
      return [`by ${basisWord(rule.basis)}, see table`, lines];
    }
    case 'adjusted': {
      const [summary, lines] = describeRule(rule.rule, kind, system);
      const parts = [summary];
      if (rule.factor !== 1) parts.push(`× ${trimNumber(rule.factor, 3)}`);
      if (rule.atLeast !== null) parts.push(`at least ${formatValue(rule.atLeast, kind, system)}`);
      if (rule.atMost !== null) parts.push(`at most ${formatValue(rule.atMost, kind, system)}`);
      return [parts.join(', '), lines];
    }
  }
}
