/**
 * Demo of library binding (invented scenario): the fork "1.5 kV detector bias — low-ripple
 * variant" gets a third revision by Ada whose stage diodes are bound to the team's stocked
 * rectifier TGD-1K0-1A (scripts/seed-parts.ts). Binding copies the part's model and ratings into
 * the document (lib/parts/binding.ts), exactly as the inspector does; its 47 nF capacitors stay
 * the design's own values (the library stocks no 47 nF part), so the demo shows both.
 *
 * Idempotent: the revision has a fixed id and is written only when the fork still ends at r2 and
 * the part exists; revisions are append-only, so nothing existing is changed.
 */
import type { Transaction } from 'sequelize';
import { db } from '../lib/db';
import { designDocumentSchema, type DesignDocument } from '../lib/circuit/document/schema';
import { summariseTopology } from '../lib/data/topology';
import { bindRole, partRolesOf, ROLE_KIND, type AnyPart } from '../lib/parts/binding';

/** The fork's id in scripts/seed.ts (design group 3, number 4). */
const FORK_ID = '00000003-5eed-4000-8000-000000000004';
const REVISION_ID = '00000b1d-5eed-4000-8000-000000000001';
const PART_NUMBER = 'TGD-1K0-1A';

/** Every stage diode of `doc` bound to `part` (a pure copy of the part's values; capacitors left as they are). */
export function bindStageDiodes(doc: DesignDocument, part: AnyPart): DesignDocument {
  return {
    ...doc,
    blocks: doc.blocks.map((b) => {
      if (b.kind !== 'stage') return b;
      let next = b as DesignDocument['blocks'][number];
      for (const role of partRolesOf(b)) {
        if (ROLE_KIND[role] !== 'diode') continue;
        const r = bindRole(next, role, part);
        if (!r.ok) throw new Error(r.reason);
        next = r.block;
      }
      return next;
    }),
  };
}

/** Adds the bound revision once; returns how many revisions it created (0 or 1). */
export async function seedBindings(transaction: Transaction, o: { teamId: string; authorId: string }): Promise<number> {
  const { Design, DesignRevision, Part } = db().models;
  if (await DesignRevision.findByPk(REVISION_ID, { transaction })) return 0;
  const design = await Design.findByPk(FORK_ID, { transaction });
  if (!design || design.latestRevision !== 2 || design.teamId !== o.teamId) return 0;
  const part = await Part.findOne({ where: { teamId: o.teamId, partNumber: PART_NUMBER }, transaction });
  if (!part || part.kind !== 'diode') return 0;
  const r2 = await DesignRevision.findOne({ where: { designId: FORK_ID, number: 2 }, transaction });
  if (!r2) return 0;
  // A day after r2, never in the future.
  const at = new Date(Math.min(Date.now() - 60_000, new Date(r2.createdAt).getTime() + 24 * 60 * 60 * 1000));
  const lib = { id: part.id, kind: 'diode', partNumber: part.partNumber, specs: part.specs } as unknown as AnyPart;
  const document = designDocumentSchema.parse(bindStageDiodes(designDocumentSchema.parse(r2.document), lib));
  await DesignRevision.create({ id: REVISION_ID, designId: FORK_ID, number: 3, document, authorId: o.authorId, message: `Stage diodes bound to the library rectifier ${PART_NUMBER}`, createdAt: at }, { transaction });
  const { topology, stages } = summariseTopology(document);
  await db().sequelize.query('UPDATE designs SET latest_revision = 3, topology = :topology, stages = :stages, updated_at = :at WHERE id = :id', {
    replacements: { topology, stages, at, id: FORK_ID },
    transaction,
  });
  return 1;
}
