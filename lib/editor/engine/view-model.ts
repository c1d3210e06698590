/**
 * Pure mapping from the engine's results (compile, steady-state solve) to what the editor shows:
 * the topology badge, human labels for netlist nodes and parts, the netlist node under every
 * canvas port, one reading per node and the stress of every part against its rating.
 *
 * Derating (common practice): a part is judged against `deratingFraction × rating`, margin =
 * (allowed − actual) / allowed. The fraction is the stricter of the design's
 * (`doc.settings.deratingFraction`) and the team's policy, 0.8 when neither is set
 * (lib/parts/derating.ts). The worker knows only the document; the editor re-judges the solved
 * stress at the team's fraction with {@link withTeamDerating} (no new solve: only the limits move).
 */
import { GROUND, type CompileResult, type DesignBlock, type DesignDocument, type LadderReport, type NetlistElement, type SolveResult, type TopologyReport } from '@/lib/circuit';
import type { CompileView, NodeReading, PartStress, PortKey, SolveView, StressCheck, TopologyBadge } from '../types';
import { netlistTextOf } from './netlist-text';
import { DEFAULT_DERATING_FRACTION, resolveDerating } from '@/lib/parts/derating';

type Compiled = CompileResult & { ok: true };
type Solved = SolveResult & { ok: true };

/** A margin below this fraction of the allowed value is flagged `tight` (common practice: keep 10 % in hand). */
export const TIGHT_MARGIN = 0.1;

/** Default derating fraction when the settings carry none (common practice 0.8). */
export const DEFAULT_DERATING = DEFAULT_DERATING_FRACTION;

const KIND_TEXT: Record<TopologyReport['kind'], string> = {
  'half-wave': 'Half-wave',
  'full-wave': 'Full-wave',
  symmetric: 'Symmetric',
  custom: 'Custom',
};

const ROLE_TEXT: Record<string, string> = {
  pumpC: 'pumping C',
  pump2C: 'second pumping C',
  smoothC: 'smoothing C',
  diodeA: 'diode A',
  diodeB: 'diode B',
  diodeC: 'diode C',
  diodeD: 'diode D',
  capacitor: 'capacitor',
  diode: 'diode',
  resistor: 'resistor',
  load: 'load',
};

/** Roles whose elements get a stress entry (the parts a designer picks; not ESR, source resistance, strays or bleeders). */
const PART_ROLES = new Set(Object.keys(ROLE_TEXT));

/** The topology badge: kind, stages per ladder, polarity and its short text. */
export function topologyBadge(topology: TopologyReport): TopologyBadge {
  if (topology.kind === 'custom' || topology.ladders.length === 0) return { kind: 'custom', stages: null, polarity: null, label: KIND_TEXT.custom };
  const stages = topology.ladders[0].stages;
  const polarity = topology.kind === 'symmetric' ? 'bipolar' : topology.ladders[0].polarity;
  const sign = polarity === 'bipolar' ? '±' : polarity === 'positive' ? '+' : '−';
  return { kind: topology.kind, stages, polarity, label: `${KIND_TEXT[topology.kind]} · ${stages} ${stages === 1 ? 'stage' : 'stages'} · ${sign}` };
}

/** Ladder prefix for a symmetric pair ("+ " / "− "), empty for a single ladder. */
function ladderPrefix(topology: TopologyReport, ladder: LadderReport): string {
  if (topology.ladders.length < 2) return '';
  return ladder.polarity === 'positive' ? '+ ' : '− ';
}

function blockName(block: DesignBlock | undefined, fallback: string): string {
  return block?.label?.trim() || block?.id || fallback;
}

/** Where each stage block sits in the recognised ladders: `blockId → { prefix, stage }`. */
function stagePlaces(compiled: Compiled): Map<string, { prefix: string; stage: number }> {
  const byName = new Map(compiled.netlist.elements.map((e) => [e.name, e] as const));
  const out = new Map<string, { prefix: string; stage: number }>();
  for (const ladder of compiled.topology.ladders) {
    const prefix = ladderPrefix(compiled.topology, ladder);
    for (const s of ladder.stageElements) {
      for (const name of [s.pumpC, s.smoothC, s.pump2C, ...s.diodes]) {
        const blockId = name ? byName.get(name)?.origin?.blockId : undefined;
        if (blockId !== undefined && !out.has(blockId)) out.set(blockId, { prefix, stage: s.stage });
      }
    }
  }
  return out;
}

/**
 * Human label of a part: "Stage 2 · pumping C" inside a recognised ladder ("+ Stage 2 · …" /
 * "− Stage 2 · …" in a symmetric pair), "<block label> · <role>" for a stage block outside one,
 * and the block's label for a single part or the load.
 */
