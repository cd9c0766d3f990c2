export * from './stock-profile';
export * from './inversion-plan';
export * from './film-base';
export * from './density-levels';
export * from './negative-synth';
