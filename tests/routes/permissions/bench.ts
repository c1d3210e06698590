/** Route × role cases for the bench routes (run by tests/routes/permissions.test.ts). */
import type { Case } from './shared';

export const benchCases: Case[] = [];
