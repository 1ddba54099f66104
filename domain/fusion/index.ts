// Fusion: procedures as data, pressure plans, joint checks and input schemas.
export * from '@/domain/fusion/procedures';
export * from '@/domain/fusion/plan';
export * from '@/domain/fusion/check';
export * from '@/domain/fusion/schemas';
