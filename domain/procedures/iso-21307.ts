// ISO 21307 butt-fusion procedures (single low-pressure, dual low-pressure, single
// high-pressure), each value with its source and status.

import type { ProcedureDefinition, SourcedRange } from '@/domain/procedures/types';

const ISO_SOURCE = 'ISO 21307:2017';
const ISO_CARD = 'ISO 21307 single low-pressure parameter card published by a pipe association (2020)';
// No published heat-end criterion is confirmed for the high-pressure and dual procedures,
// yet a zero-length soak must not pass: the operator's minimum, 10 × e_n s, below the
// recalled 11 × e_n s so that it never fails a joint the standard would accept.
const OPERATOR_SOAK_MIN = { kind: 'linear', basis: 'wall-mm', perMm: 10, offset: 0 } as const;
const ISO_WALL_RANGE: SourcedRange = {
  min: null,
  max: 70,
  source: 'ISO 21307:2009/2011 scope: walls up to and including 70 mm',
  status: 'confirmed',
};

// The ambient range of all three procedures.
const ISO_AMBIENT_RANGE: SourcedRange = {
  min: -5,
  max: 40,
  source: `${ISO_SOURCE} scope: ambient temperatures from −5 °C to +40 °C`,
  status: 'from-memory',
};

export const ISO_21307_SLP: ProcedureDefinition = {
  standard: 'iso-21307-slp',
  label: 'ISO 21307 single low-pressure',
  windows: {
    heaterTemperatureC: {
      min: 215,
      max: 235,
      source: `${ISO_CARD}: heater 225 ± 10 °C (the 200–245 °C band once recalled is contradicted by this text; single source)`,
      status: 'confirmed-2nd',
    },
    beadUpInterfacialPressureMpa: { min: 0.15, max: 0.19, source: `${ISO_SOURCE} single low-pressure: bead-up P1 = 0.17 MPa nominal (${ISO_CARD}); tolerance ± 0.02 MPa from memory`, status: 'from-memory' },
    fusionInterfacialPressureMpa: { min: 0.15, max: 0.19, source: `${ISO_SOURCE} single low-pressure: fusion P4 = 0.17 MPa nominal (${ISO_CARD}); tolerance ± 0.02 MPa from memory`, status: 'from-memory' },
    coolingInterfacialPressureMpa: null,
    heatSoakInterfacialPressureMpa: { max: 0, source: `${ISO_SOURCE} single low-pressure: heat soak at drag pressure or less (P2 ≈ 0; a pipe association's 2020 parameter card)`, status: 'confirmed-2nd' },
    minBeadMm: {
      rule: { kind: 'linear', basis: 'wall-mm', perMm: 0.1, offset: 0.5 },
      source: `${ISO_CARD}: minimum bead 0.5 + 0.1 × e mm`,
      status: 'confirmed-2nd',
    },
    heatSoakS: {
      target: { kind: 'linear', basis: 'wall-mm', perMm: 13.5, offset: 0 },
      min: { kind: 'linear', basis: 'wall-mm', perMm: 12, offset: 0 },
      max: { kind: 'linear', basis: 'wall-mm', perMm: 15, offset: 0 },
      source: `${ISO_CARD}: heat soak at drag pressure or less for (13.5 ± 1.5) × e_n s`,
      status: 'confirmed-2nd',
    },
    maxChangeoverS: {
      rule: { kind: 'linear', basis: 'wall-mm', perMm: 0.3, offset: 4 },
      source: `${ISO_SOURCE} single low-pressure: heater removal t3 ≤ 4 + 0.3 × e_n s (the card refers to ISO 12176-1 Table 1)`,
      status: 'from-memory',
    },
    maxPressureBuildUpS: {
      rule: { kind: 'linear', basis: 'outside-diameter-mm', perMm: 0.03, offset: 3 },
      source: `${ISO_CARD}: pressure build-up at most 3 + 0.03 × d_n s`,
      status: 'confirmed-2nd',
    },
    minCoolingS: {
      // The card's e_n ≥ 18 mm formula (0.015·e_n² − 0.47·e_n + 20 min) drops from 21 to
      // 16.4 min at 18 mm and stays below e_n + 3 min up to the 70 mm scope, so e_n + 3
      // min is kept for every wall: never shorter than either formula, no jump.
      rule: { kind: 'linear', basis: 'wall-mm', perMm: 60, offset: 180 },
      source: `${ISO_CARD}: cooling in the machine e_n + 3 min for e_n < 18 mm at 23 ± 2 °C; kept for e_n ≥ 18 mm, where the card's quoted formula is shorter and discontinuous (our choice)`,
      status: 'confirmed-2nd',
    },
    wallRangeMm: ISO_WALL_RANGE,
    outsideDiameterRangeMm: null,
    weather: {
      ambientRangeC: ISO_AMBIENT_RANGE,
      shelterAlways: null,
      coldShelter: null,
      coolingAdjustment: {
        referenceC: 23,
        percentPerC: 1,
        source: `${ISO_CARD}: cooling times are for 23 ± 2 °C and change by about 1 % per °C; applied only to lengthen them above 23 °C (our choice: never shorter in the cold)`,
        status: 'confirmed-2nd',
      },
    },
  },
  notes: [
    'Heat-soak pressure is drag only (≈ 0 interfacial).',
    'The bead measured is the bead at the heater at the end of bead-up.',
    'Cooling times are for 23 ± 2 °C; the card adjusts them by about 1 % per °C.',
    'Values marked confirmed in a reproduction come from one parameter card; the changeover and pressure tolerances are from memory: check against ISO 21307:2017+A1:2020 before use.',
  ],
};