function partLabel(block: DesignBlock | undefined, role: string, place: { prefix: string; stage: number } | undefined): string {
  const roleText = ROLE_TEXT[role] ?? role;
  if (place) return `${place.prefix}Stage ${place.stage} · ${roleText}`;
  if (block?.kind === 'stage') return `${blockName(block, '?')} · ${roleText}`;
  return blockName(block, roleText);
}

/**
 * Human label of every netlist node: "Ground", "Output +" / "Output −", "Drive" (full-wave:
 * "Drive A" / "Drive B"), ladder columns as "Stage 3 · smoothing (y3)", "Stage 2 · pumping (x2)"
 * and "Stage 2 · second pumping (x′2)", a symmetric pair's ladders prefixed "+ " / "− ", internal
 * nodes after their part, and otherwise "<block label> · <port>".
 */
export function nodeLabels(doc: DesignDocument, compiled: Compiled): Record<string, string> {
  const { netlist, topology } = compiled;
  const byId = new Map(doc.blocks.map((b) => [b.id, b] as const));
  const labels: Record<string, string> = {};
  const set = (node: string, text: string) => {
    if (labels[node] === undefined) labels[node] = text;
  };
  set(GROUND, 'Ground');
  const bipolar = topology.kind === 'symmetric';
  for (const o of topology.outputs) set(o.node, o.polarity === 'positive' ? 'Output +' : 'Output −');
  if (!bipolar && topology.outputs.length === 0) for (const l of topology.ladders) set(l.outputNode, l.polarity === 'positive' ? 'Output +' : 'Output −');
  for (const l of topology.ladders) {
    if (l.variant === 'full-wave') {
      set(l.driveNode, 'Drive A');
      if (l.secondDriveNode) set(l.secondDriveNode, 'Drive B');
    } else set(l.driveNode, 'Drive');
  }
  for (const l of topology.ladders) {
    const p = ladderPrefix(topology, l);
    l.drivenColumn.forEach((n, i) => set(n, `${p}Stage ${i + 1} · pumping (x${i + 1})`));
    // The antiphase column is written x′k, as the second driven column of a two-phase ladder.
    l.secondDrivenColumn?.forEach((n, i) => set(n, `${p}Stage ${i + 1} · second pumping (x′${i + 1})`));
    l.smoothingColumn.forEach((n, i) => set(n, `${p}Stage ${i + 1} · smoothing (y${i + 1})`));
  }
  const places = stagePlaces(compiled);
  const origins = netlist.nodeOrigins ?? {};
  for (const [node, ports] of Object.entries(origins)) {
    if (labels[node] !== undefined || ports.length === 0) continue;
    const internal = ports.find((p) => p.port.endsWith(':internal'));
    if (internal) {
      const role = internal.port.slice(0, -':internal'.length);
      const block = byId.get(internal.blockId);
      if (block?.kind === 'acSource') set(node, `${blockName(block, 'Drive')} · behind the source resistance`);
      else set(node, `${partLabel(block, role, places.get(internal.blockId))} · ESR node`);
      continue;
    }
    const src = ports.find((p) => byId.get(p.blockId)?.kind === 'acSource');
    if (src) {
      const text = src.port === 'hot' ? 'Drive' : src.port === 'hotB' ? 'Drive B' : src.port === 'ct' ? 'Centre tap' : 'Drive return';
      set(node, src.port === 'hot' && ports.some((p) => p.port === 'hotB') ? 'Drive A' : text);
      continue;
    }
    const first = ports[0];
    set(node, `${blockName(byId.get(first.blockId), first.blockId)} · ${first.port}`);
  }
  for (const el of netlist.elements) for (const n of el.nodes) set(n, n);
  return labels;
}

/** Ports of every net (`node → ["blockId:port", …]`), internal pseudo-ports left out. */
function portsByNode(compiled: Compiled): Record<string, PortKey[]> {
  const out: Record<string, PortKey[]> = {};
  for (const [node, ports] of Object.entries(compiled.netlist.nodeOrigins ?? {})) {
    const keys = ports.filter((p) => !p.port.endsWith(':internal')).map((p) => `${p.blockId}:${p.port}` as PortKey);
    if (keys.length > 0) out[node] = keys;
  }
  return out;
}

/**
 * What the compiler made of the drawing. `nodeOfPort` lists every port on a net the netlist
 * uses (a port joins its block's own parts even when no wire reaches it, e.g. the top stage's
 * `xOut`), and every wired port; a failed compile has no nets. `netlistText` is the export
 * text with the default title.
 */
