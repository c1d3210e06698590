/** Route × role cases for the analyses routes (run by tests/routes/permissions.test.ts). */
import type { Case } from './shared';

export const analysesCases: Case[] = [];
