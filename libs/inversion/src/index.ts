// Public API of the inversion engine. Pure TypeScript: no I/O, no platform imports.
export * from './srgb';
export * from './lab';
export * from './delta-e';
export * from './density';
export * from './printer-points';
export * from './monotone-curve';
export * from './scanner-input';
export * from './film-base';
export * from './tone-curve';
export * from './invert-pixel';
export * from './compile-inversion';
export * from './forward-model';
export * from './frame-levels';
export * from './reference-linear';
export * from './calibration/index';
export * from './neutral-picker';
export * from './capture-primaries';
