// ASTM F2620 butt-fusion parameter windows, each value with its source and status.

import { fToC, inToMm, MM_PER_IN, psiToMpa } from '@/domain/units/conversions';
import { HANDLING_WAIT_NOTE } from '@/domain/procedures/handling';
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
      // Lower end of each PPI suggested bead size; bands by OD, nominal sizes read as IPS
      // ODs (1¼ in 1.660, 3 in 3.500, 8 in 8.625, 12 in 12.75, 24/36/63 in = nominal), the
      // overlapping boundaries taken upper-inclusive.
      rule: {
        kind: 'bands',
        basis: 'outside-diameter-mm',
        interpolate: false,
        startMm: 0,
        bands: [
          inBand(1.66, true, inToMm(1 / 32)),
          inBand(3.5, true, inToMm(1 / 16)),
          inBand(8.625, true, inToMm(1 / 8)),
          inBand(12.75, true, inToMm(3 / 16)),
          inBand(24, true, inToMm(1 / 4)),
          inBand(36, true, inToMm(7 / 16)),
          inBand(63, true, inToMm(9 / 16)),
        ],
      },
      source: `${F2620_SOURCE}: melt bead at the heater, at least the lower end of the PPI suggested melt-bead size by nominal pipe size (1¼ in and smaller 1/32–1/16 in; 1¼–3 in 1/16; 3–8 in 1/8–3/16; 8–12 in 3/16–1/4; 12–24 in 1/4–7/16; 24–36 in 7/16; 36–63 in 9/16), PPI generic butt-fusion procedure as reproduced in a PE pipe maker's manual, Table 4`,
      status: 'confirmed-2nd',
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
      // The table starts at 0.17 in wall, so ½–1¼ in IPS SDR 11 and CTS pipe would have
      // no limit; the operator's value is no looser than the table's smallest (8 s).
      whereNone: {
        value: 8,
        source: 'operator limit for walls the F2620 heater-removal table does not cover (under 0.17 in or over 4.5 in): the table\'s smallest value, 8 s',
        status: 'operator',
      },
    },
    maxPressureBuildUpS: null,
    minCoolingS: {
      rule: { kind: 'linear', basis: 'wall-mm', perMm: (11 * 60) / MM_PER_IN, offset: 0 },
      source: `${F2620_SOURCE}: cooling under pressure 11 min per inch of wall`,
      status: 'from-memory',
    },
    wallRangeMm: null,
    outsideDiameterRangeMm: null,
    // F2620 / the PPI procedure state no ambient range, shelter or cooling adjustment as a
    // rule (the PPI page names wind and cold only as causes of heater heat loss): the
    // operator's version adds its own (Procedures → tighten).
    weather: { ambientRangeC: null, shelterAlways: null, coldShelter: null, coolingAdjustment: null },
  },
  notes: [
    'Heat soak is ended by bead size, not by a fixed time (PPI "Melt Procedure" page, confirmed).',
    HANDLING_WAIT_NOTE,
    'The bead measured is the melt bead at the heater: its size at the end of bead-up/heat soak, before the heater is removed (PPI "Melt Procedure" page).',
    'For walls under 0.17 in the heater-removal table gives no value: the operator limit of 8 s applies (remove the heater as fast as possible).',
  ],
};
