/**
 * Import and export from the canvas: the SPICE-subset netlist (what `npm run solve` reads), the
 * design JSON (the validated canvas document), and reading either back into a document. Parsing
 * and validation failures are returned values that name the line or the field.
 */
import { compileDocument, designDocumentSchema, parseNetlist, type DesignDocument } from '@/lib/circuit';
import { documentFromNetlist } from '@/lib/circuit/document/from-netlist';
import { netlistTextOf } from './engine/netlist-text';

export { NETLIST_CAUTION } from './engine/netlist-text';

/** File endings read as SPICE netlists. */
export const NETLIST_EXTENSIONS = ['.cir', '.net', '.sp', '.txt'] as const;

/** Largest file the importer reads (characters), the netlist parser's own limit. */
export const MAX_IMPORT_CHARS = 2_000_000;

/**
 * The netlist of a design as SPICE-subset text: line 1 is the design title (SPICE's title line),
 * then a comment naming the tool and the high-voltage caution, then the cards of
 * `formatNetlist`. The editor's worker solves exactly this text read back, so
 * `npm run solve -- file.cir` prints the figures the canvas shows. Fails when the drawing does
 * not compile (the reason is the compiler's first error).
 */
export function exportNetlistText(doc: DesignDocument, meta?: { title?: string }): { ok: true; text: string } | { ok: false; reason: string } {
  const compiled = compileDocument(doc);
  if (!compiled.ok) return { ok: false, reason: compiled.reason };
  return { ok: true, text: netlistTextOf(compiled.netlist, meta?.title) };
}

/**
 * The design as pretty-printed JSON (2-space indent): the document after schema validation
 * (defaults filled in). With a title it is wrapped as `{ title, document }`, a shape
 * {@link importDesignFile} and `npm run solve` both accept. A document that fails validation
 * (which the editor's store never holds) is written as it is, so nothing is lost; importing it
 * names the bad field.
 */
export function exportDesignJson(doc: DesignDocument, meta?: { title?: string }): string {
  const parsed = designDocumentSchema.safeParse(doc);
  const document = parsed.success ? parsed.data : doc;
  const title = meta?.title?.trim();
  return `${JSON.stringify(title ? { title, document } : document, null, 2)}\n`;
}

function extensionOf(fileName: string): string {
  const m = /\.[^./\\]+$/.exec(fileName.trim());
  return m ? m[0].toLowerCase() : '';
}

function importJson(fileName: string, text: string): { ok: true; document: DesignDocument; warnings: string[] } | { ok: false; reason: string } {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    return { ok: false, reason: `${fileName} is not valid JSON (${e instanceof Error ? e.message : String(e)})` };
  }
  const wrapped = raw !== null && typeof raw === 'object' && !Array.isArray(raw) && 'document' in raw;
  const candidate = wrapped ? (raw as { document: unknown }).document : raw;
  const parsed = designDocumentSchema.safeParse(candidate);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const path = [...(wrapped ? ['document'] : []), ...(issue?.path ?? [])].map(String).join('.');
    return { ok: false, reason: `${fileName} is not a Kilorung design: field ${path || '(root)'}: ${issue?.message ?? 'invalid'}` };
  }
  return { ok: true, document: parsed.data, warnings: [] };
}

function importNetlist(fileName: string, text: string): { ok: true; document: DesignDocument; warnings: string[] } | { ok: false; reason: string } {
  const parsed = parseNetlist(text);
  if (!parsed.ok) {
    const shown = parsed.errors.slice(0, 3).map((e) => `line ${e.line}: ${e.message}`);
    const more = parsed.errors.length > 3 ? ` (and ${parsed.errors.length - 3} more)` : '';
    return { ok: false, reason: `${fileName} is not a readable netlist: ${shown.join('; ')}${more}` };
  }
  const laid = documentFromNetlist(parsed.netlist);
  if (!laid.ok) return { ok: false, reason: `${fileName}: ${laid.reason}` };
  return { ok: true, document: laid.document, warnings: [...parsed.warnings.map((w) => `line ${w.line}: ${w.message}`), ...laid.warnings] };
}

/**
 * Read a file the user picked: `.json` as a design document (bare or `{ document }`),
 * `.cir` / `.net` / `.sp` / `.txt` as a SPICE-subset netlist laid out as blocks
 * (`documentFromNetlist`). Any other ending is sniffed: text starting with `{` is JSON.
 */
export function importDesignFile(fileName: string, text: string): { ok: true; document: DesignDocument; warnings: string[] } | { ok: false; reason: string } {
  if (typeof text !== 'string') return { ok: false, reason: `${fileName} is not a text file` };
  if (text.length > MAX_IMPORT_CHARS) return { ok: false, reason: `${fileName} is ${text.length} characters; the limit is ${MAX_IMPORT_CHARS}` };
  const ext = extensionOf(fileName);
  if (ext === '.json') return importJson(fileName, text);
  if ((NETLIST_EXTENSIONS as readonly string[]).includes(ext)) return importNetlist(fileName, text);
  if (/^\s*\{/.test(text)) return importJson(fileName, text);
  return { ok: false, reason: `${fileName}: unknown file type "${ext || '(none)'}" — use a design .json or a netlist (${NETLIST_EXTENSIONS.join(', ')})` };
}

/** Offer `text` as a file download (browser only): a Blob URL on a temporary link, released afterwards. */
export function downloadText(fileName: string, text: string, mime: string): void {
  const url = URL.createObjectURL(new Blob([text], { type: mime }));
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  a.rel = 'noopener';
  a.style.display = 'none';
  document.body.appendChild(a);
  a.click();
  a.remove();
  // Some browsers start the download after the click returns; release the URL a little later.
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}
