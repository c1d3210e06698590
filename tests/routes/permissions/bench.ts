/** Route × role cases for the bench routes (run by tests/routes/permissions.test.ts). */
import fs from 'node:fs';
import path from 'node:path';
import * as bench from '@/app/api/designs/[designId]/bench/route';
import * as inspect from '@/app/api/designs/[designId]/bench/inspect/route';
import * as dataset from '@/app/api/bench/[datasetId]/route';
import * as datasetFile from '@/app/api/bench/[datasetId]/file/route';
import { createBenchDataset } from '@/lib/data/bench';
import type { Fixtures } from '../helpers';
import { MEMBERS_READ, WRITERS, newDesignFor, type Case } from './shared';

const CSV = fs.readFileSync(path.join(import.meta.dirname, '../../fixtures/bench/load-curve-good.csv'));
const MAPPING = { kind: 'loadCurve', xColumn: 0, yColumn: 1, xScale: 1e-3, yScale: 1e3 };

function csvForm(fields: Record<string, string> = {}): FormData {
  const fd = new FormData();
  fd.set('file', new File([CSV as BlobPart], 'bench.csv', { type: 'text/csv' }));
  for (const [k, v] of Object.entries(fields)) fd.set(k, v);
  return fd;
}

/** A stored dataset on a fresh design of the fixture team (uploaded by its designer). */
async function newDataset(f: Fixtures): Promise<string> {
  const designId = await newDesignFor(f);
  const d = await createBenchDataset(
    f.users.designer.id,
    designId,
    { fileName: 'bench.csv', declaredType: 'text/csv', bytes: new Uint8Array(CSV) },
    { mapping: JSON.stringify(MAPPING), name: 'Matrix run' },
  );
  return d.id;
}

export const benchCases: Case[] = [
  {
    name: 'GET bench datasets of a design (every member who reads it)',
    handler: bench.GET,
    method: 'GET',
    expect: MEMBERS_READ,
    prepare: async (f) => {
      const designId = await newDesignFor(f);
      return { path: `/api/designs/${designId}/bench`, params: { designId } };
    },
  },
  {
    name: 'POST a bench dataset (owners and designers)',
    handler: bench.POST,
    method: 'POST',
    expect: WRITERS(201),
    prepare: async (f) => {
      const designId = await newDesignFor(f);
      return { path: `/api/designs/${designId}/bench`, params: { designId }, body: csvForm({ mapping: JSON.stringify(MAPPING), name: 'Matrix upload' }) };
    },
  },
  {
    name: 'POST inspect a bench file (owners and designers; stores nothing)',
    handler: inspect.POST,
    method: 'POST',
    expect: WRITERS(200),
    prepare: async (f) => {
      const designId = await newDesignFor(f);
      return { path: `/api/designs/${designId}/bench/inspect`, params: { designId }, body: csvForm() };
    },
  },
  {
    name: 'GET a bench dataset with its model comparison',
    handler: dataset.GET,
    method: 'GET',
    expect: MEMBERS_READ,
    prepare: async (f) => {
      const datasetId = await newDataset(f);
      return { path: `/api/bench/${datasetId}`, params: { datasetId } };
    },
  },
  {
    name: 'GET the raw file of a bench dataset',
    handler: datasetFile.GET,
    method: 'GET',
    expect: MEMBERS_READ,
    prepare: async (f) => {
      const datasetId = await newDataset(f);
      return { path: `/api/bench/${datasetId}/file`, params: { datasetId } };
    },
  },
  {
    name: 'DELETE a bench dataset (owners and designers)',
    handler: dataset.DELETE,
    method: 'DELETE',
    expect: WRITERS(200),
    prepare: async (f) => {
      const datasetId = await newDataset(f);
      return { path: `/api/bench/${datasetId}`, params: { datasetId } };
    },
  },
];
