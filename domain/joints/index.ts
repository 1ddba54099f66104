// Joints at the trench: the record-joint schema, the pre-recording rules (scan reading,
// size mismatch, refusals and overrides), the phase timer and the check's measurements.
export * from '@/domain/joints/schemas';
export * from '@/domain/joints/rules';
export * from '@/domain/joints/timer';
export * from '@/domain/joints/measurements';
export * from '@/domain/joints/pre-record';
