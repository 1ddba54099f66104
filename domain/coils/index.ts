// Coils: statuses, run planning (coils versus sticks), length left, next coil, status moves.
export * from '@/domain/coils/statuses';
export * from '@/domain/coils/planning';
export * from '@/domain/coils/scanned-coil';
