export * from './columns.ts';
export * from './scans.ts';
export * from './batches.ts';
export * from './pointResults.ts';
