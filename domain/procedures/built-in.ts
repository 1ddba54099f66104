// The built-in published procedures, handed out as fresh copies.

import { DomainError } from '@/domain/errors';
import { ASTM_F2620 } from '@/domain/procedures/astm-f2620';
import { DVS_2207_1 } from '@/domain/procedures/dvs-2207';
import { clone } from '@/domain/procedures/helpers';
import { ISO_21307_DLP, ISO_21307_SHP, ISO_21307_SLP } from '@/domain/procedures/iso-21307';
import { FUSION_STANDARDS, type FusionStandard, type ProcedureDefinition } from '@/domain/procedures/types';

const BUILT_IN: Readonly<Record<FusionStandard, ProcedureDefinition>> = {
  'astm-f2620': ASTM_F2620,
  'iso-21307-slp': ISO_21307_SLP,
  'iso-21307-dlp': ISO_21307_DLP,
  'iso-21307-shp': ISO_21307_SHP,
  'dvs-2207-1': DVS_2207_1,
};

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
