/**
 * The design report's content, as plain numbers and strings (lib/exports/report-pdf.ts draws
 * it). Built from a stored revision's document, its export solve (lib/exports/solve.ts), the
 * team's derating policy and the design's approval record.
 *
 * Requirement vs result (a Kilorung rule, stated in the report):
 * - output DC meets the requirement when it is within ±{@link OUTPUT_TOLERANCE} (5 %) of the
 *   required value, compared by magnitude (a negative supply's −10 kV meets "10 kV");
 * - ripple meets when ripple p-p / |output DC| ≤ the required maximum ripple fraction;
 * - load current meets when the current the solved load draws is at least the required one
 *   (within 0.1 % for rounding).
 * Parts are judged at the stricter of the design's and the team's derating fraction
 * (lib/parts/derating.ts), margin = (allowed − actual) / allowed, as in the editor.
 *
 * Pure: no database, no file system.
 */
import { compileDocument, formatEngineering, GROUND, SAFETY_CAUTIONS, type DesignDocument } from '../circuit';
import { designatorKey, designatorMap, designateParts, compareDesignators } from '../circuit/document/designators';
import { nodeLabels, topologyBadge } from '../editor/engine/view-model';
import type { PartStress, StressCheck } from '../editor/types';
import { resolveDerating, type EffectiveDerating } from '../parts/derating';
import type { LibraryPartInfo } from './bom';
import type { ExportSolve } from './solve';

/** Relative band around the required output DC that counts as meeting it (Kilorung rule). */
export const OUTPUT_TOLERANCE = 0.05;

/** The cautions every report carries (beside the engine's own, lib/circuit/measures/safety.ts). */
export const REPORT_CAUTIONS: string[] = [
  'DANGER — lethal stored charge. A diode–capacitor ladder keeps its charge after the drive is switched off, and a discharged capacitor can recover charge.',
  'Fit bleeder resistors rated for the full voltage, and check that they discharge the stack before anyone works on it.',
  'Switch off and isolate the drive, then discharge and ground every node with a grounding stick, and leave the stack shorted to ground, before touching anything.',
  'Build and test only under your local electrical codes and licensed practice. An approval in Kilorung records a design review; it is not a safety certificate.',
];

export interface ReportApproval {
  revision: number;
  approvedBy: string;
  approvedAt: string;
  note: string;
}

export interface ReportInput {
  designTitle: string;
  teamName: string;
  revision: number;
  revisionAuthor: string;
  revisionCreatedAt: string;
  revisionMessage: string;
  designStatus: string;
  document: DesignDocument;
  /** The team's derating policy, when it has one. */
  teamDerating: number | null;
  /** Every approval of the design, any revision, newest first. */
  approvals: ReportApproval[];
  library: ReadonlyMap<string, LibraryPartInfo>;
  generatedAt: string;
}

export interface RequirementRow {
  label: string;
  unit: 'V' | 'A' | '%';
  required: number | null;
  result: number | null;
  /** true meets, false does not, null = not asked or not solved. */
  pass: boolean | null;
  rule: string;
}

export interface NodeRow {
  node: string;
  label: string;
  meanV: number;
  rippleV: number;
}

export interface PartRow {
  designator: string;
  /** "Stage 2 · pumping C" and the part number when bound. */
  part: string;
  partNumber: string;
  /** The governing check (the smallest margin, or the first check of an unrated part). */
  check: StressCheck['quantity'];
  actual: number;
  unit: StressCheck['unit'];
  rating: number | null;
  allowed: number | null;
  margin: number | null;
  status: PartStress['status'];
}

export interface Series {
  /** x values (s). */
  x: number[];
  /** y values (V). */
  y: number[];
}

export interface OutputSafetyRow {
  node: string;
  label: string;
  voltageV: number;
  stackEnergyJ: number;
  dischargeResistanceOhm: number | null;
  toSafeVoltageS: number | null;
  bleederFor5sOhm: number;
}

