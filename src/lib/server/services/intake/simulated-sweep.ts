// Old import path of src/core/intake/simulated-sweep.ts, for callers not yet moved there.
export * from '~/core/intake/simulated-sweep';
