// DVS 2207-1 heated-tool butt welding of PE-HD, each value with its source and status.

import { mmBand } from '@/domain/procedures/helpers';
import type { ProcedureDefinition } from '@/domain/procedures/types';

const DVS_SOURCE = 'DVS 2207-1 (2005 edition, 2007 English translation), heated-tool butt welding of PE-HD';

export const DVS_2207_1: ProcedureDefinition = {
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
    heatSoakInterfacialPressureMpa: {
      max: 0.02,
      source: `${DVS_SOURCE}: heating (heat-soak) pressure at most 0.02 N/mm² (one reproduction gives 0.01)`,
      status: 'confirmed-2nd',
    },
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
    weather: {
      ambientRangeC: null,
      // Work at any outdoor temperature is allowed when the conditions are made suitable.
      shelterAlways: {
        shelter: 'windbreak',
        source: `${DVS_SOURCE}: the welding zone is protected from weather (wind, moisture); work at any outdoor temperature is allowed with suitable measures (pre-heating, tent, heating)`,
        status: 'confirmed',
      },
      coldShelter: {
        belowC: 5,
        shelter: 'tent',
        source: `${DVS_SOURCE}: below +5 °C ambient, special measures such as a tent (the threshold from memory)`,
        status: 'from-memory',
      },
      coolingAdjustment: null,
    },
  },
  notes: [
    'Guide values for PE-HD at about 20 °C and moderate air flow.',
    'Bands are lower exclusive, upper inclusive (a 7 mm wall is in the 4.5–7 mm row); range columns are interpolated linearly within a band (our choice).',
    'Heat-soak pressure at most 0.02 N/mm². Misalignment at most 0.1 × wall.',
    'Every DVS 2207-1 table value here is from memory: check against the current edition before use.',
  ],
};
