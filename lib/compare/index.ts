/**
 * Comparing two designs (two revisions, or a parent and its fork): {@link diffDesigns} for what
 * changed in the drawing, {@link resultsOf} + {@link diffResults} for what that did to the solve,
 * and the display helpers the compare page writes them with. Pure TypeScript: no React, no
 * database, no `server-only`.
 */
export * from './diff';
export * from './results';
export * from './format';
export * from './view';
