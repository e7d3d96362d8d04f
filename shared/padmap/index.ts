export * from './units.js';
export * from './rules.js';
export * from './keys.js';
export * from './compute.js';
export * from './entries.js';
export * from './suggest.js';
