import { describe, expect, test } from 'vitest';
import * as domain from '@/domain';

describe('domain/index.ts', () => {
  test.each([
    // source: issue 3 "Public names" list
    'pipeGeometry',
    'nominalOutsideDiameterMm',
    'planButtFusion',
    'checkJoint',
    'parseTraceCode',
    'buildTraceCode',
    'qualificationStatus',
    'planCoilRun',
    // the rest of the domain's public functions
    'pipeSizes',
    'ipsMinimumWallIn',
    'minimumBendRadiusMm',
    'interfacialPressureFromGauge',
    'deriveProcedure',
    'describeProcedureWindows',
    'builtInProcedure',
    'legacyQualificationStatus',
    'coilLengthAfterPull',
    'nextCoil',
    'canMoveCoil',
    'parsePressureTraceCsv',
    'readPressureTrace',
    'synthesizePressureTrace',
    'formatQuantity',
    'toDisplay',
    'fromDisplay',
    'unitLabel',
    'fusionPlanSchema',
    'parseProcedureDefinition',
  ])('exports %s', (name) => {
    expect(domain[name as keyof typeof domain]).toBeDefined();
  });
});
