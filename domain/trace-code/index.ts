// ASTM F2897 traceability code: parse, build, and the code tables.
export * from '@/domain/trace-code/trace-code';
export * from '@/domain/trace-code/component-types';
