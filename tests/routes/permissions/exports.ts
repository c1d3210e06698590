/** Route × role cases for the exports route (run by tests/routes/permissions.test.ts). */
import * as exportRoute from '@/app/api/designs/[designId]/revisions/[number]/export/route';
import { MEMBERS_READ, newDesignFor, type Case } from './shared';

const FORMATS = ['bom', 'netlist', 'json', 'pdf'] as const;

export const exportsCases: Case[] = [
  ...FORMATS.map(
    (format): Case => ({
      name: `GET export ?format=${format} of a team design (every member who reads it)`,
      handler: exportRoute.GET,
      method: 'GET',
      expect: MEMBERS_READ,
      prepare: async (f) => {
        const designId = await newDesignFor(f);
        return { path: `/api/designs/${designId}/revisions/1/export?format=${format}`, params: { designId, number: '1' } };
      },
    }),
  ),
  {
    name: 'GET export of a private design (its author alone)',
    handler: exportRoute.GET,
    method: 'GET',
    expect: [404, 200, 404, 404, 404, 401],
    prepare: async (f) => {
      const designId = await newDesignFor(f, 'designer', 'private');
      return { path: `/api/designs/${designId}/revisions/1/export?format=json`, params: { designId, number: '1' } };
    },
  },
  {
    name: 'GET export with an unknown format (422 for readers; outsiders still learn nothing)',
    handler: exportRoute.GET,
    method: 'GET',
    expect: [422, 422, 422, 422, 422, 401],
    prepare: async (f) => {
      const designId = await newDesignFor(f);
      return { path: `/api/designs/${designId}/revisions/1/export?format=xlsx`, params: { designId, number: '1' } };
    },
  },
];
