export * from './columns.ts';
export * from './scans.ts';
export * from './batches.ts';
export * from './pointResults.ts';
export * from './accounts.ts';
export * from './workers.ts';
