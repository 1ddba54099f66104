// Types of a butt-fusion procedure: windows, size rules and sourced values. Canonical
// units: °C, MPa (interfacial pressure), mm, s.

import type { Shelter } from '@/domain/joints/shelters';
import type { Sourced } from '@/domain/sources';

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

/** A ceiling with its source (e.g. the heat-soak interfacial pressure, MPa). */
export interface SourcedMaximum extends Sourced {
  max: number;
}

/** A single value with its source (e.g. an operator's limit where a table has none). */
export interface SourcedValue extends Sourced {
  value: number;
}

export interface SourcedRule extends Sourced {
  rule: SizeRule;
  /**
   * The value, with its own source, for sizes where `rule` gives none (e.g. walls below
   * the start of the F2620 heater-removal table): the operator's value.
   */
  whereNone?: SourcedValue | null;
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
  /**
   * Highest interfacial pressure during heat soak, MPa: 0 = at drag only ("without force").
   * Absent in procedure versions stored before it was modelled; the plan then takes the
   * value of the published procedure the version is based on.
   */
  heatSoakInterfacialPressureMpa?: SourcedMaximum | null;
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
  /**
   * Weather rules: the ambient range, the shelter asked for, a cooling adjustment.
   * Absent in procedure versions stored before they were modelled; the plan then takes the
   * published procedure's the version is based on.
   */
  weather?: WeatherRules | null;
}

/** A shelter a rule asks for, at least (domain/joints/shelters orders them). */
export interface SourcedShelter extends Sourced {
  shelter: Exclude<Shelter, 'none'>;
}

/**
 * A procedure's weather rules, all optional (null = the procedure states none). °C.
 * - ambientRangeC: the ambient temperatures joints may be made at (either end open).
 * - shelterAlways: the least shelter at any temperature (wind, rain, blowing dust).
 * - coldShelter: below `belowC`, at least this shelter.
 * - coolingAdjustment: the minimum cooling time grows by `percentPerC` % for each °C of
 *   ambient above `referenceC`; it is never shortened in the cold (a procedure may state a
 *   shorter time there, but a shorter time is never applied here).
 */
export interface WeatherRules {
  ambientRangeC: SourcedRange | null;
  shelterAlways: SourcedShelter | null;
  coldShelter: (SourcedShelter & { belowC: number }) | null;
  coolingAdjustment: (Sourced & { referenceC: number; percentPerC: number }) | null;
}

/** A procedure version as stored: the standard it is based on, its windows, notes. */
export interface ProcedureDefinition {
  standard: FusionStandard;
  label: string;
  windows: ProcedureWindows;
  notes: string[];
}
