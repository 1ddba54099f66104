// Evaluating a size rule for a pipe.

import type { SizeBasis, SizeRule } from '@/domain/procedures/types';

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