export const ISO_21307_DLP: ProcedureDefinition = {
  standard: 'iso-21307-dlp',
  label: 'ISO 21307 dual low-pressure',
  windows: {
    heaterTemperatureC: { min: 230, max: 250, source: `${ISO_SOURCE} dual low-pressure: heater plate 230–250 °C`, status: 'from-memory' },
    beadUpInterfacialPressureMpa: { min: 0.13, max: 0.17, source: `${ISO_SOURCE} dual low-pressure: bead-up P1 = 0.15 ± 0.02 MPa`, status: 'from-memory' },
    fusionInterfacialPressureMpa: { min: 0.13, max: 0.17, source: `${ISO_SOURCE} dual low-pressure: fusion P4 = 0.15 ± 0.02 MPa for about 10 s`, status: 'from-memory' },
    coolingInterfacialPressureMpa: { min: 0.025, max: 0.025, source: `${ISO_SOURCE} dual low-pressure: reduced cooling pressure P5 = 0.025 MPa`, status: 'from-memory' },
    heatSoakInterfacialPressureMpa: { max: 0, source: `${ISO_SOURCE} dual low-pressure: heat soak at drag pressure or less (P2 ≈ 0)`, status: 'from-memory' },
    minBeadMm: null,
    heatSoakS: {
      target: null,
      min: OPERATOR_SOAK_MIN,
      max: null,
      source: 'operator minimum heat soak 10 × e_n s: no published ISO 21307 dual low-pressure heat-end criterion confirmed',
      status: 'operator',
    },
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
    weather: {
      ambientRangeC: ISO_AMBIENT_RANGE,
      shelterAlways: null,
      coldShelter: null,
      coolingAdjustment: null,
    },
  },
  notes: [
    'Fusion pressure P4 is held for about 10 s, then reduced to P5 for cooling.',
    'Heat soak: the operator minimum of 10 × e_n s keeps a zero-length soak from passing.',
    'Every ISO 21307 value here is from memory: check against ISO 21307:2017+A1:2020 before use.',
  ],
};

export const ISO_21307_SHP: ProcedureDefinition = {
  standard: 'iso-21307-shp',
  label: 'ISO 21307 single high-pressure',
  windows: {
    heaterTemperatureC: { min: 215, max: 235, source: `${ISO_SOURCE} single high-pressure: heater plate 215–235 °C`, status: 'from-memory' },
    beadUpInterfacialPressureMpa: { min: 0.42, max: 0.62, source: `${ISO_SOURCE} single high-pressure: bead-up P1 = 0.52 ± 0.10 MPa`, status: 'from-memory' },
    fusionInterfacialPressureMpa: { min: 0.42, max: 0.62, source: `${ISO_SOURCE} single high-pressure: fusion P4 = 0.52 ± 0.10 MPa`, status: 'from-memory' },
    coolingInterfacialPressureMpa: null,
    heatSoakInterfacialPressureMpa: { max: 0, source: `${ISO_SOURCE} single high-pressure: heat soak at drag pressure or less (P2 ≈ 0)`, status: 'from-memory' },
    minBeadMm: null,
    heatSoakS: {
      target: null,
      min: OPERATOR_SOAK_MIN,
      max: null,
      source: 'operator minimum heat soak 10 × e_n s: no published ISO 21307 single high-pressure heat-end criterion confirmed (the procedure ends heating by bead size)',
      status: 'operator',
    },
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
    weather: {
      ambientRangeC: ISO_AMBIENT_RANGE,
      shelterAlways: null,
      coldShelter: null,
      coolingAdjustment: null,
    },
  },
  notes: [
    'Heat soak is ended by bead size (recalled as about 11 × e_n s); the operator minimum of 10 × e_n s keeps a zero-length soak from passing.',
    'Every ISO 21307 value here is from memory: check against ISO 21307:2017+A1:2020 before use.',
  ],
};
