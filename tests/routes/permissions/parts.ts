/** Route × role cases for the parts routes (run by tests/routes/permissions.test.ts). */
import * as teamParts from '@/app/api/teams/[teamId]/parts/route';
import * as partImport from '@/app/api/teams/[teamId]/parts/import/route';
import * as onePart from '@/app/api/parts/[partId]/route';
import * as datasheet from '@/app/api/parts/[partId]/datasheet/route';
import * as policy from '@/app/api/teams/[teamId]/parts-policy/route';
import { createPart, putDatasheet } from '@/lib/data/parts';
import { partInputSchema } from '@/lib/parts/schema';
import type { Fixtures } from '../helpers';
import { MEMBERS_READ, OWNER_ONLY, WRITERS, type Case } from './shared';

let n = 0;
const number = () => `PERM-${Date.now().toString(36)}-${++n}`;

function capacitor(partNumber = number()) {
  return { kind: 'capacitor', partNumber, maker: 'Matrix Components', specs: { capacitanceF: 2.2e-9, tolerance: 0.1, ratedVoltageV: 10_000, dielectric: 'mica' } };
}

const PDF = new TextEncoder().encode('%PDF-1.4\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n');

function pdfForm(): FormData {
  const fd = new FormData();
  fd.set('file', new File([PDF as BlobPart], 'matrix.pdf', { type: 'application/pdf' }));
  return fd;
}

/** A fresh part of the fixture team (made by its designer), optionally with a datasheet. */
async function newPart(f: Fixtures, withSheet = false): Promise<string> {
  const p = await createPart(f.users.designer.id, f.teamId, partInputSchema.parse(capacitor()));
  if (withSheet) await putDatasheet(f.users.designer.id, p.id, { fileName: 'matrix.pdf', declaredType: 'application/pdf', bytes: PDF });
  return p.id;
}

export const partsCases: Case[] = [
  {
    name: 'GET the team’s parts (every member)',
    handler: teamParts.GET,
    method: 'GET',
    expect: MEMBERS_READ,
    prepare: async (f) => ({ path: `/api/teams/${f.teamId}/parts`, params: { teamId: f.teamId } }),
  },
  {
    name: 'POST a part (owners and designers)',
    handler: teamParts.POST,
    method: 'POST',
    expect: WRITERS(201),
    prepare: async (f) => ({ path: `/api/teams/${f.teamId}/parts`, params: { teamId: f.teamId }, body: capacitor() }),
  },
  {
    name: 'POST a parts CSV import (owners and designers)',
    handler: partImport.POST,
    method: 'POST',
    expect: WRITERS(200),
    prepare: async (f) => ({
      path: `/api/teams/${f.teamId}/parts/import`,
      params: { teamId: f.teamId },
      body: { csv: `kind,part_number,capacitance,tolerance,rated_voltage,dielectric\ncapacitor,${number()},1n,5%,3kV,mica\n` },
    }),
  },
  {
    name: 'GET a part (every member of its team)',
    handler: onePart.GET,
    method: 'GET',
    expect: MEMBERS_READ,
    prepare: async (f) => {
      const partId = await newPart(f);
      return { path: `/api/parts/${partId}`, params: { partId } };
    },
  },
  {
    name: 'PATCH a part (owners and designers)',
    handler: onePart.PATCH,
    method: 'PATCH',
    expect: WRITERS(200),
    prepare: async (f) => {
      const partId = await newPart(f);
      return { path: `/api/parts/${partId}`, params: { partId }, body: capacitor() };
    },
  },
  {
    name: 'DELETE a part (owners and designers)',
    handler: onePart.DELETE,
    method: 'DELETE',
    expect: WRITERS(200),
    prepare: async (f) => {
      const partId = await newPart(f);
      return { path: `/api/parts/${partId}`, params: { partId } };
    },
  },
  {
    name: 'GET a part’s datasheet (every member)',
    handler: datasheet.GET,
    method: 'GET',
    expect: MEMBERS_READ,
    prepare: async (f) => {
      const partId = await newPart(f, true);
      return { path: `/api/parts/${partId}/datasheet`, params: { partId } };
    },
  },
  {
    name: 'PUT a part’s datasheet (owners and designers)',
    handler: datasheet.PUT,
    method: 'PUT',
    expect: WRITERS(200),
    prepare: async (f) => {
      const partId = await newPart(f);
      return { path: `/api/parts/${partId}/datasheet`, params: { partId }, body: pdfForm() };
    },
  },
  {
    name: 'DELETE a part’s datasheet (owners and designers)',
    handler: datasheet.DELETE,
    method: 'DELETE',
    expect: WRITERS(200),
    prepare: async (f) => {
      const partId = await newPart(f, true);
      return { path: `/api/parts/${partId}/datasheet`, params: { partId } };
    },
  },
  {
    name: 'GET the team’s derating policy (every member)',
    handler: policy.GET,
    method: 'GET',
    expect: MEMBERS_READ,
    prepare: async (f) => ({ path: `/api/teams/${f.teamId}/parts-policy`, params: { teamId: f.teamId } }),
  },
  {
    name: 'PUT the team’s derating policy (owners only)',
    handler: policy.PUT,
    method: 'PUT',
    expect: OWNER_ONLY(200),
    prepare: async (f) => ({ path: `/api/teams/${f.teamId}/parts-policy`, params: { teamId: f.teamId }, body: { deratingFraction: 0.75 } }),
  },
];
