/**
 * What the bench routes answer (shared by lib/data/bench.ts, the routes and lib/client/bench.ts).
 * Numbers are SI: A, s, V.
 */
import type { UserDto } from '../api/contract';
import type { Comparison } from './compare';
import type { BenchKind, BenchMapping } from './mapping';
import type { CsvColumn, CsvError, Delimiter } from './parse';

export interface BenchDatasetDto {
  id: string;
  designId: string;
  /** The revision the dataset was compared against when uploaded. */
  revision: number;
  kind: BenchKind;
  name: string;
  notes: string | null;
  mapping: BenchMapping;
  pointCount: number;
  fileName: string;
  fileBytes: number;
  uploadedBy: UserDto;
  createdAt: string;
  /** May the caller delete it (owners and designers). */
  canDelete: boolean;
}

/** POST …/bench/inspect. */
export interface BenchInspectDto {
  fileName: string;
  delimiter: Delimiter;
  decimalComma: boolean;
  headerLines: number[];
  rowCount: number;
  columns: CsvColumn[];
  suggested: BenchMapping;
}

/** GET /api/bench/:datasetId — the dataset, its points and the comparison with one revision. */
export interface BenchDetailDto {
  dataset: BenchDatasetDto;
  /** The revision compared (the query's, else the dataset's own). */
  revision: number;
  latestRevision: number;
  points: { line: number; x: number; y: number }[];
  comparison: ({ ok: true } & Comparison) | { ok: false; reason: string };
}

/** The 422 body for a file that does not read: every problem with its 1-based line. */
export interface BenchCsvErrorBody {
  error: { code: 'invalid'; message: string; field: 'file'; lines: CsvError[] };
}
