/** Route × role cases for the parts routes (run by tests/routes/permissions.test.ts). */
import type { Case } from './shared';

export const partsCases: Case[] = [];
