// Pressure traces: our CSV format, phase reading, and a deterministic generator.
export * from '@/domain/pressure-trace/parse';
export * from '@/domain/pressure-trace/read';
export * from '@/domain/pressure-trace/synthesize';
