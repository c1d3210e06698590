/** Sweeps and tolerance spreads (pure): specs, variants, seeded draws, statistics, points and results. */
export * from './spec';
export * from './rng';
export * from './stats';
export * from './variants';
export * from './run';