export function compileView(doc: DesignDocument, result: CompileResult): CompileView {
  if (!result.ok) {
    return {
      ok: false,
      reason: result.reason,
      badge: { kind: 'custom', stages: null, polarity: null, label: 'Does not compile' },
      diagnostics: result.diagnostics,
      nodeOfPort: {},
      nodeLabels: {},
      outputs: [],
      netlistText: null,
    };
  }
  const used = new Set<string>(result.netlist.elements.flatMap((e) => e.nodes));
  const wired = new Set<string>(doc.wires.flatMap((w) => [`${w.source}:${w.sourcePort}`, `${w.target}:${w.targetPort}`]));
  const nodeOfPort: Record<PortKey, string> = {};
  for (const [node, keys] of Object.entries(portsByNode(result))) {
    for (const k of keys) if (used.has(node) || wired.has(k)) nodeOfPort[k] = node;
  }
  return {
    ok: true,
    badge: topologyBadge(result.topology),
    diagnostics: result.diagnostics,
    nodeOfPort,
    nodeLabels: nodeLabels(doc, result),
    outputs: result.topology.outputs.map((o) => ({ node: o.node, polarity: o.polarity })),
    netlistText: netlistTextOf(result.netlist),
  };
}

function check(quantity: StressCheck['quantity'], actual: number, unit: StressCheck['unit'], rating: number | undefined, derating: number): StressCheck {
  if (rating === undefined || !(rating > 0)) return { quantity, actual, unit };
  const allowed = derating * rating;
  return { quantity, actual, unit, rating, allowed, margin: (allowed - actual) / allowed };
}

/**
 * Largest |v(a) − v(b)| over the period for a two-terminal part between nodes `a` and `b`:
 * exact from the node extremes when one end is ground; otherwise the largest difference of
 * the two one-period waveforms where the solve sent them (sampled, so a narrow spike between
 * samples can be missed), else the bound from the extremes, max(max_a − min_b, max_b − min_a).
 */
export function peakDifferenceV(solve: Solved, a: string, b: string): number {
  const na = a === GROUND ? { mean: 0, min: 0, max: 0, ripple: 0 } : solve.nodes[a];
  const nb = b === GROUND ? { mean: 0, min: 0, max: 0, ripple: 0 } : solve.nodes[b];
  if (!na || !nb) return NaN;
  if (a === GROUND || b === GROUND) {
    const n = a === GROUND ? nb : na;
    return Math.max(Math.abs(n.min), Math.abs(n.max));
  }
  const wa = na.waveform;
  const wb = nb.waveform;
  if (wa && wb && wa.v.length === wb.v.length && wa.v.length > 0) {
    let peak = 0;
    for (let i = 0; i < wa.v.length; i++) peak = Math.max(peak, Math.abs(wa.v[i] - wb.v[i]));
    return peak;
  }
  return Math.max(Math.abs(na.max - nb.min), Math.abs(nb.max - na.min));
}

type Ratings = { ratedVoltageV?: number; ratedPivV?: number; ratedAvgCurrentA?: number; ratedSurgeA?: number; ratedPowerW?: number; partId?: string | null };

/** Rating fields of the part behind `role` in `block`; a full-wave stage's second column falls back to the first, as the compiler does. */
function ratingsOf(block: DesignBlock | undefined, role: string): Ratings {
  if (!block) return {};
  if (block.kind === 'stage') {
    const d = block.data;
    switch (role) {
      case 'pumpC':
        return d.pumpC;
      case 'pump2C':
        return d.pump2C ?? d.pumpC;
      case 'smoothC':
        return d.smoothC;
      case 'diodeA':
        return d.diodeA;
      case 'diodeB':
        return d.diodeB;
      case 'diodeC':
        return d.diodeC ?? d.diodeA;
      case 'diodeD':
        return d.diodeD ?? d.diodeB;
      default:
        return {};
    }
  }
  if (block.kind === 'capacitor' || block.kind === 'diode' || block.kind === 'resistor') return block.data;
  return {};
}

function summarise(checks: StressCheck[]): Pick<PartStress, 'worstMargin' | 'status'> {
  const margins = checks.map((c) => c.margin).filter((m): m is number => m !== undefined);
  if (margins.length === 0) return { worstMargin: null, status: 'unrated' };
  const worst = Math.min(...margins);
  return { worstMargin: worst, status: worst < 0 ? 'over' : worst < TIGHT_MARGIN ? 'tight' : 'ok' };
}

/**
 * Stress of every part the designer placed (stage capacitors and diodes, single C, D and R
 * parts, a resistive load), from the steady-state period, against its ratings:
 * - capacitor: peak |V| across it vs `ratedVoltageV`;
 * - diode: peak inverse voltage vs `ratedPivV`, average forward current vs `ratedAvgCurrentA`,
 *   and peak forward current vs `ratedSurgeA`. The last is a loose check: the solve gives the
 *   repetitive peak of every cycle, while a surge rating is for a single non-repetitive pulse
 *   (and the power-on inrush, which the steady state does not show, is what meets it);
 * - resistor: mean power vs `ratedPowerW`, peak |V| across it vs `ratedVoltageV`
 *   ({@link peakDifferenceV}).
 * A check without a rating is listed with its actual value only; a part with no rated check is
 * `unrated`. Current-source loads, ESR, source resistance, strays and bleeders are not parts here.
 * The derating is the stricter of the design's and `teamFraction` (when given).
 */
