// The inversion model the pool, the command line and the benchmarks run. It is a local stand-in
// with the same shape as the shared library's API (compileInversion → cloneable plan,
// applyInversion over a pixel range, base detection, forward model); swapping to
// '@clearbase/inversion' is a change to this file only.
export * from './local-model/index';
