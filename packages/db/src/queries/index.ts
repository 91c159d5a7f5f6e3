export * from './audit.ts';
