/**
 * How a bench-data file's columns map onto a measurement: a load curve (x = load current, A;
 * y = output voltage, V) or a ripple capture (x = time, s; y = output voltage, V). Scales turn the
 * file's numbers into SI (0.001 for a column in mA). Shared by the upload form and the routes.
 */
import { z } from '../circuit/zod';

/** Largest file the bench upload takes (bytes): 2 MiB. */
export const MAX_BENCH_FILE_BYTES = 2 * 1024 * 1024;
/** Most data rows one file may hold. */
export const MAX_BENCH_ROWS = 20_000;
/** Most columns a file may have (wider files are not measurement logs). */
export const MAX_BENCH_COLUMNS = 200;

export const BENCH_KINDS = ['loadCurve', 'ripple'] as const;
export type BenchKind = (typeof BENCH_KINDS)[number];

const scale = z
  .number()
  .refine(Number.isFinite, { message: 'must be a finite number' })
  .refine((v) => v > 0 && v <= 1e12, { message: 'must be greater than zero (and at most 1e12)' });

export const benchMappingSchema = z
  .object({
    kind: z.enum(BENCH_KINDS),
    /** 0-based column index of x (load current or time). */
    xColumn: z.int().min(0).max(MAX_BENCH_COLUMNS - 1),
    /** 0-based column index of y (output voltage). */
    yColumn: z.int().min(0).max(MAX_BENCH_COLUMNS - 1),
    /** Multiply x by this for SI (A or s). */
    xScale: scale,
    /** Multiply y by this for SI (V). */
    yScale: scale,
  })
  .refine((m) => m.xColumn !== m.yColumn, { message: 'x and y must be different columns', path: ['yColumn'] });
export type BenchMapping = z.infer<typeof benchMappingSchema>;

/** Name of a dataset as the user types it. */
export const benchNameSchema = z.string().trim().min(1, 'give the dataset a name').max(120);
/** Optional notes (how it was measured, probe, instrument). */
export const benchNotesSchema = z.string().trim().max(2000).optional();

/** What x and y mean for each kind, SI units. */
export const AXES: Record<BenchKind, { x: string; xUnit: 'A' | 's'; y: string; yUnit: 'V' }> = {
  loadCurve: { x: 'Load current', xUnit: 'A', y: 'Output voltage', yUnit: 'V' },
  ripple: { x: 'Time', xUnit: 's', y: 'Output voltage', yUnit: 'V' },
};
