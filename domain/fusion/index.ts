// Fusion: pressure plans, joint checks, the parameters they judge and input schemas
// (procedures as data are domain/procedures).
export * from '@/domain/fusion/parameters';
export * from '@/domain/fusion/plan';
export * from '@/domain/fusion/check';
export * from '@/domain/fusion/schemas';
export * from '@/domain/fusion/judge';
