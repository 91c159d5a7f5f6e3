export * from './errors.ts';
export * from './common.ts';
export * from './auth.ts';
export * from './audit.ts';
