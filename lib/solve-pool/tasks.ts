/**
 * What the solve pool (./index.ts) may run: the server's three solves, each a pure function of
 * plain, structured-cloneable arguments with a plain result. Loaded inside the pool's worker
 * threads (./worker.mjs), never on the request thread.
 */
import { compareWithModel } from '../bench/model';
import { resultsOf } from '../compare/results';
import { solveForExport } from '../exports/solve';

export const tasks = { resultsOf, solveForExport, compareWithModel } as const;

export type Tasks = typeof tasks;
export type TaskName = keyof Tasks;
