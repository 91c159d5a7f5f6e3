export * from './schema/index.ts';
export * from './client.ts';
