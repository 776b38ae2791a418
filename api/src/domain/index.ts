// The client-safe domain computations (no Node modules). checksums.ts is Node-only and is
// imported directly by the server where it is needed.
export * from './input-error';
export * from './xmodem';
export * from './rf';
export * from './dc-lead';
export * from './levels';
export * from './dummy-load';
export * from './e-series';
export * from './attenuator';
export * from './coax';
export * from './line-loss';
export * from './discharge';
export * from './workflow';
