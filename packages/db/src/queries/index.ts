export * from './audit.ts';
export * from './peer-groups.ts';
export * from './peer-statistics.ts';
export * from './publishing.ts';
export * from './peer-statistics-failures.ts';
export * from './patient-results.ts';