export function partStress(doc: DesignDocument, compiled: Compiled, solve: Solved, teamFraction?: number | null): PartStress[] {
  const derating = resolveDerating(doc.settings?.deratingFraction, teamFraction).fraction;
  const byId = new Map(doc.blocks.map((b) => [b.id, b] as const));
  const places = stagePlaces(compiled);
  const out: PartStress[] = [];
  for (const el of compiled.netlist.elements) {
    const role = el.origin?.role;
    if (!role || !PART_ROLES.has(role) || !(el.kind === 'C' || el.kind === 'D' || el.kind === 'R')) continue;
    const measure = solve.parts[el.name];
    if (!measure || measure.kind !== el.kind) continue;
    const blockId = (el.origin as NonNullable<NetlistElement['origin']>).blockId;
    const block = byId.get(blockId);
    const r = ratingsOf(block, role);
    let checks: StressCheck[];
    if (measure.kind === 'C') checks = [check('voltage', measure.peakV, 'V', r.ratedVoltageV, derating)];
    else if (measure.kind === 'D')
      checks = [
        check('piv', measure.pivV, 'V', r.ratedPivV, derating),
        check('averageCurrent', Math.abs(measure.averageCurrentA), 'A', r.ratedAvgCurrentA, derating),
        check('peakCurrent', Math.abs(measure.peakCurrentA), 'A', r.ratedSurgeA, derating),
      ];
    else if (measure.kind === 'R')
      checks = [
        check('power', Math.abs(measure.powerW), 'W', r.ratedPowerW, derating),
        check('voltage', peakDifferenceV(solve, el.nodes[0], el.nodes[1]), 'V', r.ratedVoltageV, derating),
      ];
    else continue;
    out.push({ blockId, role, element: el.name, kind: el.kind, label: partLabel(block, role, places.get(blockId)), checks, ...summarise(checks), ...(r.partId ? { partId: r.partId } : {}) });
  }
  return out;
}

/**
 * The steady-state solve as the editor shows it: one {@link NodeReading} per solved node (the
 * solver's own mean, ripple, min and max, unchanged), part stress, power and safety figures.
 * `warmup` is filled later by the warm-up message.
 */
export function solveView(doc: DesignDocument, compiled: Compiled, solve: Solved): SolveView {
  const labels = nodeLabels(doc, compiled);
  const ports = portsByNode(compiled);
  const nodes: Record<string, NodeReading> = {};
  for (const [node, m] of Object.entries(solve.nodes)) {
    nodes[node] = {
      node,
      label: labels[node] ?? node,
      ports: ports[node] ?? [],
      meanV: m.mean,
      rippleV: m.ripple,
      minV: m.min,
      maxV: m.max,
      ...(m.waveform ? { waveform: m.waveform } : {}),
    };
  }
  return {
    periodS: solve.periodS,
    frequencyHz: solve.frequencyHz,
    outputs: solve.outputs,
    nodes,
    parts: partStress(doc, compiled, solve),
    derating: resolveDerating(doc.settings?.deratingFraction, null),
    power: solve.power,
    safety: solve.safety,
    stats: { solveMs: solve.stats.solveMs, shootingIterations: solve.stats.shootingIterations, unknowns: solve.stats.unknowns, steps: solve.stats.steps },
  };
}

/** The same parts judged at another derating `fraction`: every rated check's limit and margin, and each part's status, recomputed. */
export function rederateParts(parts: PartStress[], fraction: number): PartStress[] {
  return parts.map((p) => {
    const checks = p.checks.map((c) => check(c.quantity, c.actual, c.unit, c.rating, fraction));
    return { ...p, checks, ...summarise(checks) };
  });
}

/**
 * A solve view judged with the team's derating policy as well: the fraction becomes the stricter
 * of the design's (`docFraction`) and the team's (`teamFraction`), and when it differs from the
 * one the view was judged at, every part is re-judged ({@link rederateParts}). Returns the same
 * object when nothing changes (so memoised readers do not redraw).
 */
export function withTeamDerating(solve: SolveView, docFraction: number | null | undefined, teamFraction: number | null | undefined): SolveView {
  const derating = resolveDerating(docFraction, teamFraction);
  const current = solve.derating;
  if (current && current.fraction === derating.fraction && current.source === derating.source) return solve;
  const parts = current && current.fraction === derating.fraction ? solve.parts : rederateParts(solve.parts, derating.fraction);
  return { ...solve, parts, derating };
}
