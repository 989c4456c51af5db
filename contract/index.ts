/**
 * Public face of contract/: the shapes every room shares, written once. No Node APIs and nothing else of the
 * project is imported here, so the browser console can bundle it (the console imports nothing else).
 */
export * from './bodies.ts';
export * from './problem-schema.ts';
export * from './problem-bounds.ts';
export type * from './plan-types.ts';
export * from './job-types.ts';
export * from './roles.ts';
export * from './archive-types.ts';
export * from './review-schemas.ts';
export * from './http-schemas.ts';
export * from './env-config.ts';
export * from './free-text.ts';
export { PACKAGE_VERSION, SOFTWARE_VERSION } from './software-version.ts';
export * from './errors.ts';
export * from './budget-schema.ts';
export type * from './budget-types.ts';
export { canonicalJson } from './canonical-json.ts';
export * from './event-stream.ts';
export * from './budget-job-types.ts';
export * from './ephemeris-sets.ts';
