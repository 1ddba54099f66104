// The Register: filter/sort schemas read from the URL, keyset cursors, and the columns the
// grid and the export share (units converted at this edge).
export * from '@/domain/register/filter';
export * from '@/domain/register/cursor';
export * from '@/domain/register/columns';
export * from '@/domain/register/describe';
export * from '@/domain/register/count';
