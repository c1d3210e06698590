/**
 * Exports of one stored design revision: the BOM (CSV), the SPICE-subset netlist, the design JSON
 * and the design report (PDF, drawn here on the server).
 *
 * Who may download: whoever may read the design (lib/data/designs.ts `loadReadable`: every member
 * of its team for a team design, its author alone for a private one); anyone else gets 404, as if
 * the design did not exist. Every role that reads may download every format (viewers included):
 * an export shows nothing the design page does not.
 *
 * What is read besides the revision: the team's name, its derating policy and the team parts
 * library entries the revision's parts are bound to (number, maker, unit cost, currency), both
 * through lib/data/parts.ts, and the design's approvals. The BOM and the report solve the
 * revision in the solve pool (off the request thread, lib/solve-pool; lib/exports/solve.ts, 15 s
 * budget plus the pool's cut-off); a failed solve still gives a BOM (without the stress columns)
 * and a report that says why it has no results.
 */
import 'server-only';
import type { DesignDocument } from '../circuit/document/schema';
import { designateParts } from '../circuit/document/designators';
import { db } from '../db';
import { AppError, notFound } from '../errors';
import { buildBom, bomCsv, type LibraryPartInfo } from '../exports/bom';
import { CONTENT_TYPES, designJsonText, exportFileName, netlistWithDesignators, type ExportFormat } from '../exports/files';
import { buildReportModel, type ReportApproval } from '../exports/report';
import { renderReportPdf } from '../exports/report-pdf';
import { EXPORT_SOLVE_BUDGET_MS, type ExportSolve } from '../exports/solve';
import { cutOffFor, runSolve } from '../solve-pool';
import { loadCaller } from './access';
import { getRevisionOf, loadReadable } from './designs';
import { userDto } from './dto';
import { listParts, teamDeratingFraction } from './parts';

/** One export ready to send: bytes or text, its content type and file name. */
export interface ExportFile {
  body: Uint8Array | string;
  contentType: string;
  fileName: string;
}

/**
 * The team library parts behind `ids`, read through lib/data/parts.ts (the caller must be a
 * member of the team, which reading the design already proved). Ids that are not the team's
 * library parts are left out, and a BOM row then keeps the id as its part number.
 */
export async function libraryPartsFor(userId: string, teamId: string, ids: string[]): Promise<Map<string, LibraryPartInfo>> {
  const wanted = new Set(ids);
  const out = new Map<string, LibraryPartInfo>();
  if (wanted.size === 0) return out;
  for (const p of await listParts(userId, teamId, {})) {
    if (!wanted.has(p.id)) continue;
    const cost = (p as { unitCost?: number }).unitCost;
    out.set(p.id, { id: p.id, partNumber: p.partNumber, maker: p.maker ?? '', unitCost: typeof cost === 'number' && Number.isFinite(cost) ? cost : null, currency: p.currency ?? '' });
  }
  return out;
}

function boundIds(doc: DesignDocument): string[] {
  return designateParts(doc)
    .map((p) => p.spec.partId)
    .filter((id): id is string => typeof id === 'string' && id.length > 0);
}

/** Every approval of a design, newest first, as the report prints them. */
async function approvalsOf(designId: string): Promise<ReportApproval[]> {
  const { Approval, User } = db().models;
  const rows = await Approval.findAll({ where: { designId }, include: [{ model: User, as: 'approvedBy' }], order: [['createdAt', 'DESC']] });
  return rows.map((a) => ({ revision: a.revision, approvedBy: userDto(a.approvedBy).name, approvedAt: a.createdAt.toISOString(), note: a.note }));
}

/** The export's solve in the solve pool (off the request thread); a cut-off or a busy pool is the reason. */
async function pooledExportSolve(doc: DesignDocument, teamDerating: number | null, warmup: boolean): Promise<ExportSolve> {
  const r = await runSolve('solveForExport', [doc, teamDerating, { warmup, budgetMs: EXPORT_SOLVE_BUDGET_MS }], { timeoutMs: cutOffFor(EXPORT_SOLVE_BUDGET_MS) });
  return r.ok ? r.value : { ok: false, reason: r.reason, compiled: null };
}

/**
 * Export revision `number` (from the path: digits only, else 404) of a design the caller may read
 * in `format`. A netlist of a drawing that does not compile answers 422 with the compiler's reason.
 */
export async function exportRevision(userId: string, designId: string, number: string, format: ExportFormat): Promise<ExportFile> {
  if (!/^[1-9][0-9]{0,8}$/.test(number)) throw notFound('revision');
  const caller = await loadCaller(userId);
  const design = await loadReadable(caller, designId);
  const revision = await getRevisionOf(design, Number(number));
  const doc = revision.document;
  const fileName = exportFileName(design.title, revision.number, format);
  const contentType = CONTENT_TYPES[format];
  if (format === 'json') return { body: designJsonText(doc), contentType, fileName };
  if (format === 'netlist') {
    const net = netlistWithDesignators(doc, `${design.title} r${revision.number}`);
    if (!net.ok) throw new AppError('invalid', `the drawing of r${revision.number} does not compile, so it has no netlist: ${net.reason}`);
    return { body: net.text, contentType, fileName };
  }
  const [library, teamDerating] = await Promise.all([libraryPartsFor(userId, design.teamId, boundIds(doc)), teamDeratingFraction(design.teamId)]);
  if (format === 'bom') {
    const solve = await pooledExportSolve(doc, teamDerating, false);
    return { body: bomCsv(buildBom(doc, library, solve.ok ? solve.stress : null)), contentType, fileName };
  }
  const [team, approvals] = await Promise.all([db().models.Team.findByPk(design.teamId), approvalsOf(design.id)]);
  const solve = await pooledExportSolve(doc, teamDerating, true);
  const model = buildReportModel(
    {
      designTitle: design.title,
      teamName: team?.name ?? '',
      revision: revision.number,
      revisionAuthor: revision.author.name,
      revisionCreatedAt: revision.createdAt,
      revisionMessage: revision.message,
      designStatus: design.status.replace(/_/g, ' '),
      document: doc,
      teamDerating,
      approvals,
      library,
      generatedAt: new Date().toISOString(),
    },
    solve,
  );
  return { body: await renderReportPdf(model, doc), contentType, fileName };
}
