// Butt-fusion procedures as data: parameter windows of ASTM F2620, ISO 21307 (single
// low-pressure, dual low-pressure, single high-pressure) and DVS 2207-1, each value with
// its source and status (ASTM F2620, ISO 21307:2017, DVS 2207-1), plus operator-derived procedures that
// may only tighten a base procedure.
//
// Everything here is plain JSON-compatible data (numbers, strings, arrays, null), so a
// procedure version's windows can be stored as JSON and rebuilt with
// parseProcedureDefinition. Canonical units: °C, MPa (interfacial pressure), mm, s.

export * from '@/domain/procedures/types';
export * from '@/domain/procedures/built-in';
export * from '@/domain/procedures/rules';
export * from '@/domain/procedures/derive';
export * from '@/domain/procedures/describe';
export * from '@/domain/procedures/weather';
