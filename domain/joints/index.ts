// Joints at the trench: the record-joint schema, the pre-recording rules (scan reading,
// size mismatch, refusals and overrides), the phase timer, the table of recorded values and
// a resubmission's fingerprint.
export * from '@/domain/joints/schemas';
export * from '@/domain/joints/rules';
export * from '@/domain/joints/timer';
export * from '@/domain/joints/values';
export * from '@/domain/joints/pre-record';
export * from '@/domain/joints/submission';
export * from '@/domain/joints/reference';
