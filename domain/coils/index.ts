// Coils: statuses, run planning (coils versus sticks), length left after a pull, next coil,
// status moves.
export * from '@/domain/coils/statuses';
export * from '@/domain/coils/planning';
export { coilLengthAfterPull } from '@/domain/coils/life';
export * from '@/domain/coils/scanned-coil';
