/**
 * Demo bench data for `scripts/seed.ts`: one load curve on the demo designer's "1.5 kV detector
 * bias ladder" (r2). The numbers are INVENTED for the demo (not a measurement of anything): set a
 * few per cent below the model, as a real build with diode drops and capacitor tolerance might
 * read. Idempotent: a fixed id, created only when missing; the raw file is put in the S3 fake when
 * it is reachable (the seed may run before the fakes start; a later run puts it then).
 */
import type { Transaction } from 'sequelize';
import { db } from '../lib/db';
import { readPoints } from '../lib/bench/parse';
import type { BenchMapping } from '../lib/bench/mapping';
import { getObject, putObject } from '../lib/storage';

export const DEMO_BENCH_ID = '00000009-5eed-4000-8000-000000000001';

/** The invented CSV, as a designer might log it (µA and V, a comment line on top). */
export const DEMO_BENCH_CSV = [
  '# INVENTED DEMO DATA (Kilorung demo, Tallgrass Instruments): not a measurement',
  '# imagined setup: 1000:1 HV divider into a bench meter; supply discharged and grounded before every reconnection',
  'Load current (uA),Output (V)',
  '0,1481',
  '25,1476',
  '50,1472.5',
  '75,1469',
  '100,1465.5',
  '150,1458',
  '200,1451',
  '',
].join('\n');

const MAPPING: BenchMapping = { kind: 'loadCurve', xColumn: 0, yColumn: 1, xScale: 1e-6, yScale: 1 };
const FILE_NAME = 'detector-bias-load-curve-demo.csv';

/** Create the demo dataset on `designId` (revision `revision`) once; returns how many rows it created. */
export async function seedBench(transaction: Transaction, o: { designId: string; revision: number; uploadedById: string }): Promise<number> {
  const { BenchDataset } = db().models;
  const fileKey = `bench/${o.designId}/${DEMO_BENCH_ID}/${FILE_NAME}`;
  const bytes = new TextEncoder().encode(DEMO_BENCH_CSV);
  try {
    if (!(await getObject(fileKey))) await putObject(fileKey, bytes, 'text/csv');
  } catch (e) {
    console.log(`[seed] bench demo file not put in object storage (${e instanceof Error ? e.message : String(e)}); run the seed again with the fakes up to add it`);
  }
  if (await BenchDataset.findByPk(DEMO_BENCH_ID, { transaction })) return 0;
  const read = readPoints(DEMO_BENCH_CSV, MAPPING);
  if (!read.ok) throw new Error(`demo bench CSV does not read: line ${read.errors[0].line}: ${read.errors[0].reason}`);
  await BenchDataset.create(
    {
      id: DEMO_BENCH_ID,
      designId: o.designId,
      revision: o.revision,
      kind: 'loadCurve',
      name: 'Load curve, bench run 1 (invented demo data)',
      notes: 'Invented demo numbers, not a measurement: a few per cent below the model, as a build with real diode drops and capacitor tolerance might read.',
      mapping: MAPPING,
      points: read.points.map((p) => [p.x, p.y, p.line] as [number, number, number]),
      pointCount: read.points.length,
      fileKey,
      fileName: FILE_NAME,
      fileBytes: bytes.byteLength,
      uploadedById: o.uploadedById,
    },
    { transaction },
  );
  return 1;
}