export interface ReportModel {
  title: { design: string; team: string; revision: number; author: string; date: string; message: string; topology: string; status: string; generatedAt: string };
  derating: EffectiveDerating;
  /** Why there are no results (the drawing does not compile or the solve failed); null when solved. */
  solveFailure: string | null;
  requirement: RequirementRow[];
  output: { dcV: number; rippleV: number | null; loadCurrentA: number | null; frequencyHz: number } | null;
  nodes: NodeRow[];
  parts: PartRow[];
  /** The output over one period (s from the period start, V). */
  waveform: Series | null;
  waveformLabel: string;
  /** The output's per-cycle mean from power-on (s, V). */
  warmup: (Series & { t90S: number | null; t99S: number | null }) | null;
  safety: {
    totalEnergyJ: number | null;
    bleederOhm: number | null;
    outputs: OutputSafetyRow[];
    warnings: string[];
    cautions: string[];
  };
  approvals: ReportApproval[];
  /** The approval of this very revision, if any. */
  thisRevisionApproval: ReportApproval | null;
  /** Designator of each part key (`blockId` or `blockId:role`), for the drawing. */
  designators: Record<string, string>;
}

/** Governing check of a part: smallest margin among rated checks, else the first check. */
function governing(p: PartStress): StressCheck {
  let best: StressCheck | null = null;
  for (const c of p.checks) if (c.margin !== undefined && (!best || (c.margin as number) < (best.margin as number))) best = c;
  return best ?? p.checks[0];
}

function outputFigures(solve: ExportSolve & { ok: true }): { dcV: number; rippleV: number | null; wave: Series | null; label: string } | null {
  const s = solve.solved;
  const pos = s.outputs.find((o) => o.polarity === 'positive');
  const neg = s.outputs.find((o) => o.polarity === 'negative');
  const p = pos ? s.nodes[pos.node] : undefined;
  const n = neg ? s.nodes[neg.node] : undefined;
  if (p && n) {
    const a = p.waveform;
    const b = n.waveform;
    if (a && b && a.t.length === b.t.length && a.t.length > 0) {
      const d = a.v.map((v, i) => v - b.v[i]);
      return { dcV: p.mean - n.mean, rippleV: Math.max(...d) - Math.min(...d), wave: { x: a.t, y: d }, label: `V(${pos!.node}) − V(${neg!.node})` };
    }
    return { dcV: p.mean - n.mean, rippleV: null, wave: null, label: '' };
  }
  const one = pos ?? neg;
  const m = one ? s.nodes[one.node] : undefined;
  if (!one || !m) return null;
  return { dcV: Math.abs(m.mean), rippleV: m.ripple, wave: m.waveform ? { x: m.waveform.t, y: m.waveform.v } : null, label: `V(${one.node})` };
}

/** Mean current the load block(s) draw in the solve (A); null without a load. */
function loadCurrent(solve: ExportSolve & { ok: true }): number | null {
  let total: number | null = null;
  for (const el of solve.compiled.netlist.elements) {
    if (el.origin?.role !== 'load') continue;
    const m = solve.solved.parts[el.name];
    if (!m || !('meanCurrentA' in m)) continue;
    total = (total ?? 0) + Math.abs(m.meanCurrentA);
  }
  return total;
}

function requirementRows(doc: DesignDocument, out: { dcV: number; rippleV: number | null; loadCurrentA: number | null } | null): RequirementRow[] {
  const req = doc.settings.requirement ?? {};
  const rows: RequirementRow[] = [];
  const dc = out ? Math.abs(out.dcV) : null;
  const reqV = req.outputV !== undefined ? Math.abs(req.outputV) : null;
  rows.push({
    label: 'Output DC',
    unit: 'V',
    required: reqV,
    result: dc,
    pass: reqV === null || dc === null ? null : Math.abs(dc - reqV) <= OUTPUT_TOLERANCE * reqV,
    rule: `within ±${OUTPUT_TOLERANCE * 100} % of the required value`,
  });
  const rippleFraction = out && out.rippleV !== null && dc ? out.rippleV / dc : null;
  rows.push({
    label: 'Ripple p-p / output',
    unit: '%',
    required: req.maxRippleFraction ?? null,
    result: rippleFraction,
    pass: req.maxRippleFraction === undefined || rippleFraction === null ? null : rippleFraction <= req.maxRippleFraction,
    rule: 'at most the required fraction',
  });
  const i = out ? out.loadCurrentA : null;
  rows.push({
    label: 'Load current',
    unit: 'A',
    required: req.loadCurrentA ?? null,
    result: i,
    pass: req.loadCurrentA === undefined || i === null ? null : i >= req.loadCurrentA * (1 - 1e-3),
    rule: 'at least the required current',
  });
  return rows;
}

/** Natural order of node names (n2 before n10). */
function compareNodes(a: NodeRow, b: NodeRow): number {
  return a.label.localeCompare(b.label, 'en', { numeric: true });
}

