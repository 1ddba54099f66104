// Public entry of Beadline's domain layer: pure TypeScript computations in canonical SI
// units (mm, mm², MPa, °C, s, m) — pipe geometry, pressure plans, joint checks, ASTM F2897
// traceability codes, 49 CFR 192.285 qualification status, coil planning, pressure-trace
// reading and unit conversion. No framework, database, clock or randomness.
export * from '@/domain/errors';
export * from '@/domain/sources';
export * from '@/domain/units';
export * from '@/domain/pipe';
export * from '@/domain/procedures';
export * from '@/domain/fusion';
export * from '@/domain/trace-code';
export * from '@/domain/qualifications';
export * from '@/domain/coils';
export * from '@/domain/pressure-trace';
