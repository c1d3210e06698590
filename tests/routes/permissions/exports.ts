/** Route × role cases for the exports routes (run by tests/routes/permissions.test.ts). */
import type { Case } from './shared';

export const exportsCases: Case[] = [];