/** The report's content (see the file comment). */
export function buildReportModel(input: ReportInput, solve: ExportSolve): ReportModel {
  const doc = input.document;
  const derating = resolveDerating(doc.settings.deratingFraction, input.teamDerating);
  const compiled = solve.ok ? solve.compiled : solve.compiled && solve.compiled.ok ? solve.compiled : (() => {
    const c = compileDocument(doc);
    return c.ok ? c : null;
  })();
  const topology = compiled ? topologyBadge(compiled.topology).label : 'Does not compile';
  const designators = designatorMap(doc);
  const partIds = new Map(designateParts(doc).map((p) => [designatorKey(p.blockId, p.role), p.spec.partId ?? null] as const));
  const approvals = input.approvals;
  const thisRevisionApproval = approvals.find((a) => a.revision === input.revision) ?? null;
  const base = {
    title: {
      design: input.designTitle,
      team: input.teamName,
      revision: input.revision,
      author: input.revisionAuthor,
      date: input.revisionCreatedAt,
      message: input.revisionMessage,
      topology,
      status: input.designStatus,
      generatedAt: input.generatedAt,
    },
    derating,
    approvals,
    thisRevisionApproval,
    designators: Object.fromEntries(designators),
  };
  const cautions = [...REPORT_CAUTIONS, ...SAFETY_CAUTIONS];
  if (!solve.ok) {
    return {
      ...base,
      solveFailure: solve.reason,
      requirement: requirementRows(doc, null),
      output: null,
      nodes: [],
      parts: [],
      waveform: null,
      waveformLabel: '',
      warmup: null,
      safety: { totalEnergyJ: null, bleederOhm: doc.settings.bleederOhm ?? null, outputs: [], warnings: [], cautions },
    };
  }
  const s = solve.solved;
  const labels = nodeLabels(doc, solve.compiled);
  const out = outputFigures(solve);
  const iLoad = loadCurrent(solve);
  const output = out ? { dcV: out.dcV, rippleV: out.rippleV, loadCurrentA: iLoad, frequencyHz: s.frequencyHz } : null;
  const nodes = Object.entries(s.nodes)
    .filter(([n]) => n !== GROUND && !n.startsWith('i_'))
    .map(([node, m]) => ({ node, label: labels[node] ?? node, meanV: m.mean, rippleV: m.ripple }))
    .sort(compareNodes);
  const parts: PartRow[] = solve.stress
    .filter((p) => designators.has(designatorKey(p.blockId, p.role)))
    .map((p) => {
      const key = designatorKey(p.blockId, p.role);
      const c = governing(p);
      const partId = partIds.get(key) ?? p.partId ?? null;
      const lib = partId ? input.library.get(partId) : undefined;
      return {
        designator: designators.get(key) as string,
        part: p.label,
        partNumber: lib ? lib.partNumber : partId ?? 'unbound',
        check: c.quantity,
        actual: c.actual,
        unit: c.unit,
        rating: c.rating ?? null,
        allowed: c.allowed ?? null,
        margin: c.margin ?? null,
        status: p.status,
      };
    })
    .sort((a, b) => compareDesignators(a.designator, b.designator));
  const w = s.warmup;
  const warmup = w && w.curve.cycles.length > 1 ? { x: w.curve.cycles.map((c) => c * s.periodS), y: w.curve.meanV, t90S: w.t90, t99S: w.t99 } : null;
  const outputs: OutputSafetyRow[] = s.safety.outputs.map((o) => ({
    node: o.node,
    label: labels[o.node] ?? o.node,
    voltageV: o.voltageV,
    stackEnergyJ: o.stackEnergyJ,
    dischargeResistanceOhm: o.dischargeResistanceOhm,
    toSafeVoltageS: o.discharge ? o.discharge.toSafeVoltageS : null,
    bleederFor5sOhm: o.bleederFor5s.maxResistanceOhm,
  }));
  const warnings = [...new Set(s.safety.outputs.flatMap((o) => o.warnings.map((x) => x.message)))];
  return {
    ...base,
    solveFailure: null,
    requirement: requirementRows(doc, output),
    output,
    nodes,
    parts,
    waveform: out?.wave ?? null,
    waveformLabel: out?.label ?? '',
    warmup,
    safety: { totalEnergyJ: s.safety.totalEnergyJ, bleederOhm: doc.settings.bleederOhm ?? null, outputs, warnings, cautions },
  };
}

/** A number in engineering units for the report (3 significant digits). */
export function eng(value: number | null | undefined, unit: string): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return formatEngineering(value, unit, 3);
}
