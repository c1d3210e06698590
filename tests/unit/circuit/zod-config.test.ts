// The app's content security policy forbids eval; zod must never compile parsers with
// `new Function` (nor probe for it) in any realm that loads the document schema or the API contract.
import { describe, expect, it } from 'vitest';
import { globalConfig } from 'zod/v4/core';
import { designDocumentSchema } from '@/lib/circuit/document/schema';

describe('zod configuration', () => {
  it('is jitless once the document schema is loaded, and the schema still parses', () => {
    expect(globalConfig.jitless).toBe(true);
    expect(designDocumentSchema.safeParse({}).success).toBe(false);
  });
});
