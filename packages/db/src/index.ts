export * from './schema/index.ts';
export * from './client.ts';
export * from './queries/index.ts';
export * from './thresholds.ts';
