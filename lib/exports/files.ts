/**
 * The text exports of a stored revision and the names of the downloaded files.
 *
 * - Netlist: the project's SPICE subset exactly as the editor exports it (lib/editor/io.ts,
 *   title line, tool and caution comments, `formatNetlist`'s cards), with one `*` comment line per
 *   designated part after the caution, naming its designator, its netlist element and where it
 *   sits ("* C1 = Cp_s1 (Stage 1 · pumping C)"), so the netlist, the BOM and the report agree.
 *   Comment lines change nothing the parser or `npm run solve` reads.
 * - Design JSON: the stored document, validated (defaults filled), pretty-printed with 2 spaces.
 *
 * Pure.
 */
import { compileDocument, type DesignDocument } from '../circuit';
import { designatorKey, designatorMap, compareDesignators } from '../circuit/document/designators';
import { exportDesignJson, exportNetlistText } from '../editor/io';

export const EXPORT_FORMATS = ['bom', 'netlist', 'json', 'pdf'] as const;
export type ExportFormat = (typeof EXPORT_FORMATS)[number];

export const CONTENT_TYPES: Record<ExportFormat, string> = {
  bom: 'text/csv; charset=utf-8',
  netlist: 'text/plain; charset=utf-8',
  json: 'application/json',
  pdf: 'application/pdf',
};

const SUFFIX: Record<ExportFormat, string> = { bom: 'bom.csv', netlist: 'netlist.cir', json: 'design.json', pdf: 'report.pdf' };

/** A design title as a file-name slug: lower-case ASCII letters and digits joined by '-', at most 60 characters. */
export function designSlug(title: string): string {
  const slug = title
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60)
    .replace(/-+$/g, '');
  return slug || 'design';
}

/** `<design-slug>-r<n>-<what>`, e.g. `detector-bias-ladder-r3-bom.csv`. */
export function exportFileName(title: string, revision: number, format: ExportFormat): string {
  return `${designSlug(title)}-r${revision}-${SUFFIX[format]}`;
}

/** The netlist with designator comments (see the file comment); a drawing that does not compile gives its reason. */
export function netlistWithDesignators(doc: DesignDocument, title: string): { ok: true; text: string } | { ok: false; reason: string } {
  const exported = exportNetlistText(doc, { title });
  if (!exported.ok) return exported;
  const compiled = compileDocument(doc);
  if (!compiled.ok) return { ok: false, reason: compiled.reason };
  const designators = designatorMap(doc);
  const lines: Array<[string, string]> = [];
  for (const el of compiled.netlist.elements) {
    const o = el.origin;
    if (!o || !o.role) continue;
    const d = designators.get(designatorKey(o.blockId, o.role));
    if (!d) continue;
    const block = doc.blocks.find((b) => b.id === o.blockId);
    const where = block?.kind === 'stage' ? `${block.label?.trim() || block.id} · ${o.role}` : block?.label?.trim() || o.blockId;
    lines.push([d, `* ${d} = ${el.name} (${where.replace(/[\r\n]+/g, ' ')})`]);
  }
  lines.sort((a, b) => compareDesignators(a[0], b[0]));
  if (lines.length === 0) return exported;
  // after line 1 (title) and the two comment lines the formatter writes
  const all = exported.text.split('\n');
  const at = Math.min(3, all.length);
  const text = [...all.slice(0, at), '* Designators (as in the BOM and the report):', ...lines.map(([, l]) => l), ...all.slice(at)].join('\n');
  return { ok: true, text };
}

/** The design JSON download: the stored document, pretty-printed. */
export function designJsonText(doc: DesignDocument): string {
  return exportDesignJson(doc);
}
