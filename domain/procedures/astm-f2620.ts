// ASTM F2620 butt-fusion parameter windows, each value with its source and status.

import { fToC, inToMm, MM_PER_IN, psiToMpa } from '@/domain/units/conversions';
import { inBand } from '@/domain/procedures/helpers';
import type { ProcedureDefinition } from '@/domain/procedures/types';

const F2620_SOURCE = 'ASTM F2620 butt-fusion procedure';

export const ASTM_F2620: ProcedureDefinition = {
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
    heatSoakInterfacialPressureMpa: {
      max: 0,
      source: `${F2620_SOURCE}: heat soak with the ends against the heater without force, at drag pressure (PPI "Melt Procedure" page)`,
      status: 'confirmed',
    },
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
